/**
 * What a change did to the results: each document is solved with the project's own periodic
 * steady-state solve, on the same netlist the editor and `npm run solve` solve (the exported text
 * read back, `prepareNetlist`), with the editor's part-stress rules (`partStress`: derated
 * ratings, margin = (allowed − actual) / allowed). From each solve five figures are taken —
 * output DC, output ripple peak-to-peak, sag below the ideal no-load output 2nVp (the
 * closed-form estimate's `idealNoLoadV`), the worst stress margin and which part has it, and the
 * energy stored in all capacitors — and {@link diffResults} sets them side by side with the
 * difference b − a and its relative size. A side that does not compile or solve carries its
 * reason instead of numbers. Pure: runs in node (server, tests) or a worker.
 */
import { estimateFromNetlist, solveNetlist, type DesignDocument, type SolveResult } from '@/lib/circuit';
import { prepareNetlist } from '@/lib/editor/engine/netlist-text';
import { partStress } from '@/lib/editor/engine/view-model';

/** Wall-clock budget of one side's solve (ms); the solve returns a reason when it runs out. */
export const COMPARE_SOLVE_BUDGET_MS = 15_000;

/** Waveform points per node: enough to take the ripple of V+ − V− for a symmetric pair. */
const WAVEFORM_POINTS = 200;

/** The part with the smallest margin against its derated rating. */
export interface WorstMargin {
  /** (allowed − actual) / allowed; negative = past the derated limit. */
  margin: number;
  blockId: string;
  /** e.g. "Stage 2 · pumping C". */
  part: string;
  /** The check that sets it: `voltage`, `piv`, `averageCurrent`, `peakCurrent` or `power`. */
  quantity: string;
}

/** The figures of one solved design, SI units. */
export type DesignResults =
  | {
      ok: true;
      /** Output DC: |mean| of the one output, or V+ − V− of a symmetric pair (V). */
      outputDcV: number;
      /** Output ripple peak-to-peak (V); null when a pair's waveforms are not on one grid. */
      rippleV: number | null;
      /** Ideal no-load output 2nVp (4nVp for a pair) from the closed-form estimate; null for a custom topology. */
      idealNoLoadV: number | null;
      /** Sag: idealNoLoadV − outputDcV (V); null without the ideal no-load output. */
      sagV: number | null;
      /** Worst stress margin; null when no part has a rating. */
      worstMargin: WorstMargin | null;
      /** Energy in all capacitors at their mean voltages (J). */
      storedEnergyJ: number;
      /** Drive frequency the solve used (Hz). */
      frequencyHz: number;
    }
  | { ok: false; reason: string };

type Solved = SolveResult & { ok: true };

function outputOf(solve: Solved): { outputV: number; rippleV: number | null } | null {
  const pos = solve.outputs.find((o) => o.polarity === 'positive');
  const neg = solve.outputs.find((o) => o.polarity === 'negative');
  const p = pos ? solve.nodes[pos.node] : undefined;
  const n = neg ? solve.nodes[neg.node] : undefined;
  if (p && n) {
    const a = p.waveform;
    const b = n.waveform;
    let ripple: number | null = null;
    if (a && b && a.t.length === b.t.length && a.t.length > 0 && a.t.every((t, i) => Math.abs(t - b.t[i]) <= 1e-12 * Math.max(1, Math.abs(t)))) {
      const d = a.v.map((v, i) => v - b.v[i]);
      ripple = Math.max(...d) - Math.min(...d);
    }
    return { outputV: p.mean - n.mean, rippleV: ripple };
  }
  const single = p ?? n;
  if (!single) return null;
  return { outputV: Math.abs(single.mean), rippleV: single.ripple };
}

/** Solve one design document and take its five figures (see the file comment). */
export function resultsOf(doc: DesignDocument, budgetMs = COMPARE_SOLVE_BUDGET_MS): DesignResults {
  const prepared = prepareNetlist(doc);
  if (!prepared.ok) return { ok: false, reason: `the drawing does not compile: ${prepared.reason}` };
  const outputs = prepared.topology.outputs.map((o) => o.node);
  const solved = solveNetlist(prepared.netlist, {
    warmup: false,
    outputNodes: outputs.length > 0 ? outputs : undefined,
    waveformPoints: WAVEFORM_POINTS,
    budgetMs,
  });
  if (!solved.ok) return { ok: false, reason: `the solve did not reach a steady state: ${solved.reason}` };
  return summariseSolve(doc, prepared.compiled, solved);
}

