'use client';

import Link from 'next/link';
import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import type { DesignDetailDto, DesignStatus, ReviewDto, Role } from '@/lib/api/contract';
import { api, fieldError, formError } from '@/lib/client/api';
import { formatDateTime, personName, reviewStateLabel, statusLabel } from '@/lib/client/format';
import { keys, useMembers } from '@/lib/client/hooks';
import { approvalIsCurrent, compareLinks, mayDecide, mayWithdraw, reviewerCandidates } from '@/lib/client/review-view';

/** Shown wherever an approval is shown or given. */
export const APPROVAL_CAUTION =
  'An approval records a colleague\u2019s review; it does not certify the supply is safe. Follow local codes and licensed practice.';

const reviewsKey = (designId: string) => [...keys.design(designId), 'reviews'] as const;

function useReviews(designId: string) {
  return useQuery({
    queryKey: reviewsKey(designId),
    queryFn: ({ signal }) => api('GET /api/designs/:designId/reviews', { params: { designId }, signal }),
  });
}

/** After a review action: the design (status, open review, approval), its reviews, the team list and the feed. */
function useRefreshAfterReview(design: DesignDetailDto) {
  const qc = useQueryClient();
  return () =>
    Promise.all([
      qc.invalidateQueries({ queryKey: keys.design(design.id) }),
      qc.invalidateQueries({ queryKey: keys.designs(design.teamId) }),
      qc.invalidateQueries({ queryKey: ['activity'] }),
    ]);
}

function useRequestReview(design: DesignDetailDto) {
  const refresh = useRefreshAfterReview(design);
  return useMutation({
    mutationFn: (body: { revision: number; reviewerIds: string[]; note?: string }) =>
      api('POST /api/designs/:designId/reviews', { params: { designId: design.id }, body }),
    onSuccess: refresh,
  });
}

function useDecideReview(design: DesignDetailDto, reviewId: string) {
  const refresh = useRefreshAfterReview(design);
  return useMutation({
    mutationFn: (body: { decision: 'approve' | 'request_changes'; note?: string }) =>
      api('POST /api/designs/:designId/reviews/:reviewId/decision', { params: { designId: design.id, reviewId }, body }),
    onSuccess: refresh,
  });
}

function useWithdrawReview(design: DesignDetailDto, reviewId: string) {
  const refresh = useRefreshAfterReview(design);
  return useMutation({
    mutationFn: () => api('DELETE /api/designs/:designId/reviews/:reviewId', { params: { designId: design.id, reviewId } }),
    onSuccess: refresh,
  });
}

const STATUS_MARK: Record<DesignStatus, { mark: string; tone: 'neutral' | 'live' | 'result' | 'warn' }> = {
  draft: { mark: '\u25cb', tone: 'neutral' },
  in_review: { mark: '\u25d4', tone: 'live' },
  approved: { mark: '\u2713', tone: 'result' },
  changes_requested: { mark: '\u21ba', tone: 'warn' },
  changed_since_approval: { mark: '\u0394', tone: 'live' },
};

const STATUS_NOTE: Record<DesignStatus, string> = {
  draft: 'Nobody has been asked to review this design yet.',
  in_review: 'A review has been asked for and is waiting for a decision.',
  approved: 'The latest revision is the approved one.',
  changes_requested: 'A reviewer asked for changes; save a new revision and ask again.',
  changed_since_approval: 'A revision was saved after the approved one; the newer work has not been reviewed.',
};

function StatusLine({ status }: { status: DesignStatus }) {
  const s = STATUS_MARK[status] ?? STATUS_MARK.draft;
  return (
    <div className="space-y-1">
      <Badge tone={s.tone} testId="review-status">
        <span aria-hidden="true" className="mr-1">
          {s.mark}
        </span>
        {statusLabel(status)}
      </Badge>
      <p className="text-xs text-ink-400">{STATUS_NOTE[status]}</p>
    </div>
  );
}

function people(users: { name: string; email: string }[]): string {
  return users.map(personName).join(', ');
}

