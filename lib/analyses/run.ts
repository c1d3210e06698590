/**
 * One point of an analysis and the run's result. A point is one variant of the design
 * (variants.ts) solved with the same server-side periodic steady-state solve and figures the
 * compare page uses (`resultsOf`, lib/compare/results.ts: output DC, ripple peak-to-peak, worst
 * stress margin against derated ratings), within {@link POINT_BUDGET_MS}. A point that does not
 * build, compile or solve is kept with its reason; the run goes on.
 *
 * The stage-count sweep's optimum is the stage count with the highest output DC among the points
 * that solved (the smaller count on a tie). Textbook check: n_opt = √(Vp·f·C/I) (REFERENCES §1.1;
 * tests/reference/optimum-stages.test.ts).
 */
import type { DesignDocument } from '../circuit/document/schema';
import { resultsOf } from '../compare/results';
import { distribution, type Distribution } from './stats';
import { POINT_BUDGET_MS, sweepValue, type AnalysisSpec, type SpreadSpec, type SweepParameter, type SweepSpec } from './spec';
import { spreadVariant, sweepVariant } from './variants';

/** One computed point: a sweep step or a spread sample. SI units; margin is a fraction. */
export type PointResult =
  | {
      index: number;
      /** Sweep parameter value (stages, A, Hz or F); for a spread, the sample number. */
      value: number;
      ok: true;
      outputDcV: number;
      rippleV: number | null;
      /** (allowed − actual)/allowed of the most stressed part; null when no part has a rating. */
      worstMargin: number | null;
      worstPart: string | null;
      /** Elapsed solve time (ms). */
      ms: number;
    }
  | { index: number; value: number; ok: false; reason: string; ms: number };

export interface SweepResult {
  kind: 'sweep';
  parameter: SweepParameter;
  points: PointResult[];
  /** Stage sweep only: the stage count with the highest output DC; null when no point solved. */
  optimum: { value: number; outputDcV: number } | null;
  failed: number;
}

export interface SpreadResult {
  kind: 'spread';
  points: PointResult[];
  output: Distribution | null;
  ripple: Distribution | null;
  failed: number;
}

export type AnalysisResult = SweepResult | SpreadResult;

/** The document point `index` solves, or why it cannot be built. */
export function pointDocument(doc: DesignDocument, spec: AnalysisSpec, index: number): { ok: true; document: DesignDocument } | { ok: false; reason: string } {
  if (spec.kind === 'spread') return { ok: true, document: spreadVariant(doc, spec, index).document };
  return sweepVariant(doc, spec, index);
}

/** Solve point `index` of `spec` on `doc`. */
export function computePoint(doc: DesignDocument, spec: AnalysisSpec, index: number, budgetMs = POINT_BUDGET_MS): PointResult {
  const value = spec.kind === 'spread' ? index + 1 : sweepValue(spec, index);
  const t0 = Date.now();
  const variant = pointDocument(doc, spec, index);
  if (!variant.ok) return { index, value, ok: false, reason: variant.reason, ms: Date.now() - t0 };
  let r: ReturnType<typeof resultsOf>;
  try {
    r = resultsOf(variant.document, budgetMs);
  } catch (e) {
    r = { ok: false, reason: `the solve stopped with an error: ${e instanceof Error ? e.message : String(e)}` };
  }
  const ms = Date.now() - t0;
  if (!r.ok) return { index, value, ok: false, reason: r.reason, ms };
  return { index, value, ok: true, outputDcV: r.outputDcV, rippleV: r.rippleV, worstMargin: r.worstMargin?.margin ?? null, worstPart: r.worstMargin?.part ?? null, ms };
}

/** The stage count with the highest output DC (smaller n on a tie). */
export function optimumOf(points: readonly PointResult[]): { value: number; outputDcV: number } | null {
  let best: { value: number; outputDcV: number } | null = null;
  for (const p of points) {
    if (!p.ok) continue;
    if (!best || p.outputDcV > best.outputDcV || (p.outputDcV === best.outputDcV && p.value < best.value)) best = { value: p.value, outputDcV: p.outputDcV };
  }
  return best;
}

/** The run's result from its points (in index order). */
export function summarise(spec: AnalysisSpec, points: readonly PointResult[]): AnalysisResult {
  const sorted = [...points].sort((a, b) => a.index - b.index);
  const failed = sorted.filter((p) => !p.ok).length;
  if (spec.kind === 'sweep') return sweepSummary(spec, sorted, failed);
  return spreadSummary(spec, sorted, failed);
}

function sweepSummary(spec: SweepSpec, points: PointResult[], failed: number): SweepResult {
  return { kind: 'sweep', parameter: spec.parameter, points, optimum: spec.parameter === 'stages' ? optimumOf(points) : null, failed };
}

function spreadSummary(_spec: SpreadSpec, points: PointResult[], failed: number): SpreadResult {
  const ok = points.filter((p): p is Extract<PointResult, { ok: true }> => p.ok);
  return {
    kind: 'spread',
    points,
    output: distribution(ok.map((p) => p.outputDcV)),
    ripple: distribution(ok.flatMap((p) => (p.rippleV === null ? [] : [p.rippleV]))),
    failed,
  };
}
