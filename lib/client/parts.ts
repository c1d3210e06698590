'use client';
/**
 * react-query hooks for the team parts library (lib/parts/schema.ts is the contract the routes
 * and these hooks share): the list with search, kind filter and sort; create, replace, delete;
 * the CSV import (dry run first); datasheet upload, download link and removal; the team's
 * derating policy. JSON calls go through `api()` (lib/client/api.ts) so errors arrive as
 * {@link ApiError} with the server's `field`; the datasheet upload is multipart and parses the
 * same error body.
 */
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PartDto, PartImportReport, PartInputRaw, PartKind, PartsPolicy } from '@/lib/parts/schema';
import { ApiError, api, routeUrl, type RequestOptions, type RouteKey } from './api';

/** Response bodies of the parts routes, by route (the contract's shape for these routes). */
export interface PartsApi {
  'GET /api/teams/:teamId/parts': { parts: PartDto[] };
  'POST /api/teams/:teamId/parts': { part: PartDto };
  'GET /api/parts/:partId': { part: PartDto };
  'PATCH /api/parts/:partId': { part: PartDto };
  'DELETE /api/parts/:partId': unknown;
  'POST /api/teams/:teamId/parts/import': PartImportReport | { report: PartImportReport };
  'DELETE /api/parts/:partId/datasheet': unknown;
  'GET /api/teams/:teamId/parts-policy': { policy: PartsPolicy };
  'PUT /api/teams/:teamId/parts-policy': { policy: PartsPolicy };
}
type PartsKey = keyof PartsApi;

/** `api()` for a parts route (the same fetch, JSON and error handling as every other call). */
function callParts<K extends PartsKey>(key: K, opts: Omit<RequestOptions<RouteKey>, 'params'> & { params?: Record<string, string> }): Promise<PartsApi[K]> {
  return api(key as unknown as RouteKey, opts as RequestOptions<RouteKey>) as unknown as Promise<PartsApi[K]>;
}

/** Search, kind filter and sort of the parts list (see `partListQuerySchema`). */
export interface PartListParams {
  q?: string;
  kind?: PartKind;
  sort?: 'partNumber' | 'kind' | 'maker' | 'unitCost' | 'updated';
  dir?: 'asc' | 'desc';
}

export const partKeys = {
  all: (teamId: string) => ['teams', teamId, 'parts'] as const,
  list: (teamId: string, q: PartListParams) => ['teams', teamId, 'parts', 'list', q] as const,
  policy: (teamId: string) => ['teams', teamId, 'parts-policy'] as const,
};

/** The team's parts, searched, filtered and sorted by the server; keeps the previous list while a new one loads. */
export function useParts(teamId: string | undefined, q: PartListParams = {}, enabled = true) {
  return useQuery({
    queryKey: partKeys.list(teamId ?? '', q),
    queryFn: ({ signal }) =>
      callParts('GET /api/teams/:teamId/parts', {
        params: { teamId: teamId as string },
        query: { q: q.q?.trim() || undefined, kind: q.kind, sort: q.sort, dir: q.dir },
        signal,
      }),
    enabled: enabled && !!teamId,
    placeholderData: keepPreviousData,
  });
}

/** The team's derating policy (everyone in the team reads it). */
export function usePartsPolicy(teamId: string | undefined) {
  return useQuery({
    queryKey: partKeys.policy(teamId ?? ''),
    queryFn: ({ signal }) => callParts('GET /api/teams/:teamId/parts-policy', { params: { teamId: teamId as string }, signal }),
    enabled: !!teamId,
  });
}

/** Sets the derating policy (owners; the server refuses everyone else). */
export function useSetPartsPolicy(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (policy: PartsPolicy) => callParts('PUT /api/teams/:teamId/parts-policy', { params: { teamId }, body: policy }),
    onSuccess: (res) => qc.setQueryData(partKeys.policy(teamId), res),
  });
}

/** Creates a part (owners and designers). */
export function useCreatePart(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: PartInputRaw) => callParts('POST /api/teams/:teamId/parts', { params: { teamId }, body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: partKeys.all(teamId) }),
  });
}

/** Replaces a part's values (PATCH takes the whole part). */
export function useUpdatePart(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ partId, input }: { partId: string; input: PartInputRaw }) => callParts('PATCH /api/parts/:partId', { params: { partId }, body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: partKeys.all(teamId) }),
  });
}

/** Deletes a part. Designs bound to it keep their copied values. */
export function useDeletePart(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (partId: string) => callParts('DELETE /api/parts/:partId', { params: { partId } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: partKeys.all(teamId) }),
  });
}

/** The report of an import call, whichever way the route wraps it. */
export function importReportOf(body: PartsApi['POST /api/teams/:teamId/parts/import']): PartImportReport {
  return 'report' in body ? body.report : body;
}

/** Imports parts from CSV text; `dryRun` checks every row and changes nothing. */
export function useImportParts(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async ({ csv, dryRun }: { csv: string; dryRun: boolean }) => importReportOf(await callParts('POST /api/teams/:teamId/parts/import', { params: { teamId }, body: { csv, dryRun } })),
    onSuccess: (report) => {
      if (!report.dryRun) void qc.invalidateQueries({ queryKey: partKeys.all(teamId) });
    },
  });
}

/** Where a part's datasheet downloads from (same origin; the route sends it as an attachment). */
export function datasheetUrl(partId: string): string {
  return routeUrl('GET /api/parts/:partId/datasheet' as unknown as RouteKey, { partId } as never);
}

/** Uploads a PDF datasheet (multipart field `file`); the server checks the type and the size. */
export async function uploadDatasheet(partId: string, file: File): Promise<unknown> {
  const form = new FormData();
  form.append('file', file, file.name);
  let res: Response;
  try {
    res = await fetch(datasheetUrl(partId), { method: 'PUT', body: form, credentials: 'same-origin', headers: { accept: 'application/json' } });
  } catch {
    throw new ApiError(0, { code: 'network', message: 'Could not reach the server. Check your connection and try again.' });
  }
  const text = await res.text();
  let body: unknown;
  try {
    body = text ? JSON.parse(text) : undefined;
  } catch {
    body = undefined;
  }
  if (!res.ok) {
    const err = (body as { error?: { code?: unknown; message?: unknown; field?: unknown } } | undefined)?.error;
    if (err && typeof err.message === 'string') throw new ApiError(res.status, { code: String(err.code ?? `http_${res.status}`), message: err.message, field: typeof err.field === 'string' ? err.field : undefined });
    throw new ApiError(res.status, { code: `http_${res.status}`, message: res.status === 413 ? 'The file is larger than 10 MB.' : `The server answered ${res.status} ${res.statusText}.` });
  }
  return body;
}

/** Uploads or replaces a part's datasheet. */
export function useUploadDatasheet(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ partId, file }: { partId: string; file: File }) => uploadDatasheet(partId, file),
    onSuccess: () => qc.invalidateQueries({ queryKey: partKeys.all(teamId) }),
  });
}

/** Removes a part's datasheet. */
export function useRemoveDatasheet(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (partId: string) => callParts('DELETE /api/parts/:partId/datasheet', { params: { partId } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: partKeys.all(teamId) }),
  });
}
