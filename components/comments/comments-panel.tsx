'use client';
/**
 * The comments of the revision the page shows: threads grouped by what they are pinned to (the
 * design, a node, a block or a part in it), each with its replies, a reply box and
 * resolve/reopen; a filter (open / resolved / all); the form for a new thread, pinned by
 * clicking the canvas or to the whole design, with `@name` offers of team members; and, below,
 * the comments of other revisions. A deep link's comment (`?comment=<id>`) is shown and scrolled to.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { CommentDto } from '@/lib/api/contract';
import { formError } from '@/lib/client/api';
import { anchorKey, anchorLabel, groupThreads, splitMentions, threadCounts, threadNumbers, threadOf, type AnchorNames, type ThreadFilter } from '@/lib/client/comments';
import { formatDateTime } from '@/lib/client/format';
import { useMembers } from '@/lib/client/hooks';
import { Button } from '@/components/ui/button';
import { Notice, Panel, Skeleton } from '@/components/ui/notice';
import { commentsStore, useComments } from './comments-store';
import { MentionTextarea, type MentionPerson } from './mention-textarea';
import { useAllComments, useCreateComment, useResolveComment, useRevisionComments } from './queries';

export interface CommentsPanelProps {
  designId: string;
  teamId: string;
  revision: number;
  canComment: boolean;
  focusCommentId: string | null;
}

const NO_PEOPLE: MentionPerson[] = [];
const FILTERS: { value: ThreadFilter; label: string }[] = [
  { value: 'open', label: 'Open' },
  { value: 'resolved', label: 'Resolved' },
  { value: 'all', label: 'All' },
];

function CommentText({ body, names }: { body: string; names: readonly string[] }) {
  const segments = useMemo(() => splitMentions(body, names), [body, names]);
  return (
    <p className="whitespace-pre-wrap break-words text-sm text-ink-100" data-testid="comment-text">
      {segments.map((s, i) =>
        s.mention ? (
          <mark key={i} data-testid="comment-mention" className="rounded bg-lagoon-800/60 px-0.5 font-medium text-lagoon-100">
            {s.text}
          </mark>
        ) : (
          <span key={i}>{s.text}</span>
        ),
      )}
    </p>
  );
}

function Byline({ c }: { c: CommentDto }) {
  return (
    <p className="flex flex-wrap items-baseline gap-x-2 text-xs text-ink-400">
      <span className="font-medium text-ink-100" data-testid="comment-author">
        {c.author.name || c.author.email}
      </span>
      <time dateTime={c.createdAt}>{formatDateTime(c.createdAt)}</time>
    </p>
  );
}

/** The thread's number, drawn like its pin on the canvas (round = open, dashed square with a tick = resolved). */
function NumberMark({ n, resolved }: { n: number; resolved: boolean }) {
  return (
    <span
      aria-hidden="true"
      className={`inline-flex h-5 min-w-5 shrink-0 items-center justify-center px-1 text-[10px] font-bold tabular-nums ${resolved ? 'rounded-sm border border-dashed border-ink-400 text-ink-200' : 'rounded-full rounded-bl-none border border-copper-100 bg-copper-600 text-ink-50'}`}
    >
      {resolved ? `✓${n}` : n}
    </span>
  );
}

