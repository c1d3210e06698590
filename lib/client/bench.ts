'use client';
/**
 * Browser side of bench data: multipart calls to the bench routes (the JSON `api()` wrapper sends
 * JSON only) and their react-query hooks. A file that does not read throws a
 * {@link BenchFileError} carrying every problem with its 1-based line.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { BenchMapping } from '@/lib/bench/mapping';
import type { CsvError } from '@/lib/bench/parse';
import type { BenchDatasetDto, BenchDetailDto, BenchInspectDto } from '@/lib/bench/types';
import { ApiError } from './api';

/** A 422 for the file itself: the problems by line. */
export class BenchFileError extends ApiError {
  readonly lines: CsvError[];
  constructor(status: number, body: { code: string; message: string; field?: string; lines: CsvError[] }) {
    super(status, body);
    this.lines = body.lines;
  }
}

export const benchKeys = {
  list: (designId: string) => ['designs', designId, 'bench'] as const,
  detail: (datasetId: string, revision: number | null) => ['bench', datasetId, revision ?? 'own'] as const,
};

async function send<T>(url: string, init: RequestInit): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, { ...init, credentials: 'same-origin', headers: { accept: 'application/json' } });
  } catch (e) {
    if (e instanceof DOMException && e.name === 'AbortError') throw e;
    throw new ApiError(0, { code: 'network', message: 'Could not reach the server. Check your connection and try again.' });
  }
  const text = await res.text();
  let parsed: unknown;
  try {
    parsed = text ? JSON.parse(text) : undefined;
  } catch {
    parsed = undefined;
  }
  if (!res.ok) {
    const err = (parsed as { error?: { code: string; message: string; field?: string; lines?: CsvError[] } } | undefined)?.error;
    if (err && Array.isArray(err.lines)) throw new BenchFileError(res.status, { ...err, lines: err.lines });
    if (err && typeof err.message === 'string') throw new ApiError(res.status, err);
    throw new ApiError(res.status, { code: `http_${res.status}`, message: `The server answered ${res.status} ${res.statusText}.` });
  }
  return parsed as T;
}

/** What the upload form sends besides the file. */
export interface BenchUploadInput {
  file: File;
  mapping: BenchMapping;
  name: string;
  notes?: string;
  revision?: number;
}

/** The design's bench datasets. */
export function useBenchDatasets(designId: string) {
  return useQuery({
    queryKey: benchKeys.list(designId),
    queryFn: ({ signal }) => send<{ datasets: BenchDatasetDto[] }>(`/api/designs/${encodeURIComponent(designId)}/bench`, { method: 'GET', signal }),
  });
}

/** One dataset with its comparison against `revision` (null = the dataset's own revision). */
export function useBenchDataset(datasetId: string | null, revision: number | null) {
  return useQuery({
    queryKey: benchKeys.detail(datasetId ?? '', revision),
    enabled: datasetId !== null,
    queryFn: ({ signal }) =>
      send<BenchDetailDto>(`/api/bench/${encodeURIComponent(datasetId ?? '')}${revision !== null ? `?revision=${revision}` : ''}`, { method: 'GET', signal }),
  });
}

/** Read a file's columns and a suggested mapping (stores nothing). */
export function useInspectBench(designId: string) {
  return useMutation({
    mutationFn: (file: File) => {
      const fd = new FormData();
      fd.set('file', file);
      return send<{ inspect: BenchInspectDto }>(`/api/designs/${encodeURIComponent(designId)}/bench/inspect`, { method: 'POST', body: fd });
    },
  });
}

/** Upload a file with its mapping. */
export function useUploadBench(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: BenchUploadInput) => {
      const fd = new FormData();
      fd.set('file', input.file);
      fd.set('mapping', JSON.stringify(input.mapping));
      fd.set('name', input.name);
      if (input.notes) fd.set('notes', input.notes);
      if (input.revision !== undefined) fd.set('revision', String(input.revision));
      return send<{ dataset: BenchDatasetDto }>(`/api/designs/${encodeURIComponent(designId)}/bench`, { method: 'POST', body: fd });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: benchKeys.list(designId) }),
  });
}

/** Delete a dataset. */
export function useDeleteBench(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (datasetId: string) => send<{ deleted: true }>(`/api/bench/${encodeURIComponent(datasetId)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: benchKeys.list(designId) }),
  });
}
