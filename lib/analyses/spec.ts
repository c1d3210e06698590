/**
 * What an analysis run computes, as the client sends it and the worker reads it back from the
 * `analyses.spec` column. Two kinds:
 *
 * - `sweep`: one parameter stepped over a range, every other value as drawn. Parameters: the
 *   stage count (whole numbers from `from` to `to`), the DC load current (A), the drive frequency
 *   (Hz) or the stage capacitance (F: the bottom stage's pumping capacitor is set to the value and
 *   every pumping and smoothing capacitor of every stage is scaled by the same factor, so their
 *   ratios stay as drawn). Linear or logarithmic steps.
 * - `spread`: a Monte Carlo spread over part tolerances. Every stage capacitor (pumping,
 *   smoothing, second pumping) and every separate capacitor block is drawn within its own
 *   `tolerance`; a capacitor with none stated gets `assumedTolerance`. Optionally the load
 *   (resistance or current) is drawn within `loadTolerance`. Diodes have no tolerance in the
 *   document and are not varied.
 *
 * Limits (validated here, documented in the docs): a sweep has at most {@link MAX_SWEEP_POINTS}
 * points, a stage sweep at most {@link MAX_SWEEP_STAGES} stages; a spread at most
 * {@link MAX_SPREAD_SAMPLES} samples. Every point's solve has a wall-clock budget
 * ({@link POINT_BUDGET_MS}); a point that fails is recorded with its reason.
 */
import { z } from '../circuit/zod';

export const MAX_SWEEP_POINTS = 60;
export const MAX_SWEEP_STAGES = 40;
export const MAX_SPREAD_SAMPLES = 500;
export const MIN_SPREAD_SAMPLES = 2;
/** Wall-clock budget of one point's solve (ms). */
export const POINT_BUDGET_MS = 10_000;

export const SWEEP_PARAMETERS = ['stages', 'loadCurrent', 'frequency', 'capacitance'] as const;
export type SweepParameter = (typeof SWEEP_PARAMETERS)[number];

/** Unit and words for each sweep parameter (the UI and the plots read these). */
export const PARAMETER_INFO: Record<SweepParameter, { label: string; unit: string }> = {
  stages: { label: 'Stage count', unit: '' },
  loadCurrent: { label: 'Load current', unit: 'A' },
  frequency: { label: 'Drive frequency', unit: 'Hz' },
  capacitance: { label: 'Stage capacitance', unit: 'F' },
};

const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });

const stageSweep = z
  .object({
    kind: z.literal('sweep'),
    parameter: z.literal('stages'),
    from: z.number().int('must be a whole number').min(1, 'must be at least 1').max(MAX_SWEEP_STAGES, `must be at most ${MAX_SWEEP_STAGES}`),
    to: z.number().int('must be a whole number').min(1, 'must be at least 1').max(MAX_SWEEP_STAGES, `must be at most ${MAX_SWEEP_STAGES}`),
  })
  .superRefine((s, ctx) => {
    if (s.to <= s.from) ctx.addIssue({ code: 'custom', message: 'must be greater than from', path: ['to'] });
  });

const valueSweep = z
  .object({
    kind: z.literal('sweep'),
    parameter: z.enum(['loadCurrent', 'frequency', 'capacitance']),
    from: finite,
    to: finite,
    points: z.number().int('must be a whole number').min(2, 'must be at least 2').max(MAX_SWEEP_POINTS, `must be at most ${MAX_SWEEP_POINTS}`),
    scale: z.enum(['linear', 'log']).default('linear'),
  })
  .superRefine((s, ctx) => {
    const minimum = s.parameter === 'loadCurrent' ? 0 : Number.MIN_VALUE;
    if (s.from < minimum) ctx.addIssue({ code: 'custom', message: s.parameter === 'loadCurrent' ? 'must not be negative' : 'must be greater than zero', path: ['from'] });
    if (s.to <= s.from) ctx.addIssue({ code: 'custom', message: 'must be greater than from', path: ['to'] });
    if (s.scale === 'log' && !(s.from > 0)) ctx.addIssue({ code: 'custom', message: 'a logarithmic sweep must start above zero', path: ['from'] });
  });

const fraction = finite.refine((v) => v >= 0 && v <= 0.5, { message: 'must be a fraction from 0 to 0.5 (±50 %)' });

const spread = z.object({
  kind: z.literal('spread'),
  samples: z.number().int('must be a whole number').min(MIN_SPREAD_SAMPLES, `must be at least ${MIN_SPREAD_SAMPLES}`).max(MAX_SPREAD_SAMPLES, `must be at most ${MAX_SPREAD_SAMPLES}`),
  seed: z.number().int('must be a whole number').min(0, 'must not be negative').max(2 ** 32 - 1, 'must fit in 32 bits'),
  /** `uniform`: anywhere in ±tolerance with equal chance; `normal`: 3σ = tolerance, cut at ±tolerance. */
  distribution: z.enum(['uniform', 'normal']).default('uniform'),
  /** Tolerance used for capacitors that state none (fraction). */
  assumedTolerance: fraction.default(0.1),
  /** Tolerance of the load's resistance or current (fraction; 0 = the load as drawn). */
  loadTolerance: fraction.default(0),
});

/** An analysis spec (the body's `spec`). */
export const analysisSpecSchema = z.discriminatedUnion('kind', [z.discriminatedUnion('parameter', [stageSweep, valueSweep]), spread]);
export type AnalysisSpec = z.output<typeof analysisSpecSchema>;
export type AnalysisSpecInput = z.input<typeof analysisSpecSchema>;
export type SweepSpec = Extract<AnalysisSpec, { kind: 'sweep' }>;
export type SpreadSpec = Extract<AnalysisSpec, { kind: 'spread' }>;

/** Number of points (sweep) or samples (spread) the run computes. */
export function pointCount(spec: AnalysisSpec): number {
  if (spec.kind === 'spread') return spec.samples;
  if (spec.parameter === 'stages') return spec.to - spec.from + 1;
  return spec.points;
}

/** The parameter value of sweep point `index` (0-based). */
export function sweepValue(spec: SweepSpec, index: number): number {
  if (spec.parameter === 'stages') return spec.from + index;
  const n = spec.points;
  if (index === n - 1) return spec.to;
  const t = index / (n - 1);
  return spec.scale === 'log' ? spec.from * Math.pow(spec.to / spec.from, t) : spec.from + t * (spec.to - spec.from);
}

/** Every parameter value of a sweep, in order. */
export function sweepValues(spec: SweepSpec): number[] {
  return Array.from({ length: pointCount(spec) }, (_, i) => sweepValue(spec, i));
}
