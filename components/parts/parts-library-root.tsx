'use client';

import Link from 'next/link';
import { useDeferredValue, useId, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import { ApiError, formError } from '@/lib/client/api';
import { formatDateTime } from '@/lib/client/format';
import { useTeam } from '@/lib/client/hooks';
import { datasheetUrl, useDeletePart, useParts, useRemoveDatasheet, useUploadDatasheet, type PartListParams } from '@/lib/client/parts';
import { MAX_DATASHEET_BYTES, PART_KINDS, type PartDto, type PartKind } from '@/lib/parts/schema';
import { ImportDialog } from './import-dialog';
import { PartFormDialog } from './part-form';
import { KIND_LABEL, costText, keyValue, ratingsText, toleranceText } from './part-form-model';
import { PolicyPanel } from './policy-panel';

type Sort = NonNullable<PartListParams['sort']>;

function SortHeader({ label, value, sort, dir, onSort }: { label: string; value: Sort; sort: Sort; dir: 'asc' | 'desc'; onSort: (s: Sort) => void }) {
  const active = sort === value;
  return (
    <th scope="col" aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'} className="px-3 py-2 text-left font-medium">
      <button type="button" onClick={() => onSort(value)} className={`rounded ${active ? 'text-ink-50' : 'text-ink-400 hover:text-ink-100'}`} data-testid={`parts-sort-${value}`}>
        {label}
        <span aria-hidden="true" className="ml-1 text-xs">
          {active ? (dir === 'asc' ? '▲' : '▼') : '↕'}
        </span>
      </button>
    </th>
  );
}

function Th({ children, right = false }: { children: React.ReactNode; right?: boolean }) {
  return (
    <th scope="col" className={`px-3 py-2 font-medium text-ink-400 ${right ? 'text-right' : 'text-left'}`}>
      {children}
    </th>
  );
}

/** Datasheet link, upload (PDF, at most 10 MB) and removal for one part. */
function DatasheetCell({ teamId, part, canEdit }: { teamId: string; part: PartDto; canEdit: boolean }) {
  const input = useRef<HTMLInputElement>(null);
  const upload = useUploadDatasheet(teamId);
  const remove = useRemoveDatasheet(teamId);
  const [localError, setLocalError] = useState<string | null>(null);
  const sheet = part.datasheet;
  function pick(file: File | undefined) {
    setLocalError(null);
    upload.reset();
    if (!file) return;
    if (file.size > MAX_DATASHEET_BYTES) return setLocalError('The file is larger than 10 MB.');
    if (file.type && file.type !== 'application/pdf') return setLocalError('A datasheet must be a PDF.');
    upload.mutate({ partId: part.id, file });
  }
  const error = localError ?? formError(upload.error) ?? formError(remove.error);
  return (
    <div className="space-y-1" data-testid="datasheet-cell">
      {sheet ? (
        <a href={datasheetUrl(part.id)} className="block max-w-44 truncate text-lagoon-100 underline decoration-lagoon-600 hover:text-lagoon-400" title={`${sheet.fileName}, ${(sheet.sizeBytes / 1024).toFixed(0)} kB, ${formatDateTime(sheet.uploadedAt)}`} data-testid="datasheet-link">
          {sheet.fileName}
        </a>
      ) : (
        <span className="text-ink-400">—</span>
      )}
      {canEdit ? (
        <div className="flex gap-1">
          <input ref={input} type="file" accept="application/pdf,.pdf" className="sr-only" tabIndex={-1} onChange={(e) => pick(e.target.files?.[0])} aria-label={`Datasheet PDF for ${part.partNumber}`} data-testid="datasheet-file" />
          <button type="button" onClick={() => input.current?.click()} disabled={upload.isPending} className="rounded px-1 text-xs text-ink-200 hover:bg-ink-800 hover:text-ink-50" data-testid="datasheet-upload">
            {upload.isPending ? 'Uploading…' : sheet ? 'Replace' : 'Upload PDF'}
          </button>
          {sheet ? (
            <button type="button" onClick={() => remove.mutate(part.id)} disabled={remove.isPending} className="rounded px-1 text-xs text-hazard-100 hover:bg-hazard-700/40" data-testid="datasheet-remove">
              Remove
            </button>
          ) : null}
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="max-w-44 text-xs text-hazard-100">
          {error}
        </p>
      ) : null}
    </div>
  );
}

function DeleteButton({ teamId, part }: { teamId: string; part: PartDto }) {
  const del = useDeletePart(teamId);
  const [confirm, setConfirm] = useState(false);
  if (!confirm)
    return (
      <button type="button" onClick={() => setConfirm(true)} className="rounded px-1.5 py-0.5 text-xs text-hazard-100 hover:bg-hazard-700/40" data-testid="part-delete">
        Delete
      </button>
    );
  return (
    <span className="inline-flex flex-wrap items-center gap-1 text-xs" role="group" aria-label={`Delete ${part.partNumber}?`}>
      <span className="text-ink-200">Delete {part.partNumber}? Designs bound to it keep their copied values.</span>
      <button type="button" onClick={() => del.mutate(part.id)} disabled={del.isPending} className="rounded bg-hazard-700 px-1.5 py-0.5 text-hazard-100 hover:bg-hazard-500" data-testid="part-delete-confirm">
        {del.isPending ? 'Deleting…' : 'Delete'}
      </button>
      <button type="button" onClick={() => setConfirm(false)} className="rounded px-1.5 py-0.5 text-ink-200 hover:bg-ink-800">
        Keep
      </button>
      {del.error ? (
        <span role="alert" className="text-hazard-100">
          {formError(del.error)}
        </span>
      ) : null}
    </span>
  );
}

function PartRow({ teamId, part, canEdit, onEdit }: { teamId: string; part: PartDto; canEdit: boolean; onEdit: (p: PartDto) => void }) {
  return (
    <tr className="border-t border-ink-800 align-top hover:bg-ink-800/50" data-testid="part-row" data-part-id={part.id} data-part-number={part.partNumber} data-kind={part.kind}>
      <td className="px-3 py-2">
        <span className="font-mono font-medium text-ink-50" data-testid="part-number">
          {part.partNumber}
        </span>
        {part.description ? <span className="block max-w-56 truncate text-xs text-ink-400">{part.description}</span> : null}
      </td>
      <td className="px-3 py-2">
        <Badge tone={part.kind === 'diode' ? 'live' : 'neutral'}>{KIND_LABEL[part.kind]}</Badge>
      </td>
      <td className="px-3 py-2 text-ink-200">{part.maker || '—'}</td>
      <td className="whitespace-nowrap px-3 py-2 font-mono text-ink-100" data-testid="part-key-value">
        {keyValue(part)}
      </td>
      <td className="whitespace-nowrap px-3 py-2 text-ink-200" data-testid="part-ratings">
        {ratingsText(part)}
      </td>
      <td className="whitespace-nowrap px-3 py-2 text-ink-200">{toleranceText(part)}</td>
      <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums text-ink-200">{costText(part)}</td>
      <td className="px-3 py-2">
        <DatasheetCell teamId={teamId} part={part} canEdit={canEdit} />
      </td>
      {canEdit ? (
        <td className="px-3 py-2 text-right">
          <div className="flex flex-col items-end gap-1">
            <button type="button" onClick={() => onEdit(part)} className="rounded px-1.5 py-0.5 text-xs text-ink-100 hover:bg-ink-800 hover:text-ink-50" data-testid="part-edit">
              Edit
            </button>
            <DeleteButton teamId={teamId} part={part} />
          </div>
        </td>
      ) : null}
    </tr>
  );
}

/**
 * The team's parts library: search, kind filter and sort (done by the server), one row per part
 * with its key value, ratings, tolerance, cost and datasheet; owners and designers add, edit,
 * delete, import and attach datasheets, everyone else reads. The derating policy sits on top.
 */
export function PartsLibraryRoot({ teamId }: { teamId: string }) {
  const team = useTeam(teamId);
  const [q, setQ] = useState('');
  const [kind, setKind] = useState<PartKind | ''>('');
  const [sort, setSort] = useState<Sort>('partNumber');
  const [dir, setDir] = useState<'asc' | 'desc'>('asc');
  const [editing, setEditing] = useState<PartDto | 'new' | null>(null);
  const [importing, setImporting] = useState(false);
  const deferredQ = useDeferredValue(q);
  const parts = useParts(teamId, { q: deferredQ, kind: kind || undefined, sort, dir }, team.isSuccess);
  const searchId = useId();
  const kindId = useId();

  if (team.isError) {
    const missing = team.error instanceof ApiError && team.error.status === 404;
    return <Notice tone="error">{missing ? 'This team does not exist, or you are not a member.' : formError(team.error)}</Notice>;
  }
  const role = team.data?.team.role;
  const canEdit = role === 'owner' || role === 'designer';
  const onSort = (s: Sort) => {
    if (s === sort) setDir((d) => (d === 'asc' ? 'desc' : 'asc'));
    else {
      setSort(s);
      setDir(s === 'updated' ? 'desc' : 'asc');
    }
  };

  return (
    <div className="space-y-5" data-testid="parts-library" data-can-edit={canEdit ? 'true' : 'false'}>
      <div className="flex flex-wrap items-center justify-between gap-4">
        <div>
          <p className="text-sm text-ink-400">
            <Link href={`/teams/${teamId}`} className="rounded hover:text-lagoon-400">
              {team.data?.team.name ?? 'Team'}
            </Link>{' '}
            ›
          </p>
          <h1 className="text-2xl font-semibold text-ink-50">Parts library</h1>
          {role ? (
            <p className="text-sm text-ink-400" data-testid="parts-role-note">
              {canEdit ? 'You can add, edit and import parts.' : `You are a ${role} here: the library is read-only for you.`}
            </p>
          ) : null}
        </div>
        {canEdit ? (
          <div className="flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => setImporting(true)} data-testid="parts-import">
              Import CSV…
            </Button>
            <Button onClick={() => setEditing('new')} data-testid="new-part">
              New part
            </Button>
          </div>
        ) : null}
      </div>

      <PolicyPanel teamId={teamId} canEdit={role === 'owner'} />

      <Panel>
        <div className="mb-3 flex flex-wrap items-end gap-4">
          <div className="min-w-64 flex-1">
            <label htmlFor={searchId} className="mb-1 block text-sm font-medium text-ink-200">
              Search parts
            </label>
            <input
              id={searchId}
              type="search"
              value={q}
              onChange={(e) => setQ(e.target.value)}
              placeholder="Part number, maker or description"
              data-testid="parts-search"
              className="block w-full rounded-md border border-ink-600 bg-ink-900 px-2.5 py-1.5 text-sm text-ink-50 placeholder:text-ink-400 hover:border-ink-400"
            />
          </div>
          <div>
            <label htmlFor={kindId} className="mb-1 block text-sm font-medium text-ink-200">
              Kind
            </label>
            <select id={kindId} value={kind} onChange={(e) => setKind(e.target.value as PartKind | '')} data-testid="parts-kind" className="rounded-md border border-ink-600 bg-ink-900 px-2 py-1.5 text-sm text-ink-50 hover:border-ink-400">
              <option value="">All kinds</option>
              {PART_KINDS.map((k) => (
                <option key={k} value={k}>
                  {KIND_LABEL[k]}s
                </option>
              ))}
            </select>
          </div>
        </div>

        {parts.isPending ? (
          <Skeleton lines={4} />
        ) : parts.isError ? (
          <Notice tone="error">{formError(parts.error)}</Notice>
        ) : parts.data.parts.length === 0 ? (
          <p className="py-6 text-center text-sm text-ink-400" data-testid="no-parts">
            {deferredQ || kind ? 'No part matches that search.' : canEdit ? 'No parts yet. Add one, or import a CSV file.' : 'The team has no parts in its library yet.'}
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-sm" data-testid="parts-table" aria-busy={parts.isFetching || undefined}>
              <caption className="sr-only">Parts of this team</caption>
              <thead>
                <tr>
                  <SortHeader label="Part number" value="partNumber" sort={sort} dir={dir} onSort={onSort} />
                  <SortHeader label="Kind" value="kind" sort={sort} dir={dir} onSort={onSort} />
                  <SortHeader label="Maker" value="maker" sort={sort} dir={dir} onSort={onSort} />
                  <Th>Value</Th>
                  <Th>Ratings</Th>
                  <Th>Tolerance</Th>
                  <SortHeader label="Unit cost" value="unitCost" sort={sort} dir={dir} onSort={onSort} />
                  <Th>Datasheet</Th>
                  {canEdit ? <Th right>Actions</Th> : null}
                </tr>
              </thead>
              <tbody>
                {parts.data.parts.map((p) => (
                  <PartRow key={p.id} teamId={teamId} part={p} canEdit={canEdit} onEdit={setEditing} />
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
      {editing ? <PartFormDialog teamId={teamId} part={editing === 'new' ? null : editing} initialKind={kind || 'capacitor'} onClose={() => setEditing(null)} /> : null}
      {importing ? <ImportDialog teamId={teamId} onClose={() => setImporting(false)} /> : null}
    </div>
  );
}
