'use client';
/**
 * Sweeps and tolerance spreads of the shown revision, run in the background: the form, Run, a
 * progress bar while the worker computes (polled every second), then the plots. Anyone who can
 * read the design may run one; it changes nothing in the design. The recent runs are listed
 * below; choosing one shows it.
 */
import { useState } from 'react';
import type { AnalysisDto } from '@/lib/analyses/contract';
import { MAX_SPREAD_SAMPLES, MAX_SWEEP_POINTS, MAX_SWEEP_STAGES, PARAMETER_INFO, SWEEP_PARAMETERS, type SweepParameter } from '@/lib/analyses/spec';
import { DEFAULT_FORM, specFromForm, useAnalyses, useAnalysis, useCancelAnalysis, useStartAnalysis, type AnalysisForm } from '@/lib/client/analyses';
import { fieldError, formError } from '@/lib/client/api';
import { formatDateTime } from '@/lib/client/format';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import { SpreadPlots, SweepPlots, parameterText } from './analysis-plots';

const UNIT_HINT: Record<SweepParameter, string> = {
  stages: `whole numbers, up to ${MAX_SWEEP_STAGES}`,
  loadCurrent: 'amperes, e.g. 100u or 2m',
  frequency: 'hertz, e.g. 10k',
  capacitance: 'farads, e.g. 4.7n (the bottom pumping capacitor; all stage capacitors scale with it)',
};

function describe(a: Pick<AnalysisDto, 'spec'>): string {
  const s = a.spec;
  if (s.kind === 'spread') return `Spread · ${s.samples} samples · seed ${s.seed} · ${s.distribution}`;
  if (s.parameter === 'stages') return `Sweep · stages ${s.from}–${s.to}`;
  return `Sweep · ${PARAMETER_INFO[s.parameter].label.toLowerCase()} ${parameterText(s.parameter, s.from)}–${parameterText(s.parameter, s.to)} (${s.points} points, ${s.scale})`;
}

/** Server errors shown under their own field rather than beside Run. */
const FORM_FIELDS = ['spec.from', 'spec.to', 'spec.points', 'spec.scale', 'spec.samples', 'spec.seed', 'spec.assumedTolerance', 'spec.loadTolerance'];

const STATUS_TONE = { queued: 'neutral', running: 'live', done: 'result', failed: 'warn', cancelled: 'neutral' } as const;

