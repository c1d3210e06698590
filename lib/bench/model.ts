/**
 * The model side of a bench comparison: a design revision's document solved with the project's
 * periodic steady-state solve, on the same read-back netlist the editor and `npm run solve` use
 * (`prepareNetlist`). Pure (no DB): the server (lib/data/bench.ts) and the tests call it.
 *
 * Load curve: the document's load block is switched to a current-mode load at each current of
 * {@link modelCurrents} and solved; the output is the output node's mean (V+ − V− for a symmetric
 * pair). Ripple: the document is solved as drawn (its own load) and the output node's one-period
 * waveform is taken. Every solve has a wall-clock budget; the whole comparison shares one
 * ({@link BENCH_SOLVE_BUDGET_MS}) and a solve that fails or runs out gives a reason, not a throw.
 */
import { solveNetlist, type DesignDocument } from '@/lib/circuit';
import { prepareNetlist } from '@/lib/editor/engine/netlist-text';
import { compareLoadCurve, compareRipple, modelCurrents, type Comparison, type CurvePoint } from './compare';
import type { BenchKind } from './mapping';
import type { BenchPoint } from './parse';
import { formatSi } from './units';

/** Wall-clock budget of one whole comparison (all its solves), ms. */
export const BENCH_SOLVE_BUDGET_MS = 30_000;
/** Waveform points of the output for a ripple comparison (the solver's maximum). */
const RIPPLE_WAVEFORM_POINTS = 400;

export type ModelResult<T> = ({ ok: true } & T) | { ok: false; reason: string };

/** `doc` with its one load block drawing `currentA` (current mode). */
export function withLoadCurrent(doc: DesignDocument, currentA: number): ModelResult<{ document: DesignDocument }> {
  const loads = doc.blocks.filter((b) => b.kind === 'load');
  if (loads.length === 0) return { ok: false, reason: 'this revision has no load block to set the measured currents on (add a load to the drawing)' };
  if (loads.length > 1) return { ok: false, reason: `this revision has ${loads.length} load blocks; a load curve needs exactly one` };
  const id = loads[0].id;
  return {
    ok: true,
    document: { ...doc, blocks: doc.blocks.map((b) => (b.id === id && b.kind === 'load' ? { ...b, data: { mode: 'current' as const, currentA } } : b)) },
  };
}

/** The output of one solve: mean (V) and one period of the output waveform. */
export interface SolvedOutput {
  meanV: number;
  periodS: number;
  wave: { t: number[]; v: number[] } | null;
}

/** Solve `doc` and read its output (the pair's difference for a symmetric supply). */
export function solveOutput(doc: DesignDocument, budgetMs: number, waveformPoints = 0): ModelResult<SolvedOutput> {
  if (budgetMs <= 0) return { ok: false, reason: 'the time budget for the model solves ran out' };
  const prepared = prepareNetlist(doc);
  if (!prepared.ok) return { ok: false, reason: `the drawing does not compile: ${prepared.reason}` };
  const outputs = prepared.topology.outputs.map((o) => o.node);
  const solved = solveNetlist(prepared.netlist, { warmup: false, outputNodes: outputs.length ? outputs : undefined, waveformPoints, budgetMs });
  if (!solved.ok) return { ok: false, reason: `the solve did not reach a steady state: ${solved.reason}` };
  const pos = solved.outputs.find((o) => o.polarity === 'positive');
  const neg = solved.outputs.find((o) => o.polarity === 'negative');
  const p = pos ? solved.nodes[pos.node] : undefined;
  const n = neg ? solved.nodes[neg.node] : undefined;
  if (p && n) {
    const a = p.waveform;
    const b = n.waveform;
    const wave = a && b && a.t.length === b.t.length ? { t: a.t, v: a.v.map((v, i) => v - b.v[i]) } : null;
    return { ok: true, meanV: p.mean - n.mean, periodS: solved.periodS, wave };
  }
  const single = p ?? n;
  if (!single) return { ok: false, reason: 'the solve found no output node' };
  return { ok: true, meanV: single.mean, periodS: solved.periodS, wave: single.waveform ?? null };
}

/** The model's output (V) at each load current (A), solved one by one within one budget. */
export function modelLoadCurve(doc: DesignDocument, currents: readonly number[], budgetMs = BENCH_SOLVE_BUDGET_MS): ModelResult<{ curve: CurvePoint[] }> {
  const deadline = Date.now() + budgetMs;
  const curve: CurvePoint[] = [];
  for (const currentA of currents) {
    const loaded = withLoadCurrent(doc, currentA);
    if (!loaded.ok) return loaded;
    const out = solveOutput(loaded.document, deadline - Date.now());
    if (!out.ok) return { ok: false, reason: `at ${formatSi(currentA, 'A')}: ${out.reason}` };
    curve.push({ x: currentA, y: out.meanV });
  }
  return { ok: true, curve };
}

/** Solve the model for `points` of `kind` and compare (see lib/bench/compare.ts). */
export function compareWithModel(doc: DesignDocument, kind: BenchKind, points: readonly BenchPoint[], budgetMs = BENCH_SOLVE_BUDGET_MS): ModelResult<{ comparison: Comparison }> {
  if (points.length < 2) return { ok: false, reason: 'the dataset has fewer than 2 points' };
  if (kind === 'loadCurve') {
    const { currents, exact } = modelCurrents(points);
    const model = modelLoadCurve(doc, currents, budgetMs);
    if (!model.ok) return model;
    return { ok: true, comparison: compareLoadCurve(points, model.curve, exact) };
  }
  const out = solveOutput(doc, budgetMs, RIPPLE_WAVEFORM_POINTS);
  if (!out.ok) return out;
  if (!out.wave || out.wave.t.length < 2) return { ok: false, reason: 'the solve gave no output waveform to compare with' };
  return { ok: true, comparison: compareRipple(points, out.wave, out.periodS) };
}
