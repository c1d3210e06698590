'use client';
/**
 * Browser side of analysis runs: the form's words turned into a spec (engineering notation such
 * as `10n` or `2.5m` for values, checked before sending and again on the server), and the
 * react-query hooks. A run is polled every second while it is queued or running and no more
 * once it has finished.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AnalysisDto, AnalysisSummaryDto, CreateAnalysisInput } from '@/lib/analyses/contract';
import { analysisSpecSchema, type AnalysisSpec, type SweepParameter } from '@/lib/analyses/spec';
import { parseEngineering } from '@/lib/circuit/netlist/units';
import { ApiError } from './api';

/** What the form holds (text as typed). */
export interface AnalysisForm {
  kind: 'sweep' | 'spread';
  parameter: SweepParameter;
  from: string;
  to: string;
  points: string;
  scale: 'linear' | 'log';
  samples: string;
  seed: string;
  distribution: 'uniform' | 'normal';
  /** Per cent, e.g. "10". */
  assumedTolerancePct: string;
  loadTolerancePct: string;
}

export const DEFAULT_FORM: AnalysisForm = {
  kind: 'spread',
  parameter: 'stages',
  from: '1',
  to: '8',
  points: '10',
  scale: 'linear',
  samples: '40',
  seed: '1',
  distribution: 'uniform',
  assumedTolerancePct: '10',
  loadTolerancePct: '0',
};

/** The spec the form describes, or the form field that is wrong and why. */
export function specFromForm(f: AnalysisForm): { ok: true; spec: AnalysisSpec } | { ok: false; field: string; message: string } {
  const num = (field: keyof AnalysisForm, text: string, engineering: boolean): number | { field: string; message: string } => {
    const v = engineering ? parseEngineering(text) : text.trim() === '' ? null : Number(text);
    return v === null || !Number.isFinite(v) ? { field, message: 'enter a number' } : v;
  };
  const values: Record<string, unknown> = { kind: f.kind };
  const fields: Array<[keyof AnalysisForm, string, boolean]> =
    f.kind === 'spread'
      ? [
          ['samples', 'samples', false],
          ['seed', 'seed', false],
          ['assumedTolerancePct', 'assumedTolerance', false],
          ['loadTolerancePct', 'loadTolerance', false],
        ]
      : f.parameter === 'stages'
        ? [
            ['from', 'from', false],
            ['to', 'to', false],
          ]
        : [
            ['from', 'from', true],
            ['to', 'to', true],
            ['points', 'points', false],
          ];
  for (const [formKey, specKey, eng] of fields) {
    const v = num(formKey, f[formKey] as string, eng);
    if (typeof v !== 'number') return { ok: false, ...v };
    values[specKey] = specKey.endsWith('Tolerance') ? v / 100 : v;
  }
  if (f.kind === 'spread') values.distribution = f.distribution;
  else {
    values.parameter = f.parameter;
    if (f.parameter !== 'stages') values.scale = f.scale;
  }
  const parsed = analysisSpecSchema.safeParse(values);
  if (parsed.success) return { ok: true, spec: parsed.data };
  const issue = parsed.error.issues[0];
  const key = String(issue?.path[0] ?? 'kind');
  const back: Record<string, keyof AnalysisForm> = { assumedTolerance: 'assumedTolerancePct', loadTolerance: 'loadTolerancePct' };
  return { ok: false, field: back[key] ?? key, message: issue?.message ?? 'not valid' };
}

async function send<T>(url: string, init: RequestInit = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, { ...init, credentials: 'same-origin', headers: { accept: 'application/json', ...(init.body ? { 'content-type': 'application/json' } : {}) } });
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
    const err = (parsed as { error?: { code: string; message: string; field?: string } } | undefined)?.error;
    throw new ApiError(res.status, err ?? { code: `http_${res.status}`, message: `The server answered ${res.status} ${res.statusText}.` });
  }
  return parsed as T;
}

export const analysisKeys = {
  list: (designId: string) => ['designs', designId, 'analyses'] as const,
  one: (analysisId: string) => ['analyses', analysisId] as const,
};

const finished = (s: string | undefined) => s === 'done' || s === 'failed' || s === 'cancelled';

/** The design's recent runs. */
export function useAnalyses(designId: string) {
  return useQuery({
    queryKey: analysisKeys.list(designId),
    queryFn: ({ signal }) => send<{ analyses: AnalysisSummaryDto[] }>(`/api/designs/${encodeURIComponent(designId)}/analyses`, { signal }),
  });
}

/** One run, polled every second until it has finished. */
export function useAnalysis(analysisId: string | null) {
  const qc = useQueryClient();
  return useQuery({
    queryKey: analysisKeys.one(analysisId ?? ''),
    enabled: analysisId !== null,
    queryFn: async ({ signal }) => {
      const r = await send<{ analysis: AnalysisDto }>(`/api/analyses/${encodeURIComponent(analysisId as string)}`, { signal });
      if (finished(r.analysis.status)) void qc.invalidateQueries({ queryKey: analysisKeys.list(r.analysis.designId) });
      return r;
    },
    refetchInterval: (q) => (finished(q.state.data?.analysis.status) ? false : 1000),
  });
}

/** Starts a run. */
export function useStartAnalysis(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateAnalysisInput) => send<{ analysis: AnalysisDto }>(`/api/designs/${encodeURIComponent(designId)}/analyses`, { method: 'POST', body: JSON.stringify(body) }),
    onSuccess: (r) => {
      qc.setQueryData(analysisKeys.one(r.analysis.id), r);
      return qc.invalidateQueries({ queryKey: analysisKeys.list(designId) });
    },
  });
}

/** Cancels a queued or running run. */
export function useCancelAnalysis(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (analysisId: string) => send<{ analysis: AnalysisDto }>(`/api/analyses/${encodeURIComponent(analysisId)}`, { method: 'DELETE' }),
    onSuccess: (r) => {
      qc.setQueryData(analysisKeys.one(r.analysis.id), r);
      return qc.invalidateQueries({ queryKey: analysisKeys.list(designId) });
    },
  });
}
