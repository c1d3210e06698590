'use client';

import Link from 'next/link';
import { useRouter, useSearchParams } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import type { DesignDetailDto } from '@/lib/api/contract';
import { ApiError, formError } from '@/lib/client/api';
import { formatDateTime, statusLabel } from '@/lib/client/format';
import { useDesign, useForkDesign, useMe, useRevision, useRevisions, useUpdateDesign } from '@/lib/client/hooks';
import { AnalysesPanel } from '@/components/analyses/analyses-panel';
import { BenchPanel } from '@/components/bench/bench-panel';
import { CommentsPanel } from '@/components/comments/comments-panel';
import { DesignEditor } from '@/components/editor/design-editor';
import { DownloadsPanel } from '@/components/exports/downloads-panel';
import { DocumentSummaryView } from './document-summary-view';
import { LineagePanel } from './lineage-panel';
import { ReviewPanel } from './review-panel';

function Actions({ design, revision }: { design: DesignDetailDto; revision: number | null }) {
  const router = useRouter();
  const fork = useForkDesign(design.id);
  const update = useUpdateDesign(design.id);
  const p = design.permissions;
  const error = fork.error ?? update.error;
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2">
        {p.fork ? (
          <Button
            data-testid="fork-design"
            pending={fork.isPending}
            pendingLabel="Forking…"
            onClick={() => fork.mutate(revision !== null ? { revision } : {}, { onSuccess: (res) => router.push(`/designs/${res.design.id}`) })}
          >
            {revision !== null ? `Fork from r${revision}` : 'Fork'}
          </Button>
        ) : null}
        {p.share ? (
          <Button
            variant="secondary"
            data-testid="toggle-visibility"
            pending={update.isPending && update.variables?.visibility !== undefined}
            disabled={update.isPending}
            onClick={() => update.mutate({ visibility: design.visibility === 'team' ? 'private' : 'team' })}
          >
            {design.visibility === 'team' ? 'Make private' : 'Share with team'}
          </Button>
        ) : null}
        {p.archive ? (
          <Button
            variant="danger"
            data-testid="toggle-archive"
            disabled={update.isPending}
            onClick={() => {
              if (design.archived || window.confirm('Archive this design? It leaves the list but stays readable.')) update.mutate({ archived: !design.archived });
            }}
          >
            {design.archived ? 'Unarchive' : 'Archive'}
          </Button>
        ) : null}
      </div>
      {error ? <Notice tone="error">{formError(error)}</Notice> : null}
    </div>
  );
}

/** The editor is wider than the page column: it takes the window width (with a margin), centred. */
const EDITOR_WIDTH = 'min(calc(100vw - 3rem), 1760px)';

function Revisions({ designId, latest, selected, onSelect }: { designId: string; latest: number; selected: number; onSelect: (n: number) => void }) {
  const revisions = useRevisions(designId);
  if (revisions.isPending) return <Skeleton lines={3} />;
  if (revisions.isError) return <Notice tone="error">{formError(revisions.error)}</Notice>;
  return (
    <ol className="space-y-1" data-testid="revision-list">
      {revisions.data.revisions.map((r) => (
        <li key={r.number}>
          <button
            type="button"
            onClick={() => onSelect(r.number)}
            aria-current={r.number === selected ? 'true' : undefined}
            data-testid="revision-item"
            className={`w-full rounded-md border px-3 py-2 text-left text-sm ${r.number === selected ? 'border-lagoon-400 bg-lagoon-800/30' : 'border-ink-800 hover:border-ink-600'}`}
          >
            <span className="flex items-center justify-between gap-2">
              <span className="font-medium text-ink-50">
                r{r.number}
                {r.number === latest ? <span className="ml-2 text-xs font-normal text-lagoon-400">latest</span> : null}
              </span>
              <span className="text-xs text-ink-400">{formatDateTime(r.createdAt)}</span>
            </span>
            <span className="block truncate text-ink-200" title={r.message || undefined}>
              {r.message || 'No message'}
            </span>
            <span className="block text-xs text-ink-400">{r.author.name || r.author.email}</span>
          </button>
        </li>
      ))}
    </ol>
  );
}

/** A positive revision number from a query value, else null. */
function revisionParam(v: string | null): number | null {
  if (!v || !/^[1-9][0-9]{0,8}$/.test(v)) return null;
  return Number(v);
}

/**
 * The design page: header, lineage and actions, the editor (the working copy on the latest
 * revision; an older revision picked in the history opens read-only in its place), review and
 * sign-off, revision history, lineage and offers, and the high-voltage caution. A link may name
 * `?revision=` (opened in the editor), `?review=` (the review panel scrolled into view) and
 * `?comment=` (that comment focused in the comments panel).
 */