function ReplyForm({ thread, designId, people, onDone }: { thread: CommentDto; designId: string; people: readonly MentionPerson[]; onDone: () => void }) {
  const [body, setBody] = useState('');
  const create = useCreateComment(designId);
  const send = () => {
    if (!body.trim() || create.isPending) return;
    create.mutate({ revision: thread.revision, body: body.trim(), anchor: thread.anchor, parentId: thread.id }, { onSuccess: onDone });
  };
  return (
    <form
      className="space-y-1.5"
      data-testid="comment-reply-form"
      onSubmit={(e) => {
        e.preventDefault();
        send();
      }}
    >
      <MentionTextarea value={body} onChange={setBody} people={people} label="Your reply" placeholder="Reply… (@ to mention)" testId="comment-reply-body" autoFocus onSubmit={send} />
      {create.error ? <Notice tone="error">{formError(create.error)}</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" data-testid="comment-reply-submit" pending={create.isPending} pendingLabel="Sending…" disabled={!body.trim()}>
          Reply
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function Thread({
  thread,
  n,
  designId,
  names,
  people,
  mentionNames,
  canComment,
  selected,
}: {
  thread: CommentDto;
  n: number;
  designId: string;
  names: AnchorNames;
  people: readonly MentionPerson[];
  mentionNames: readonly string[];
  canComment: boolean;
  selected: boolean;
}) {
  const [replying, setReplying] = useState(false);
  const resolve = useResolveComment(designId);
  const key = anchorKey(thread.anchor);
  return (
    <li
      data-testid="comment-thread"
      data-comment-id={thread.id}
      data-anchor={key}
      data-part={thread.anchor.kind === 'part' ? (thread.anchor.part ?? undefined) : undefined}
      data-resolved={thread.resolved ? 'true' : 'false'}
      data-revision={thread.revision}
      data-selected={selected ? 'true' : undefined}
      onClick={() => commentsStore.getState().select(thread.id)}
      className={`scroll-mt-24 space-y-2 rounded-md border px-3 py-2 ${selected ? 'border-lagoon-400 bg-lagoon-800/20' : 'border-ink-800 bg-ink-900/40'} ${thread.resolved ? 'opacity-80' : ''}`}
    >
      <div className="flex items-start gap-2">
        <NumberMark n={n} resolved={thread.resolved} />
        <div className="min-w-0 flex-1 space-y-1">
          <Byline c={thread} />
          {thread.anchor.kind === 'part' && thread.anchor.part ? <p className="text-xs text-ink-400">on {anchorLabel(thread.anchor, names)}</p> : null}
          <CommentText body={thread.body} names={mentionNames} />
        </div>
      </div>
      {thread.resolved ? (
        <p className="text-xs text-ink-400" data-testid="comment-resolved-note">
          Resolved{thread.resolvedBy ? ` by ${thread.resolvedBy.name || thread.resolvedBy.email}` : ''}
          {thread.resolvedAt ? ` on ${formatDateTime(thread.resolvedAt)}` : ''}
        </p>
      ) : null}
      {thread.replies.length > 0 ? (
        <ol className="space-y-2 border-l border-ink-600 pl-3" aria-label="Replies">
          {thread.replies.map((r) => (
            <li key={r.id} data-testid="comment-reply-item" data-comment-id={r.id} className="space-y-0.5">
              <Byline c={r} />
              <CommentText body={r.body} names={mentionNames} />
            </li>
          ))}
        </ol>
      ) : null}
      {replying ? <ReplyForm thread={thread} designId={designId} people={people} onDone={() => setReplying(false)} /> : null}
      {resolve.error ? <Notice tone="error">{formError(resolve.error)}</Notice> : null}
      <div className="flex flex-wrap gap-2">
        {canComment && !replying ? (
          <Button variant="ghost" className="px-2 py-1 text-xs" data-testid="comment-reply" onClick={() => setReplying(true)}>
            Reply
          </Button>
        ) : null}
        {thread.canResolve ? (
          <Button
            variant="secondary"
            className="px-2 py-1 text-xs"
            data-testid="comment-resolve"
            data-action={thread.resolved ? 'reopen' : 'resolve'}
            pending={resolve.isPending}
            pendingLabel={thread.resolved ? 'Reopening…' : 'Resolving…'}
            onClick={(e) => {
              e.stopPropagation();
              resolve.mutate({ commentId: thread.id, resolved: !thread.resolved });
            }}
          >
            {thread.resolved ? 'Reopen' : 'Resolve'}
          </Button>
        ) : null}
      </div>
    </li>
  );
}

function NewCommentForm({ designId, revision, people, names }: { designId: string; revision: number; people: readonly MentionPerson[]; names: AnchorNames }) {
  const [body, setBody] = useState('');
  const draft = useComments((s) => s.draft);
  const picking = useComments((s) => s.picking);
  const create = useCreateComment(designId);
  const send = () => {
    if (!body.trim() || create.isPending) return;
    create.mutate(
      { revision, body: body.trim(), anchor: draft },
      {
        onSuccess: (res) => {
          setBody('');
          const s = commentsStore.getState();
          s.setDraft({ kind: 'design' });
          if (s.filter === 'resolved') s.setFilter('open');
          s.select(res.comment.id, { reveal: true });
        },
      },
    );
  };
  return (
    <form
      className="space-y-2 rounded-md border border-ink-800 bg-ink-900/40 p-3"
      data-testid="comment-form"
      onSubmit={(e) => {
        e.preventDefault();
        send();
      }}
    >
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <span className="text-ink-400">On</span>
        <span className="font-medium text-ink-50" data-testid="comment-anchor" data-anchor={anchorKey(draft)}>
          {anchorLabel(draft, names)}
        </span>
      </div>
      <div className="flex flex-wrap gap-2">
        <Button
          variant={picking ? 'primary' : 'secondary'}
          className="px-2 py-1 text-xs"
          data-testid="pin-comment"
          aria-pressed={picking}
          onClick={() => (picking ? commentsStore.getState().cancelPick() : commentsStore.getState().startPick())}
        >
          {picking ? 'Cancel pinning' : 'Pin to the canvas'}
        </Button>
        <Button variant="ghost" className="px-2 py-1 text-xs" data-testid="comment-anchor-design" disabled={draft.kind === 'design' && !picking} onClick={() => commentsStore.getState().pick({ kind: 'design' })}>
          Whole design
        </Button>
      </div>
      {picking ? <p className="text-xs text-copper-100">Now click a block, a port or a wire on the canvas.</p> : null}
      <MentionTextarea value={body} onChange={setBody} people={people} label="New comment" placeholder="Write a comment… (@ to mention a team member)" testId="comment-body" onSubmit={send} />
      {create.error ? <Notice tone="error">{formError(create.error)}</Notice> : null}
      <Button type="submit" data-testid="comment-submit" pending={create.isPending} pendingLabel="Posting…" disabled={!body.trim()}>
        Comment
      </Button>
    </form>
  );
}

function OtherRevisions({ comments, names, mentionNames, open, onToggle }: { comments: CommentDto[]; names: AnchorNames; mentionNames: readonly string[]; open: boolean; onToggle: (open: boolean) => void }) {
  const byRevision = useMemo(() => {
    const m = new Map<number, CommentDto[]>();
    for (const c of comments) m.set(c.revision, [...(m.get(c.revision) ?? []), c]);
    return [...m.entries()].sort((a, b) => b[0] - a[0]);
  }, [comments]);
  return (
    <details open={open} onToggle={(e) => onToggle(e.currentTarget.open)} data-testid="comments-other-revisions" className="rounded-md border border-ink-800 px-3 py-2">
      <summary className="cursor-pointer text-sm text-ink-200">
        Other revisions ({comments.length} thread{comments.length === 1 ? '' : 's'})
      </summary>
      <div className="mt-2 space-y-3">
        {byRevision.map(([rev, list]) => {
          const numbers = threadNumbers(list);
          return (
            <section key={rev} aria-label={`Comments on r${rev}`} className="space-y-1.5">
              <h4 className="text-xs font-semibold uppercase tracking-wide text-ink-400">r{rev}</h4>
              <ul className="space-y-1.5">
                {list.map((c) => (
                  <li key={c.id} data-testid="comment-other" data-comment-id={c.id} data-revision={rev} data-anchor={anchorKey(c.anchor)} className="scroll-mt-24 space-y-1 rounded-md border border-ink-800 bg-ink-900/40 px-3 py-2">
                    <div className="flex items-center gap-2 text-xs text-ink-400">
                      <NumberMark n={numbers.get(c.id) ?? 0} resolved={c.resolved} />
                      <span>{anchorLabel(c.anchor, names)}</span>
                      {c.replies.length > 0 ? <span>· {c.replies.length} repl{c.replies.length === 1 ? 'y' : 'ies'}</span> : null}
                    </div>
                    <Byline c={c} />
                    <CommentText body={c.body} names={mentionNames} />
                    {c.replies.map((r) => (
                      <div key={r.id} data-comment-id={r.id} className="border-l border-ink-600 pl-3">
                        <Byline c={r} />
                        <CommentText body={r.body} names={mentionNames} />
                      </div>
                    ))}
                  </li>
                ))}
              </ul>
            </section>
          );
        })}
      </div>
    </details>
  );
}

/** The comments list of one design revision, with the new-comment form; pairs with the canvas pins. */
export function CommentsPanel({ designId, teamId, revision, canComment, focusCommentId }: CommentsPanelProps) {
  const root = useRef<HTMLDivElement>(null);
  useEffect(() => {
    commentsStore.getState().attach(designId, revision, canComment);
  }, [designId, revision, canComment]);
  useEffect(() => () => commentsStore.getState().detach(designId), [designId]);

  const attached = useComments((s) => s.designId === designId && s.revision === revision);
  const filter = useComments((s) => s.filter);
  const selected = useComments((s) => s.selected);
  const reveal = useComments((s) => s.reveal);
  const names = useComments((s) => s.names);
  const current = useRevisionComments(designId, revision);
  const all = useAllComments(designId);
  const members = useMembers(teamId);
  // Closed unless the user opens it, or a deep link points into it.
  const [othersToggled, setOthersToggled] = useState<boolean | null>(null);

  const threads = useMemo(() => current.data?.comments ?? [], [current.data]);
  const others = useMemo(() => (all.data?.comments ?? []).filter((c) => c.parentId === null && c.revision !== revision), [all.data, revision]);
  const people: readonly MentionPerson[] = members.data?.members ?? NO_PEOPLE;
  const mentionNames = useMemo(() => {
    const set = new Set(people.map((p) => p.name).filter(Boolean));
    for (const c of [...threads, ...others]) for (const x of [c, ...c.replies]) for (const m of x.mentions) if (m.name) set.add(m.name);
    return [...set];
  }, [people, threads, others]);
  const groups = useMemo(() => groupThreads(threads, filter), [threads, filter]);
  const numbers = useMemo(() => threadNumbers(threads), [threads]);
  const counts = useMemo(() => threadCounts(threads), [threads]);
  const focusInOthers = focusCommentId !== null && threadOf(threads, focusCommentId) === null && threadOf(others, focusCommentId) !== null;
  const othersOpen = othersToggled ?? focusInOthers;

  // A deep link's comment: select its thread, widen the filter if it hides it, scroll to it once.
  const focused = useRef<string | null>(null);
  useEffect(() => {
    if (!focusCommentId || focused.current === focusCommentId || !attached || !current.data) return;
    const t = threadOf(threads, focusCommentId);
    if (t) {
      focused.current = focusCommentId;
      const s = commentsStore.getState();
      if (t.resolved && s.filter === 'open') s.setFilter('all');
      s.select(t.id, { reveal: true });
      return;
    }
    if (!all.data) return;
    const o = threadOf(others, focusCommentId);
    focused.current = focusCommentId;
    if (o) {
      window.requestAnimationFrame(() => root.current?.querySelector(`[data-testid="comment-other"][data-comment-id="${o.id}"]`)?.scrollIntoView({ block: 'center', behavior: 'smooth' }));
    }
  }, [focusCommentId, attached, current.data, all.data, threads, others]);

  // A pin clicked (or a thread just posted or linked): bring its thread into view.
  useEffect(() => {
    if (reveal === 0 || !selected) return;
    window.requestAnimationFrame(() => root.current?.querySelector(`[data-testid="comment-thread"][data-comment-id="${selected}"]`)?.scrollIntoView({ block: 'nearest', behavior: 'smooth' }));
  }, [reveal, selected]);

  return (
    <Panel title={<span>Comments on r{revision}</span>} testId="comments-panel">
      <div ref={root} className="space-y-3">
        <div className="flex flex-wrap gap-1" role="group" aria-label="Show threads">
          {FILTERS.map((f) => (
            <button
              key={f.value}
              type="button"
              aria-pressed={filter === f.value}
              data-testid={`comment-filter-${f.value}`}
              onClick={() => commentsStore.getState().setFilter(f.value)}
              className={`rounded-md border px-2 py-0.5 text-xs ${filter === f.value ? 'border-lagoon-400 bg-lagoon-800/40 text-ink-50' : 'border-ink-600 text-ink-200 hover:border-ink-400'}`}
            >
              {f.label} <span className="tabular-nums text-ink-400">{counts[f.value]}</span>
            </button>
          ))}
        </div>

        {canComment ? <NewCommentForm designId={designId} revision={revision} people={people} names={names} /> : <p className="text-xs text-ink-400">Your role lets you read the comments, not add to them.</p>}

        {current.isPending ? <Skeleton lines={3} /> : null}
        {current.isError ? <Notice tone="error">{formError(current.error)}</Notice> : null}
        {current.data && groups.length === 0 ? (
          <p className="text-sm text-ink-400" data-testid="comments-empty">
            {counts.all === 0 ? `No comments on r${revision} yet.` : filter === 'open' ? 'No open threads: everything here is resolved.' : 'No resolved threads.'}
          </p>
        ) : null}
        {groups.map((g) => (
          <section key={g.key} aria-label={anchorLabel(g.anchor, names)} data-testid="comment-group" data-anchor={g.key} className="space-y-1.5">
            <h3 className="text-xs font-semibold text-ink-400">{anchorLabel(g.anchor.kind === 'part' ? { kind: 'part', blockId: g.anchor.blockId } : g.anchor, names)}</h3>
            <ul className="space-y-2">
              {g.threads.map((t) => (
                <Thread key={t.id} thread={t} n={numbers.get(t.id) ?? 0} designId={designId} names={names} people={people} mentionNames={mentionNames} canComment={canComment} selected={selected === t.id} />
              ))}
            </ul>
          </section>
        ))}

        {others.length > 0 ? <OtherRevisions comments={others} names={names} mentionNames={mentionNames} open={othersOpen} onToggle={setOthersToggled} /> : null}
      </div>
    </Panel>
  );
}