function Progress({ a }: { a: AnalysisDto }) {
  const pct = Math.round(a.progress * 100);
  return (
    <div className="space-y-1">
      <div
        role="progressbar"
        aria-label={`Analysis progress: ${a.donePoints} of ${a.totalPoints} points`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        data-testid="analysis-progress"
        className="h-2.5 w-full overflow-hidden rounded-full bg-ink-900"
      >
        <div className="h-full bg-lagoon-400 transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      <p className="text-xs text-ink-400" data-testid="analysis-progress-text">
        {a.status === 'queued' ? 'Waiting for the worker' : a.status === 'running' ? 'Computing' : a.status} · {a.donePoints} / {a.totalPoints} {a.kind === 'spread' ? 'samples' : 'points'}
        {a.attempts > 1 ? ` · attempt ${a.attempts}` : ''}
      </p>
    </div>
  );
}

function RunView({ designId, analysisId, userId, isOwner }: { designId: string; analysisId: string; userId: string; isOwner: boolean }) {
  const q = useAnalysis(analysisId);
  const cancel = useCancelAnalysis(designId);
  if (q.isPending) return <Skeleton lines={3} />;
  if (q.isError) return <Notice tone="error">{formError(q.error)}</Notice>;
  const a = q.data.analysis;
  const open = a.status === 'queued' || a.status === 'running';
  return (
    <div className="space-y-3" data-testid="analysis-run-view" data-status={a.status}>
      <div className="flex flex-wrap items-center gap-2 text-sm text-ink-100">
        <span>{describe(a)}</span>
        <span className="text-ink-400">on r{a.revision}</span>
        <Badge tone={STATUS_TONE[a.status]} testId="analysis-status">
          {a.status}
        </Badge>
        {open && (a.createdBy.id === userId || isOwner) ? (
          <Button variant="ghost" onClick={() => cancel.mutate(a.id)} pending={cancel.isPending} data-testid="analysis-cancel">
            Cancel
          </Button>
        ) : null}
      </div>
      {a.status !== 'done' ? <Progress a={a} /> : null}
      {a.status === 'failed' ? <Notice tone="error">The run failed: {a.error}</Notice> : null}
      {cancel.isError ? <Notice tone="error">{formError(cancel.error)}</Notice> : null}
      {a.status === 'done' && a.result?.kind === 'sweep' ? <SweepPlots result={a.result} logX={a.spec.kind === 'sweep' && a.spec.parameter !== 'stages' && a.spec.scale === 'log'} /> : null}
      {a.status === 'done' && a.result?.kind === 'spread' ? <SpreadPlots result={a.result} /> : null}
    </div>
  );
}

export function AnalysesPanel({ designId, revision, userId, isOwner }: { designId: string; revision: number; userId: string; isOwner: boolean }) {
  const [form, setForm] = useState<AnalysisForm>(DEFAULT_FORM);
  const [localError, setLocalError] = useState<{ field: string; message: string } | null>(null);
  const [shown, setShown] = useState<string | null>(null);
  const start = useStartAnalysis(designId);
  const list = useAnalyses(designId);
  const set = <K extends keyof AnalysisForm>(k: K, v: AnalysisForm[K]) => {
    setForm((f) => ({ ...f, [k]: v }));
    setLocalError(null);
  };
  const err = (field: string, specField = field) => (localError?.field === field ? localError.message : fieldError(start.error, `spec.${specField}`));
  const current = shown ?? list.data?.analyses[0]?.id ?? null;

  const run = () => {
    const r = specFromForm(form);
    if (!r.ok) return setLocalError({ field: r.field, message: r.message });
    start.mutate({ revision, spec: r.spec }, { onSuccess: (res) => setShown(res.analysis.id) });
  };

  return (
    <Panel title="Sweeps and tolerance spreads" testId="analyses-panel">
      <div className="space-y-4">
        <p className="text-xs text-ink-400">
          Runs in the background on the server for revision r{revision}; you can leave the page and come back. Each point is a full steady-state solve. A sweep steps one value; a spread draws every capacitor within its
          tolerance (diodes are not varied). The figures are a model: a built supply can hold a lethal charge whatever they say. Fit bleeders, discharge and ground every stage before touching, and follow
          your local codes.
        </p>
        <form
          className="grid gap-3 sm:grid-cols-3"
          onSubmit={(e) => {
            e.preventDefault();
            run();
          }}
          aria-label="New analysis"
        >
          <SelectField label="Kind" value={form.kind} onChange={(e) => set('kind', e.target.value as AnalysisForm['kind'])} data-testid="analysis-kind">
            <option value="spread">Tolerance spread (Monte Carlo)</option>
            <option value="sweep">Sweep one value</option>
          </SelectField>
          {form.kind === 'sweep' ? (
            <>
              <SelectField label="Parameter" value={form.parameter} onChange={(e) => set('parameter', e.target.value as SweepParameter)} data-testid="analysis-parameter" error={err('parameter')}>
                {SWEEP_PARAMETERS.map((p) => (
                  <option key={p} value={p}>
                    {PARAMETER_INFO[p].label}
                  </option>
                ))}
              </SelectField>
              <span />
              <TextField label="From" value={form.from} onChange={(e) => set('from', e.target.value)} hint={UNIT_HINT[form.parameter]} error={err('from')} data-testid="analysis-from" inputMode="decimal" />
              <TextField label="To" value={form.to} onChange={(e) => set('to', e.target.value)} error={err('to')} data-testid="analysis-to" inputMode="decimal" />
              {form.parameter !== 'stages' ? (
                <div className="grid grid-cols-2 gap-2">
                  <TextField label="Points" value={form.points} onChange={(e) => set('points', e.target.value)} hint={`2–${MAX_SWEEP_POINTS}`} error={err('points')} data-testid="analysis-points" inputMode="numeric" />
                  <SelectField label="Steps" value={form.scale} onChange={(e) => set('scale', e.target.value as AnalysisForm['scale'])} error={err('scale')}>
                    <option value="linear">linear</option>
                    <option value="log">logarithmic</option>
                  </SelectField>
                </div>
              ) : (
                <span />
              )}
            </>
          ) : (
            <>
              <TextField label="Samples" value={form.samples} onChange={(e) => set('samples', e.target.value)} hint={`2–${MAX_SPREAD_SAMPLES}`} error={err('samples')} data-testid="analysis-samples" inputMode="numeric" />
              <TextField label="Seed" value={form.seed} onChange={(e) => set('seed', e.target.value)} hint="the same seed gives the same samples" error={err('seed')} data-testid="analysis-seed" inputMode="numeric" />
              <SelectField
                label="Draw"
                value={form.distribution}
                onChange={(e) => set('distribution', e.target.value as AnalysisForm['distribution'])}
                hint={form.distribution === 'uniform' ? 'anywhere within ±tolerance, equally likely' : 'normal, 3σ = tolerance, cut at ±tolerance'}
              >
                <option value="uniform">uniform</option>
                <option value="normal">normal (3σ)</option>
              </SelectField>
              <TextField
                label="Tolerance where none is stated (%)"
                value={form.assumedTolerancePct}
                onChange={(e) => set('assumedTolerancePct', e.target.value)}
                hint="capacitors with their own tolerance use it"
                error={err('assumedTolerancePct', 'assumedTolerance')}
                inputMode="decimal"
              />
              <TextField label="Load tolerance (%)" value={form.loadTolerancePct} onChange={(e) => set('loadTolerancePct', e.target.value)} hint="0 keeps the load as drawn" error={err('loadTolerancePct', 'loadTolerance')} inputMode="decimal" />
            </>
          )}
          <div className="flex items-end gap-3 sm:col-span-3">
            <Button type="submit" pending={start.isPending} pendingLabel="Queueing…" data-testid="analysis-run">
              Run
            </Button>
            {formError(start.error, FORM_FIELDS) ? (
              <span className="text-sm text-hazard-100" role="alert" data-testid="analysis-error">
                {formError(start.error, FORM_FIELDS)}
              </span>
            ) : null}
          </div>
        </form>

        {current ? <RunView key={current} designId={designId} analysisId={current} userId={userId} isOwner={isOwner} /> : null}

        {list.data && list.data.analyses.length > 0 ? (
          <div>
            <h3 className="mb-1 text-sm font-medium text-ink-200">Recent runs</h3>
            <ul className="divide-y divide-ink-800 text-xs" data-testid="analysis-list">
              {list.data.analyses.map((a) => (
                <li key={a.id}>
                  <button
                    type="button"
                    onClick={() => setShown(a.id)}
                    aria-current={a.id === current ? 'true' : undefined}
                    className={`flex w-full flex-wrap items-center gap-2 rounded px-1 py-1 text-left hover:bg-ink-800 ${a.id === current ? 'text-lagoon-100' : 'text-ink-200'}`}
                  >
                    <span>{describe(a)}</span>
                    <span className="text-ink-400">
                      r{a.revision} · {a.createdBy.name} · {formatDateTime(a.createdAt)}
                    </span>
                    <Badge tone={STATUS_TONE[a.status]}>{a.status === 'running' ? `${Math.round(a.progress * 100)} %` : a.status}</Badge>
                  </button>
                </li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>
    </Panel>
  );
}