export function DesignRoot({ designId }: { designId: string }) {
  const design = useDesign(designId);
  const search = useSearchParams();
  const focusReviewId = search.get('review');
  const [chosen, setChosen] = useState<number | null>(() => revisionParam(search.get('revision')));
  const latestNumber = design.data?.revision.number ?? null;
  // An older revision opens read-only in place of the working copy; the latest (or a number past it) is the working copy.
  const showing = chosen !== null && latestNumber !== null && chosen < latestNumber ? chosen : null;
  const other = useRevision(designId, showing);
  const me = useMe();
  const [editHere, setEditHere] = useState(false);

  if (design.isPending || me.isPending) return <Skeleton lines={6} />;
  if (design.isError) {
    const missing = design.error instanceof ApiError && design.error.status === 404;
    return (
      <Notice tone="error" testId="design-error">
        {missing ? 'This design does not exist, or you do not have access to it.' : formError(design.error)}
      </Notice>
    );
  }
  const d = design.data.design;
  const rev = showing !== null && other.data ? other.data.revision : design.data.revision;
  const selected = showing ?? design.data.revision.number;
  const p = d.permissions;
  // A teammate's design opens to view; editing it in place is a deliberate choice.
  const viewingColleague = me.data?.user.id !== d.author.id && p.edit && !d.archived && !editHere;
  const userId = me.data?.user.id ?? '';
  const role = me.data?.teams.find((t) => t.id === d.teamId)?.role;

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div className="space-y-1">
          <p className="text-sm text-ink-400">
            <Link href={`/teams/${d.teamId}`} className="rounded hover:text-lagoon-400">
              ← Team designs
            </Link>
          </p>
          <h1 className="text-2xl font-semibold text-ink-50" data-testid="design-title">
            {d.title}
          </h1>
          <div className="flex flex-wrap items-center gap-2 text-sm text-ink-400">
            <Badge tone={d.status === 'approved' ? 'result' : 'neutral'} testId="design-status">
              {statusLabel(d.status)}
            </Badge>
            <Badge testId="design-visibility">{d.visibility === 'team' ? 'shared with team' : 'private'}</Badge>
            {d.archived ? <Badge tone="warn">archived</Badge> : null}
            <span>
              by {d.author.name || d.author.email} · r{d.latestRevision} · updated {formatDateTime(d.updatedAt)}
            </span>
          </div>
          {d.forkedFrom ? (
            <p className="text-sm text-ink-200" data-testid="forked-from">
              Forked from{' '}
              <Link href={`/designs/${d.forkedFrom.designId}`} className="rounded text-lagoon-400 hover:underline">
                {d.forkedFrom.title}
              </Link>{' '}
              at r{d.forkedFrom.revision}
            </p>
          ) : null}
          {d.description ? <p className="max-w-3xl text-sm text-ink-200">{d.description}</p> : null}
        </div>
        <Actions design={d} revision={showing} />
      </div>

      <div className="space-y-2" style={{ width: EDITOR_WIDTH, marginLeft: `calc(50% - ${EDITOR_WIDTH} / 2)` }}>
        <p className="text-xs text-ink-400" data-testid="revision-line">
          {showing !== null ? <span className="mr-2 text-copper-400">older revision</span> : null}
          r{selected}, saved by {rev.author.name || rev.author.email} on {formatDateTime(rev.createdAt)}
          {rev.message ? `: “${rev.message}”` : ''}
        </p>
        {showing !== null && other.isPending ? <Skeleton lines={4} /> : null}
        {showing !== null && other.isError ? <Notice tone="error">{formError(other.error)}</Notice> : null}
        {showing !== null && other.data ? (
          <DesignEditor
            key={`r${other.data.revision.number}`}
            designId={d.id}
            title={`${d.title} r${other.data.revision.number}`}
            revisionNumber={other.data.revision.number}
            document={other.data.revision.document}
            mode="revision"
            canEdit={false}
            canFork={p.fork}
          />
        ) : null}
        {/* One editor at a time (test ids stay unique); leaving the working copy autosaves it, and
            coming back offers to restore it. */}
        {showing === null && viewingColleague ? (
          <p className="flex flex-wrap items-center gap-2 text-sm text-ink-200" data-testid="viewing-colleague">
            This is {d.author.name || d.author.email}&rsquo;s design.
            <Button variant="secondary" data-testid="edit-here" onClick={() => setEditHere(true)}>
              Edit here
            </Button>
          </p>
        ) : null}
        {showing === null ? (
          <DesignEditor
            key={`${d.id}:${viewingColleague ? 'view' : 'edit'}`}
            designId={d.id}
            title={d.title}
            revisionNumber={design.data.revision.number}
            document={design.data.revision.document}
            mode="working"
            canEdit={p.edit && !d.archived && !viewingColleague}
            readOnlyReason={d.archived ? 'archived' : viewingColleague ? 'viewing' : 'role'}
            canFork={p.fork}
          />
        ) : null}
      </div>

      <div className="grid gap-5 lg:grid-cols-[1fr_20rem]">
        <div className="space-y-5">
          <p className="rounded-md border border-copper-600 bg-copper-800/30 px-4 py-3 text-sm text-copper-100" data-testid="design-caution">
            The numbers here describe a circuit that can hold a lethal charge. Treat every stage as live until it is
            discharged and measured, and have the build checked against your local codes by licensed people.
          </p>

          <ReviewPanel design={d} userId={userId} role={role} focusReviewId={focusReviewId} />

          <AnalysesPanel designId={d.id} revision={selected} userId={userId} isOwner={role === 'owner'} />

          <BenchPanel designId={d.id} revision={selected} canUpload={p.edit} />

          <CommentsPanel designId={d.id} teamId={d.teamId} revision={selected} canComment={p.comment} focusCommentId={search.get('comment')} />

          <Panel title={<span>Stored revision r{selected} in brief</span>} testId="summary-panel">
            <DocumentSummaryView document={rev.document} topology={rev.number === d.latestRevision ? d.topology : undefined} />
          </Panel>
        </div>

        <div className="space-y-5">
          <Panel title="Revision history">
            <Revisions designId={designId} latest={d.latestRevision} selected={selected} onSelect={setChosen} />
          </Panel>
          <LineagePanel design={d} userId={userId} />
          <DownloadsPanel designId={d.id} revision={selected} />
        </div>
      </div>
    </div>
  );
}
