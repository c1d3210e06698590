'use client';

import Link from 'next/link';
import { useDeferredValue, useId, useState } from 'react';
import { ButtonLink } from '@/components/ui/button';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import type { DesignSummaryDto } from '@/lib/api/contract';
import { ApiError, formError } from '@/lib/client/api';
import { formatDateTime, statusLabel, topologyLabel } from '@/lib/client/format';
import { useDesigns, useTeam, type DesignListParams } from '@/lib/client/hooks';
import { NewDesignDialog } from './new-design-dialog';
import { TeamSwitcher } from './team-switcher';

type Sort = NonNullable<DesignListParams['sort']>;

const SORTS: { value: Sort; label: string }[] = [
  { value: 'updated', label: 'Last updated' },
  { value: 'title', label: 'Title' },
  { value: 'author', label: 'Author' },
  { value: 'status', label: 'Status' },
];

function SortHeader({ label, value, sort, onSort }: { label: string; value: Sort; sort: Sort; onSort: (s: Sort) => void }) {
  const active = sort === value;
  return (
    <th scope="col" aria-sort={active ? (value === 'updated' ? 'descending' : 'ascending') : 'none'} className="px-3 py-2 text-left font-medium">
      <button type="button" onClick={() => onSort(value)} className={`rounded ${active ? 'text-ink-50' : 'text-ink-400 hover:text-ink-100'}`}>
        {label}
        <span aria-hidden="true" className="ml-1 text-xs">
          {active ? (value === 'updated' ? '▼' : '▲') : '↕'}
        </span>
      </button>
    </th>
  );
}

function DesignRow({ d }: { d: DesignSummaryDto }) {
  return (
    <tr className="border-t border-ink-800 hover:bg-ink-800/50" data-testid="design-row">
      <td className="px-3 py-2">
        <Link href={`/designs/${d.id}`} className="rounded font-medium text-ink-50 hover:text-lagoon-400" data-testid="design-link">
          {d.title}
        </Link>
        <span className="ml-2 inline-flex gap-1">
          {d.visibility === 'private' ? <Badge>private</Badge> : null}
          {d.archived ? <Badge tone="warn">archived</Badge> : null}
        </span>
      </td>
      <td className="px-3 py-2 text-ink-200">{d.author.name || d.author.email}</td>
      <td className="px-3 py-2 text-ink-200">{topologyLabel(d.topology)}</td>
      <td className="px-3 py-2 tabular-nums text-ink-200">{d.stages ?? '—'}</td>
      <td className="px-3 py-2">
        <Badge tone={d.status === 'approved' ? 'result' : 'neutral'}>{statusLabel(d.status)}</Badge>
      </td>
      <td className="whitespace-nowrap px-3 py-2 text-ink-400">{formatDateTime(d.updatedAt)}</td>
      <td className="px-3 py-2 text-ink-400">
        {d.forkedFrom ? (
          <Link href={`/designs/${d.forkedFrom.designId}`} className="rounded hover:text-lagoon-400">
            {d.forkedFrom.title} r{d.forkedFrom.revision}
          </Link>
        ) : (
          '—'
        )}
      </td>
    </tr>
  );
}

/** A team's designs: switcher, search, sort, the table, and "New design" for those who may create. */
export function TeamDesignsRoot({ teamId }: { teamId: string }) {
  const team = useTeam(teamId);
  const [q, setQ] = useState('');
  const [sort, setSort] = useState<Sort>('updated');
  const [archived, setArchived] = useState(false);
  const deferredQ = useDeferredValue(q);
  const designs = useDesigns(teamId, { q: deferredQ, sort, archived });
  const searchId = useId();
  const sortId = useId();

  if (team.isError) {
    const missing = team.error instanceof ApiError && team.error.status === 404;
    return <Notice tone="error">{missing ? 'This team does not exist, or you are not a member.' : formError(team.error)}</Notice>;
  }
  const role = team.data?.team.role;
  const canCreate = role === 'owner' || role === 'designer';

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-center justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold text-ink-50" data-testid="team-name">
            {team.data?.team.name ?? ' '}
          </h1>
          {role ? <p className="text-sm text-ink-400">You are {role === 'owner' ? 'an' : 'a'} {role} here.</p> : null}
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <TeamSwitcher teamId={teamId} />
          <ButtonLink href={`/teams/${teamId}/parts`} variant="secondary" data-testid="team-parts-link">
            Parts library
          </ButtonLink>
          <ButtonLink href={`/teams/${teamId}/settings`} variant="secondary" data-testid="team-settings-link">
            Members &amp; settings
          </ButtonLink>
          {canCreate ? <NewDesignDialog teamId={teamId} /> : null}
        </div>
      </div>

      <Panel>
        <div className="mb-3 flex flex-wrap items-end gap-4">
          <div className="min-w-64 flex-1">
            <label htmlFor={searchId} className="mb-1 block text-sm font-medium text-ink-200">
              Search designs
            </label>
            <input
              id={searchId}
              type="search"
              value={q}
              onChange={(e) => setQ(e.target.value)}
              placeholder="Title or description"
              data-testid="design-search"
              className="block w-full rounded-md border border-ink-600 bg-ink-900 px-2.5 py-1.5 text-sm text-ink-50 placeholder:text-ink-400 hover:border-ink-400"
            />
          </div>
          <div>
            <label htmlFor={sortId} className="mb-1 block text-sm font-medium text-ink-200">
              Sort by
            </label>
            <select
              id={sortId}
              value={sort}
              onChange={(e) => setSort(e.target.value as Sort)}
              data-testid="design-sort"
              className="rounded-md border border-ink-600 bg-ink-900 px-2 py-1.5 text-sm text-ink-50 hover:border-ink-400"
            >
              {SORTS.map((s) => (
                <option key={s.value} value={s.value}>
                  {s.label}
                </option>
              ))}
            </select>
          </div>
          <label className="flex items-center gap-2 pb-1.5 text-sm text-ink-200">
            <input type="checkbox" checked={archived} onChange={(e) => setArchived(e.target.checked)} className="accent-lagoon-400" />
            Include archived
          </label>
        </div>

        {designs.isPending ? (
          <Skeleton lines={4} />
        ) : designs.isError ? (
          <Notice tone="error">{formError(designs.error)}</Notice>
        ) : designs.data.designs.length === 0 ? (
          <p className="py-6 text-center text-sm text-ink-400" data-testid="no-designs">
            {deferredQ ? 'No design matches that search.' : canCreate ? 'No designs yet. Start one from a ladder.' : 'No designs shared with the team yet.'}
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-sm" data-testid="design-table" aria-busy={designs.isFetching || undefined}>
              <caption className="sr-only">Designs of this team</caption>
              <thead>
                <tr>
                  <SortHeader label="Title" value="title" sort={sort} onSort={setSort} />
                  <SortHeader label="Author" value="author" sort={sort} onSort={setSort} />
                  <th scope="col" className="px-3 py-2 text-left font-medium text-ink-400">
                    Topology
                  </th>
                  <th scope="col" className="px-3 py-2 text-left font-medium text-ink-400">
                    Stages
                  </th>
                  <SortHeader label="Status" value="status" sort={sort} onSort={setSort} />
                  <SortHeader label="Updated" value="updated" sort={sort} onSort={setSort} />
                  <th scope="col" className="px-3 py-2 text-left font-medium text-ink-400">
                    Forked from
                  </th>
                </tr>
              </thead>
              <tbody>
                {designs.data.designs.map((d) => (
                  <DesignRow key={d.id} d={d} />
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </div>
  );
}