/**
 * The five figures of an existing solve of `doc` (its compile `compiled` and steady state
 * `solved`), for callers that already solved it.
 */
export function summariseSolve(doc: DesignDocument, compiled: Parameters<typeof partStress>[1], solved: Solved): DesignResults {
  const out = outputOf(solved);
  if (!out) return { ok: false, reason: 'the solve found no output node' };
  const estimate = estimateFromNetlist(compiled.netlist, compiled.topology);
  const idealNoLoadV = estimate ? estimate.idealNoLoadV : null;
  let worst: WorstMargin | null = null;
  for (const p of partStress(doc, compiled, solved)) {
    for (const c of p.checks) {
      if (c.margin === undefined) continue;
      if (!worst || c.margin < worst.margin) worst = { margin: c.margin, blockId: p.blockId, part: p.label, quantity: c.quantity };
    }
  }
  return {
    ok: true,
    outputDcV: out.outputV,
    rippleV: out.rippleV,
    idealNoLoadV,
    sagV: idealNoLoadV === null ? null : idealNoLoadV - out.outputV,
    worstMargin: worst,
    storedEnergyJ: solved.safety.totalEnergyJ,
    frequencyHz: solved.frequencyHz,
  };
}

/** The figures the results table compares. */
export type MetricKey = 'outputDc' | 'ripple' | 'sag' | 'margin' | 'energy';

/** One row of the results table. Numbers are SI (V, J) or a fraction (margin). */
export interface MetricRow {
  metric: MetricKey;
  label: string;
  /** `V`, `J`, or `%` for the margin (a fraction, shown as per cent). */
  unit: 'V' | 'J' | '%';
  a: number | null;
  b: number | null;
  /** b − a; null when either side is missing. */
  delta: number | null;
  /** (b − a) / |a|; null when either side is missing or a is 0 (and for the margin, whose delta is already a fraction). */
  relDelta: number | null;
  /** Why a side has no number (its solve failed, or the figure does not apply). */
  aNote?: string;
  bNote?: string;
  /** Which part holds the worst margin on each side (margin row only). */
  aPart?: string;
  bPart?: string;
}

interface Figure {
  value: number | null;
  note?: string;
  part?: string;
}

function figure(r: DesignResults, metric: MetricKey): Figure {
  if (!r.ok) return { value: null, note: r.reason };
  switch (metric) {
    case 'outputDc':
      return { value: r.outputDcV };
    case 'ripple':
      return r.rippleV === null ? { value: null, note: 'the two outputs’ waveforms are not on one time grid' } : { value: r.rippleV };
    case 'sag':
      return r.sagV === null ? { value: null, note: 'no ideal no-load output for a custom topology' } : { value: r.sagV };
    case 'margin':
      return r.worstMargin === null ? { value: null, note: 'no part has a rating' } : { value: r.worstMargin.margin, part: r.worstMargin.part };
    case 'energy':
      return { value: r.storedEnergyJ };
  }
}

const ROWS: Array<{ metric: MetricKey; label: string; unit: MetricRow['unit'] }> = [
  { metric: 'outputDc', label: 'Output DC', unit: 'V' },
  { metric: 'ripple', label: 'Ripple p-p', unit: 'V' },
  { metric: 'sag', label: 'Sag below ideal no-load (2nVp)', unit: 'V' },
  { metric: 'margin', label: 'Worst stress margin', unit: '%' },
  { metric: 'energy', label: 'Stored energy', unit: 'J' },
];

/** The results of `a` and `b` side by side: one {@link MetricRow} per figure, in a fixed order. */
export function diffResults(ra: DesignResults, rb: DesignResults): MetricRow[] {
  return ROWS.map(({ metric, label, unit }) => {
    const fa = figure(ra, metric);
    const fb = figure(rb, metric);
    const both = fa.value !== null && fb.value !== null;
    const delta = both ? (fb.value as number) - (fa.value as number) : null;
    const relDelta = both && metric !== 'margin' && fa.value !== 0 ? (delta as number) / Math.abs(fa.value as number) : null;
    return {
      metric,
      label,
      unit,
      a: fa.value,
      b: fb.value,
      delta,
      relDelta,
      ...(fa.note ? { aNote: fa.note } : {}),
      ...(fb.note ? { bNote: fb.note } : {}),
      ...(fa.part ? { aPart: fa.part } : {}),
      ...(fb.part ? { bPart: fb.part } : {}),
    };
  });
}