function ApprovalRecord({ design }: { design: DesignDetailDto }) {
  const a = design.approval;
  if (!a) return null;
  const current = approvalIsCurrent(a, design.latestRevision);
  return (
    <div className="space-y-2 rounded-md border border-lagoon-600 bg-lagoon-800/30 px-3 py-2 text-sm" data-testid="approval-record">
      <p className="text-lagoon-100">
        <span className="font-medium">r{a.revision} approved</span> by {personName(a.approvedBy)} on {formatDateTime(a.approvedAt)}
      </p>
      {a.note ? <p className="whitespace-pre-wrap text-ink-100">&ldquo;{a.note}&rdquo;</p> : null}
      {!current ? (
        <p className="text-copper-100">
          r{design.latestRevision} was saved after this approval; the approval still names r{a.revision} only.
        </p>
      ) : null}
      <p className="text-xs text-copper-100">{APPROVAL_CAUTION}</p>
    </div>
  );
}

function RequestForm({ design, onDone }: { design: DesignDetailDto; onDone: () => void }) {
  const members = useMembers(design.teamId);
  const request = useRequestReview(design);
  const [picked, setPicked] = useState<string[]>([]);
  const [note, setNote] = useState('');
  const noteId = useId();
  const groupError = fieldError(request.error, 'reviewerIds');
  const noteError = fieldError(request.error, 'note');
  const top = formError(request.error, ['reviewerIds', 'note']);
  const isPrivate = design.visibility === 'private';

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    request.mutate({ revision: design.latestRevision, reviewerIds: picked, note: note.trim() || undefined }, { onSuccess: onDone });
  }

  const candidates = members.data ? reviewerCandidates(members.data.members, design.author.id) : [];
  return (
    <form onSubmit={onSubmit} className="space-y-3 rounded-md border border-ink-600 p-3" data-testid="review-request-form" noValidate>
      <p className="text-sm text-ink-200">
        Ask for a review of <span className="font-medium text-ink-50">r{design.latestRevision}</span>, the latest stored revision. Unsaved
        edits are not part of it: save first.
      </p>
      {isPrivate ? (
        <Notice tone="caution">This design is private. Share it with the team first so the reviewers can open it.</Notice>
      ) : null}
      {top ? <Notice tone="error">{top}</Notice> : null}
      <fieldset className="space-y-1" aria-describedby={groupError ? `${noteId}-who-err` : undefined}>
        <legend className="mb-1 text-sm font-medium text-ink-200">Who should review it</legend>
        {members.isPending ? <Skeleton lines={2} /> : null}
        {members.isError ? <Notice tone="error">{formError(members.error)}</Notice> : null}
        {members.data && candidates.length === 0 ? (
          <p className="text-sm text-ink-400">Nobody in this team can review it: reviewers need the reviewer or owner role, and the author cannot review their own design.</p>
        ) : null}
        {candidates.map((m) => (
          <label key={m.userId} className="flex items-center gap-2 text-sm text-ink-100" data-testid="reviewer-option">
            <input
              type="checkbox"
              className="h-4 w-4 accent-lagoon-400"
              checked={picked.includes(m.userId)}
              disabled={request.isPending}
              onChange={(e) => setPicked((p) => (e.target.checked ? [...p, m.userId] : p.filter((id) => id !== m.userId)))}
            />
            <span>{m.name || m.email}</span>
            <span className="text-xs text-ink-400">{m.role}</span>
          </label>
        ))}
        {groupError ? (
          <p id={`${noteId}-who-err`} className="text-xs text-hazard-100" role="alert">
            {groupError}
          </p>
        ) : null}
      </fieldset>
      <TextAreaField
        label={
          <>
            Note for the reviewers <span className="font-normal text-ink-400">(optional)</span>
          </>
        }
        error={noteError}
        data-testid="review-note"
        rows={3}
        maxLength={2000}
        value={note}
        onChange={(e) => setNote(e.target.value)}
        disabled={request.isPending}
        placeholder="What should they look at?"
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" data-testid="send-review-request" pending={request.isPending} pendingLabel="Sending…" disabled={picked.length === 0 || isPrivate}>
          Send the request
        </Button>
        <Button variant="ghost" onClick={onDone} disabled={request.isPending}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function DecisionForm({ design, review, decision, onDone }: { design: DesignDetailDto; review: ReviewDto; decision: 'approve' | 'request_changes'; onDone: () => void }) {
  const decide = useDecideReview(design, review.id);
  const [note, setNote] = useState('');
  const [missing, setMissing] = useState(false);
  const approve = decision === 'approve';
  const noteError = missing ? 'Say what needs to change.' : fieldError(decide.error, 'note');
  const top = formError(decide.error, ['note']);

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    if (!approve && note.trim() === '') {
      setMissing(true);
      return;
    }
    setMissing(false);
    decide.mutate({ decision, note: note.trim() || undefined }, { onSuccess: onDone });
  }

  return (
    <form onSubmit={onSubmit} className="space-y-3 rounded-md border border-ink-600 p-3" data-testid="decision-form" noValidate>
      <p className="text-sm text-ink-200">
        {approve ? `Approve r${review.revision}.` : `Ask for changes to r${review.revision}.`}
        {review.revision !== design.latestRevision ? ` Note: the latest revision is r${design.latestRevision}; this decision is about r${review.revision}.` : ''}
      </p>
      {approve ? <p className="text-xs text-copper-100">{APPROVAL_CAUTION}</p> : null}
      {top ? <Notice tone="error">{top}</Notice> : null}
      <TextAreaField
        label={
          approve ? (
            <>
              Note <span className="font-normal text-ink-400">(optional)</span>
            </>
          ) : (
            'What needs to change'
          )
        }
        error={noteError}
        data-testid="decision-note"
        rows={3}
        maxLength={2000}
        value={note}
        required={!approve}
        onChange={(e) => setNote(e.target.value)}
        disabled={decide.isPending}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" data-testid="submit-decision" pending={decide.isPending} pendingLabel="Sending…">
          {approve ? `Approve r${review.revision}` : 'Send the request for changes'}
        </Button>
        <Button variant="ghost" onClick={onDone} disabled={decide.isPending}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function OpenReview({ design, review, userId, role }: { design: DesignDetailDto; review: ReviewDto; userId: string; role: Role | undefined }) {
  const [deciding, setDeciding] = useState<'approve' | 'request_changes' | null>(null);
  const withdraw = useWithdrawReview(design, review.id);
  const canDecide = mayDecide(design, userId, role);
  const canWithdraw = mayWithdraw(design, userId, role);
  const askedOfMe = review.reviewers.some((u) => u.id === userId);
  return (
    <div className="space-y-3 rounded-md border border-copper-600 bg-copper-800/20 px-3 py-2 text-sm" data-testid="open-review">
      <p className="text-ink-100">
        <span className="font-medium text-ink-50">r{review.revision}</span> sent for review by {personName(review.requestedBy)} on{' '}
        {formatDateTime(review.createdAt)}
      </p>
      <p className="text-ink-200" data-testid="open-review-reviewers">
        Asked: {people(review.reviewers)}
        {askedOfMe ? <span className="ml-2 text-copper-100">(including you)</span> : null}
      </p>
      {review.note ? <p className="whitespace-pre-wrap text-ink-100">&ldquo;{review.note}&rdquo;</p> : null}
      {canDecide && deciding === null ? (
        <div className="flex flex-wrap gap-2">
          <Button data-testid="approve-review" onClick={() => setDeciding('approve')}>
            Approve
          </Button>
          <Button variant="secondary" data-testid="request-changes" onClick={() => setDeciding('request_changes')}>
            Ask for changes
          </Button>
        </div>
      ) : null}
      {canDecide && deciding !== null ? <DecisionForm design={design} review={review} decision={deciding} onDone={() => setDeciding(null)} /> : null}
      {canWithdraw && deciding === null ? (
        <div>
          <Button
            variant="ghost"
            data-testid="withdraw-review"
            pending={withdraw.isPending}
            pendingLabel="Withdrawing…"
            onClick={() => {
              if (window.confirm('Withdraw this review request? The reviewers are told it is no longer needed.')) withdraw.mutate();
            }}
          >
            Withdraw the request
          </Button>
        </div>
      ) : null}
      {withdraw.error ? <Notice tone="error">{formError(withdraw.error)}</Notice> : null}
    </div>
  );
}

function History({ reviews, focusReviewId }: { reviews: ReviewDto[]; focusReviewId: string | null }) {
  if (reviews.length === 0) return <p className="text-sm text-ink-400">No review requests yet.</p>;
  return (
    <ol className="space-y-2" data-testid="review-history">
      {reviews.map((r) => (
        <li
          key={r.id}
          data-testid="review-history-item"
          data-state={r.state}
          aria-current={r.id === focusReviewId ? 'true' : undefined}
          className={`rounded-md border px-3 py-2 text-sm ${r.id === focusReviewId ? 'border-lagoon-400' : 'border-ink-800'}`}
        >
          <p className="flex flex-wrap items-center justify-between gap-2">
            <span className="font-medium text-ink-50">
              r{r.revision} · {reviewStateLabel(r.state)}
            </span>
            <span className="text-xs text-ink-400">{formatDateTime(r.createdAt)}</span>
          </p>
          <p className="text-ink-200">
            Asked by {personName(r.requestedBy)} of {people(r.reviewers)}
          </p>
          {r.note ? <p className="whitespace-pre-wrap text-ink-400">&ldquo;{r.note}&rdquo;</p> : null}
          {r.decidedBy && r.decidedAt ? (
            <p className="mt-1 text-ink-200">
              {r.state === 'approved' ? 'Approved' : 'Changes asked for'} by {personName(r.decidedBy)} on {formatDateTime(r.decidedAt)}
              {r.decisionNote ? <span className="block whitespace-pre-wrap text-ink-100">&ldquo;{r.decisionNote}&rdquo;</span> : null}
            </p>
          ) : null}
        </li>
      ))}
    </ol>
  );
}

/**
 * Review and sign-off on the design page: the status, the approval record with its caution, the
 * open request with the decide/withdraw actions the caller may use, the request form, compare
 * links and the history. `focus` (from `?review=`) scrolls the panel into view and marks that
 * request in the history.
 */
export function ReviewPanel({ design, userId, role, focusReviewId }: { design: DesignDetailDto; userId: string; role: Role | undefined; focusReviewId: string | null }) {
  const reviews = useReviews(design.id);
  const [asking, setAsking] = useState(false);
  const ref = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!focusReviewId || !ref.current) return;
    ref.current.scrollIntoView({ block: 'start' });
    ref.current.focus({ preventScroll: true });
  }, [focusReviewId]);

  const open = design.openReview;
  const links = reviews.data ? compareLinks(design.id, design.latestRevision, reviews.data.reviews, design.approval) : [];
  return (
    <div ref={ref} tabIndex={-1} id="review" className="scroll-mt-4 rounded-lg outline-none focus-visible:ring-2 focus-visible:ring-lagoon-400">
      <Panel title="Review and sign-off" testId="review-panel">
        <div className="space-y-4">
          <StatusLine status={design.status} />
          <ApprovalRecord design={design} />
          {open ? <OpenReview key={open.id} design={design} review={open} userId={userId} role={role} /> : null}
          {design.permissions.requestReview && !asking ? (
            <div className="space-y-1">
              <Button variant={open ? 'secondary' : 'primary'} data-testid="request-review" onClick={() => setAsking(true)}>
                {open ? 'Send a new review request' : 'Ask for a review'}
              </Button>
              {open ? <p className="text-xs text-ink-400">A new request replaces the open one.</p> : null}
            </div>
          ) : null}
          {design.permissions.requestReview && asking ? <RequestForm design={design} onDone={() => setAsking(false)} /> : null}
          {links.length > 0 ? (
            <ul className="space-y-1 text-sm">
              {links.map((l, i) => (
                <li key={l.href}>
                  <Link href={l.href} className="rounded text-lagoon-400 hover:underline" data-testid={i === 0 ? 'compare-link' : 'compare-link-more'}>
                    {l.label}
                  </Link>
                </li>
              ))}
            </ul>
          ) : null}
          <div>
            <h3 className="mb-2 text-sm font-semibold text-ink-100">History</h3>
            {reviews.isPending ? <Skeleton lines={2} /> : null}
            {reviews.isError ? <Notice tone="error">{formError(reviews.error)}</Notice> : null}
            {reviews.data ? <History reviews={reviews.data.reviews} focusReviewId={focusReviewId} /> : null}
          </div>
        </div>
      </Panel>
    </div>
  );
}
