/**
 * What the results panel and the hover cards show, as pure functions of the engine snapshot:
 * the status line, sorted node rows, the flattened part-stress rows with their flags, the
 * estimate-vs-solve rows with the difference, and the plot series (one period, warm-up). The
 * React components only lay these out, so everything here is unit-tested without a DOM.
 */
import { GROUND, type EstimateResult } from '@/lib/circuit';
import type { EngineSnapshot, NodeReading, PartStress, SolveView, StressCheck } from '@/lib/editor/types';
import { formatReading } from '@/lib/editor/format';

// ---------------------------------------------------------------- status

export type StatusTone = 'busy' | 'current' | 'stale' | 'failed' | 'idle';

/** The one-line answer to "which result am I looking at?". */
export interface StatusLine {
  tone: StatusTone;
  text: string;
  /** Whether the shown solve belongs to an older edit than the canvas. */
  solveStale: boolean;
  /** Whether the shown compile/estimate belongs to an older edit than the canvas. */
  estimateStale: boolean;
}

/**
 * The status line from the snapshot's status and version numbers: solving / solved / out of
 * date (a result of an older edit is shown) / cannot solve: reason.
 */
export function statusLine(s: EngineSnapshot): StatusLine {
  const solveStale = s.solve !== null && s.solvedVersion !== s.currentVersion;
  const estimateStale = s.compile !== null && s.compiledVersion !== s.currentVersion;
  const base = { solveStale, estimateStale };
  switch (s.status) {
    case 'idle':
      return { ...base, tone: 'idle', text: 'Waiting for the first compile' };
    case 'compiling':
      return { ...base, tone: 'busy', text: s.solve || s.compile ? 'Compiling the latest edit — results below are out of date' : 'Compiling…' };
    case 'solving':
      return {
        ...base,
        tone: 'busy',
        text: solveStale && s.solve ? 'Estimate current · solving the steady state (solve below is out of date)' : 'Estimate current · solving the steady state…',
      };
    case 'cannot-solve':
      return { ...base, tone: 'failed', text: `Cannot solve: ${s.reason ?? 'no reason given'}` };
    case 'solved': {
      if (solveStale) return { ...base, tone: 'stale', text: `Out of date: showing the solve of edit ${s.solvedVersion ?? '—'}, the canvas is at edit ${s.currentVersion}` };
      const ms = s.solve?.stats.solveMs;
      return { ...base, tone: 'current', text: `Solved${ms !== undefined ? ` in ${Math.round(ms)} ms` : ''}${s.warmupPending ? ' · warm-up running' : ''}` };
    }
  }
}

// ---------------------------------------------------------------- nodes

export type NodeSortKey = 'label' | 'meanV' | 'rippleV' | 'minV' | 'maxV';
export type SortDirection = 'asc' | 'desc';

/** One row of the node table. */
export interface NodeRow {
  node: string;
  label: string;
  meanV: number | null;
  rippleV: number | null;
  minV: number | null;
  maxV: number | null;
}

/**
 * The node table's rows: from the solve when there is one, otherwise the compiled node labels
 * with no values yet (solve pending or cannot solve). Ground is left out: it reads 0 V by
 * definition.
 */
export function nodeRows(solve: SolveView | null, nodeLabels: Record<string, string> | null): NodeRow[] {
  if (solve) {
    return Object.values(solve.nodes)
      .filter((r) => r.node !== GROUND)
      .map((r) => ({ node: r.node, label: r.label, meanV: r.meanV, rippleV: r.rippleV, minV: r.minV, maxV: r.maxV }));
  }
  return Object.entries(nodeLabels ?? {})
    .filter(([node]) => node !== GROUND)
    .map(([node, label]) => ({ node, label, meanV: null, rippleV: null, minV: null, maxV: null }));
}

const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

/**
 * Rows sorted by one column. Labels compare naturally ("Stage 2" before "Stage 10"); numbers
 * compare by value with missing values always last; ties keep the label order so the table
 * never jumps between equal rows.
 */
export function sortNodeRows(rows: readonly NodeRow[], key: NodeSortKey, dir: SortDirection): NodeRow[] {
  const sign = dir === 'asc' ? 1 : -1;
  return [...rows].sort((a, b) => {
    if (key !== 'label') {
      const x = a[key];
      const y = b[key];
      if (x === null || y === null) {
        if (x !== y) return x === null ? 1 : -1;
      } else if (x !== y) {
        return sign * (x - y);
      }
    }
    const byLabel = collator.compare(a.label, b.label) || collator.compare(a.node, b.node);
    return key === 'label' ? sign * byLabel : byLabel;
  });
}

/** Next sort state after a click on column `key`: same column flips, a new column starts ascending (labels) or descending (values). */
export function nextSort(current: { key: NodeSortKey; dir: SortDirection }, key: NodeSortKey): { key: NodeSortKey; dir: SortDirection } {
  if (current.key === key) return { key, dir: current.dir === 'asc' ? 'desc' : 'asc' };
  return { key, dir: key === 'label' ? 'asc' : 'desc' };
}

/**
 * Selection after a click on a node row: a plain click selects only that node (or clears it
 * when it was the only one); with the additive modifier (Ctrl/⌘/Shift) the node is toggled in
 * the set, so several nodes can be overlaid in the plot.
 */
export function toggleNodeSelection(selected: readonly string[], node: string, additive: boolean): string[] {
  if (additive) return selected.includes(node) ? selected.filter((n) => n !== node) : [...selected, node];
  return selected.length === 1 && selected[0] === node ? [] : [node];
}

// ---------------------------------------------------------------- part stress

export type CheckStatus = 'ok' | 'tight' | 'over' | 'unrated';

/** Margin under which a check is flagged `tight` (the types' contract: margin < 0.1). */
export const TIGHT_MARGIN = 0.1;

/** Flag of one check: over the derated limit, within 10 % of it, fine, or no rating to check. */
export function checkStatus(check: StressCheck): CheckStatus {
  if (check.margin === undefined || check.allowed === undefined) return 'unrated';
  if (check.margin < 0) return 'over';
  if (check.margin < TIGHT_MARGIN) return 'tight';
  return 'ok';
}

const QUANTITY_LABEL: Record<StressCheck['quantity'], string> = {
  voltage: 'Voltage',
  piv: 'Peak inverse voltage',
  averageCurrent: 'Average current',
  peakCurrent: 'Peak current',
  power: 'Dissipation',
};

/** Words for a stress quantity. */
export function quantityLabel(q: StressCheck['quantity']): string {
  return QUANTITY_LABEL[q];
}

/** One row of the stress table: one check of one part. */
export interface StressRow {
  key: string;
  blockId: string;
  partLabel: string;
  element: string;
  /** First row of its part (the table prints the part name once). */
  firstOfPart: boolean;
  quantity: string;
  unit: StressCheck['unit'];
  actual: number;
  rating: number | null;
  allowed: number | null;
  margin: number | null;
  status: CheckStatus;
}

const STATUS_ORDER: Record<PartStress['status'], number> = { over: 0, tight: 1, ok: 2, unrated: 3 };

/**
 * The stress table's rows, one per check. With `worstFirst` parts are ordered over → tight →
 * ok → unrated and by smallest margin, so what needs attention is on top; otherwise they keep
 * the engine's (drawing) order.
 */
export function stressRows(parts: readonly PartStress[], worstFirst: boolean): StressRow[] {
  const ordered = worstFirst
    ? [...parts].sort((a, b) => STATUS_ORDER[a.status] - STATUS_ORDER[b.status] || (a.worstMargin ?? Infinity) - (b.worstMargin ?? Infinity))
    : parts;
  return ordered.flatMap((p) =>
    p.checks.map((c, i) => ({
      key: `${p.blockId}:${p.role}:${c.quantity}`,
      blockId: p.blockId,
      partLabel: p.label,
      element: p.element,
      firstOfPart: i === 0,
      quantity: quantityLabel(c.quantity),
      unit: c.unit,
      actual: c.actual,
      rating: c.rating ?? null,
      allowed: c.allowed ?? null,
      margin: c.margin ?? null,
      status: checkStatus(c),
    })),
  );
}

/** How many parts are over their derated limit and how many are tight. */
export function stressCounts(parts: readonly PartStress[]): { over: number; tight: number; unrated: number; total: number } {
  return {
    over: parts.filter((p) => p.status === 'over').length,
    tight: parts.filter((p) => p.status === 'tight').length,
    unrated: parts.filter((p) => p.status === 'unrated').length,
    total: parts.length,
  };
}

// ---------------------------------------------------------------- estimate vs solve

/** One row of the estimate-vs-solve table. */
export interface CompareRow {
  key: 'outputV' | 'dropV' | 'rippleV' | 'rippleFraction' | 'pivV' | 'storedEnergyJ' | 't90S';
  label: string;
  /** Unit for display; `'%'` rows hold fractions. */
  unit: 'V' | 'J' | 's' | '%';
  estimate: number | null;
  solve: number | null;
  /** (estimate − solve) / |solve|: how far the closed form is from the full solve. */
  difference: number | null;
  /** Why the solve column is empty, when it is. */
  solveNote?: string;
}

/** The output figures of a solve: single ladders by magnitude, a symmetric pair across both outputs (V+ − V−). */
export function solvedOutput(solve: SolveView): { outputV: number; rippleV: number | null } | null {
  const pos = solve.outputs.find((o) => o.polarity === 'positive');
  const neg = solve.outputs.find((o) => o.polarity === 'negative');
  const p = pos ? solve.nodes[pos.node] : undefined;
  const n = neg ? solve.nodes[neg.node] : undefined;
  if (p && n) return { outputV: p.meanV - n.meanV, rippleV: differenceRipple(p, n) };
  const single = p ?? n;
  if (!single) return null;
  return { outputV: Math.abs(single.meanV), rippleV: single.rippleV };
}

/** Peak-to-peak of V+ − V− when both waveforms share one time grid; null otherwise. */
function differenceRipple(p: NodeReading, n: NodeReading): number | null {
  const a = p.waveform;
  const b = n.waveform;
  if (!a || !b || a.t.length !== b.t.length || a.t.length === 0) return null;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < a.v.length; i++) {
    if (Math.abs(a.t[i] - b.t[i]) > 1e-12 * Math.max(1, Math.abs(a.t[i]))) return null;
    const d = a.v[i] - b.v[i];
    lo = Math.min(lo, d);
    hi = Math.max(hi, d);
  }
  return hi - lo;
}

function relDiff(estimate: number | null, solve: number | null): number | null {
  if (estimate === null || solve === null || !Number.isFinite(estimate) || !Number.isFinite(solve) || solve === 0) return null;
  return (estimate - solve) / Math.abs(solve);
}

/** Largest peak inverse voltage any diode sees in the solve (V), or null without diode checks. */
export function solvedMaxPivV(parts: readonly PartStress[]): number | null {
  let max: number | null = null;
  for (const p of parts) for (const c of p.checks) if (c.quantity === 'piv') max = Math.max(max ?? 0, c.actual);
  return max;
}

/**
 * The estimate-vs-solve rows: output DC, drop below the ideal no-load output, ripple p-p, ripple
 * fraction, diode PIV, stored energy and the time to 90 % of the output. The estimate column
 * reads the closed-form {@link EstimateResult}; the solve column the steady state and the warm-up
 * run. Either side may be missing (custom topology: no estimate; solve pending or failed).
 */
export function compareRows(estimate: EstimateResult | null, solve: SolveView | null, warmupPending = false): CompareRow[] {
  const out = solve ? solvedOutput(solve) : null;
  const e = estimate;
  const dropSolve = e && out ? e.idealNoLoadV - out.outputV : null;
  const rippleSolve = out?.rippleV ?? null;
  const rows: Array<Omit<CompareRow, 'difference'>> = [
    { key: 'outputV', label: 'Output DC', unit: 'V', estimate: e?.outputMeanV ?? null, solve: out?.outputV ?? null },
    {
      key: 'dropV',
      label: 'Drop below ideal no-load',
      unit: 'V',
      estimate: e ? e.idealNoLoadV - e.outputMeanV : null,
      solve: dropSolve,
      ...(solve && !e ? { solveNote: 'needs the estimate’s ideal no-load output' } : {}),
    },
    {
      key: 'rippleV',
      label: 'Ripple p-p',
      unit: 'V',
      estimate: e?.rippleV ?? null,
      solve: rippleSolve,
      ...(solve && out && rippleSolve === null ? { solveNote: 'output waveforms not on one time grid' } : {}),
    },
    {
      key: 'rippleFraction',
      label: 'Ripple / output',
      unit: '%',
      estimate: e && Number.isFinite(e.rippleFraction) ? e.rippleFraction : null,
      solve: out && rippleSolve !== null && out.outputV !== 0 ? rippleSolve / Math.abs(out.outputV) : null,
    },
    { key: 'pivV', label: 'Diode PIV (largest)', unit: 'V', estimate: e?.diodePivV ?? null, solve: solve ? solvedMaxPivV(solve.parts) : null },
    { key: 'storedEnergyJ', label: 'Stored energy', unit: 'J', estimate: e?.storedEnergyJ ?? null, solve: solve?.safety.totalEnergyJ ?? null },
    {
      key: 't90S',
      label: 'Warm-up to 90 %',
      unit: 's',
      estimate: e?.warmupTime90S ?? null,
      solve: solve?.warmup?.t90S ?? null,
      ...(solve && !solve.warmup ? { solveNote: warmupPending ? 'warm-up running' : 'no warm-up run' } : {}),
    },
  ];
  return rows.map((r) => ({ ...r, difference: relDiff(r.estimate, r.solve) }));
}

// ---------------------------------------------------------------- plots

/**
 * Thin a waveform to at most `maxPoints` by keeping, in each of `maxPoints / 2` equal buckets,
 * the lowest and the highest sample in time order (min–max decimation), so ripple peaks survive
 * while the plot stays light. Short waveforms are returned as they are.
 */
export function decimateMinMax(t: readonly number[], v: readonly number[], maxPoints = 600): { t: number[]; v: number[] } {
  const n = Math.min(t.length, v.length);
  if (n <= maxPoints) return { t: t.slice(0, n), v: v.slice(0, n) };
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const outT: number[] = [];
  const outV: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    if (end <= start) continue;
    let lo = start;
    let hi = start;
    for (let i = start + 1; i < end; i++) {
      if (v[i] < v[lo]) lo = i;
      if (v[i] > v[hi]) hi = i;
    }
    for (const i of lo === hi ? [lo] : lo < hi ? [lo, hi] : [hi, lo]) {
      outT.push(t[i]);
      outV.push(v[i]);
    }
  }
  return { t: outT, v: outV };
}

/** One plotted node: points in display units and its mean. */
export interface PlotSeries {
  node: string;
  label: string;
  points: Array<{ x: number; y: number }>;
  mean: number;
}

/**
 * The one-period plot of the selected nodes, scaled to the display units (`timeFactor`,
 * `voltFactor`); nodes without a waveform are left out. With `centred` each node's mean is
 * subtracted, so the ripple of nodes at very different levels (the two outputs of a symmetric
 * pair, ±30 kV) can be compared on one axis; the means then all sit at 0.
 */
export function waveformSeries(readings: readonly NodeReading[], timeFactor: number, voltFactor: number, maxPoints = 600, centred = false): PlotSeries[] {
  return readings
    .filter((r) => r.waveform && r.waveform.t.length > 1)
    .map((r) => {
      const d = decimateMinMax(r.waveform!.t, r.waveform!.v, maxPoints);
      const offset = centred ? r.meanV : 0;
      return {
        node: r.node,
        label: r.label,
        mean: (r.meanV - offset) * voltFactor,
        points: d.t.map((t, i) => ({ x: t * timeFactor, y: (d.v[i] - offset) * voltFactor })),
      };
    });
}

/** Largest excursion of the readings from their means (V), to choose the volt scale of a centred plot. */
export function maxAbsRipple(readings: readonly NodeReading[]): number {
  let m = 0;
  for (const r of readings) m = Math.max(m, Math.abs(r.maxV - r.meanV), Math.abs(r.meanV - r.minV));
  return m;
}

/** Largest |v| over the readings' waveforms and levels (V), to choose the volt scale. */
export function maxAbsVolts(readings: readonly NodeReading[]): number {
  let m = 0;
  for (const r of readings) m = Math.max(m, Math.abs(r.minV), Math.abs(r.maxV), Math.abs(r.meanV));
  return m;
}

/** The warm-up plot: cycles against the output mean, with the 90 % level of the final value. */
export interface WarmupPlot {
  points: Array<{ cycles: number; v: number }>;
  /** 90 % of the last value of the curve, in display units. */
  level90: number;
  final: number;
  cycles90: number | null;
  t90S: number | null;
}

/** The warm-up curve of a solve in display units (`voltFactor`); null when there is none yet. */
export function warmupPlot(warmup: SolveView['warmup'], voltFactor: number, maxPoints = 400): WarmupPlot | null {
  if (!warmup || warmup.curve.cycles.length < 2) return null;
  const { cycles, meanV } = warmup.curve;
  const d = decimateMinMax(cycles, meanV, maxPoints);
  const final = meanV[meanV.length - 1] * voltFactor;
  return {
    points: d.t.map((c, i) => ({ cycles: c, v: d.v[i] * voltFactor })),
    level90: 0.9 * final,
    final,
    cycles90: warmup.cycles90,
    t90S: warmup.t90S,
  };
}

/** A reading's four figures as text, e.g. `{ mean: '12.41 kV', ... }` (the hover card's lines). */
export function readingText(r: Pick<NodeReading, 'meanV' | 'rippleV' | 'minV' | 'maxV'>): { mean: string; ripple: string; min: string; max: string } {
  return { mean: formatReading(r.meanV, 'V'), ripple: formatReading(r.rippleV, 'V'), min: formatReading(r.minV, 'V'), max: formatReading(r.maxV, 'V') };
}

/** Axis ticks: the padded domain, the tick values and the decimals that tell neighbouring ticks apart. */
export interface AxisTicks {
  domain: [number, number];
  ticks: number[];
  decimals: number;
}

function niceStep(rough: number): number {
  const exp = Math.floor(Math.log10(rough));
  const base = 10 ** exp;
  const f = rough / base;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 2.5 ? 2.5 : f <= 5 ? 5 : 10) * base;
}

/**
 * "Nice numbers" axis ticks (Heckbert, "Nice numbers for graph labels", Graphics Gems, 1990,
 * from memory): a step of 1, 2, 2.5 or 5 × 10^k giving about `count` intervals over [lo, hi],
 * the domain widened to whole steps, and enough decimals that a ripple of a few volts on a
 * 60 kV level (59.962, 59.964 … kV) does not print as one repeated label. A flat signal gets a
 * small band around its value.
 */
export function niceTicks(lo: number, hi: number, count = 5): AxisTicks {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return { domain: [0, 1], ticks: [0, 1], decimals: 0 };
  if (hi < lo) [lo, hi] = [hi, lo];
  if (hi - lo <= Math.abs(hi) * 1e-12 || hi === lo) {
    const pad = Math.abs(hi) > 0 ? Math.abs(hi) * 1e-3 : 1;
    lo -= pad;
    hi += pad;
  }
  const step = niceStep((hi - lo) / Math.max(1, count));
  const start = Math.floor(lo / step) * step;
  const end = Math.ceil(hi / step) * step;
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9) + (step / 10 ** Math.floor(Math.log10(step) + 1e-9) === 2.5 ? 1 : 0));
  const ticks: number[] = [];
  for (let i = 0; start + i * step <= end + step * 1e-9; i++) ticks.push(Number((start + i * step).toFixed(Math.min(20, decimals))));
  return { domain: [ticks[0], ticks[ticks.length - 1]], ticks, decimals };
}

/** Lowest and highest y over the plotted series and their means. */
export function seriesRange(series: readonly PlotSeries[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) {
    lo = Math.min(lo, s.mean);
    hi = Math.max(hi, s.mean);
    for (const p of s.points) {
      if (p.y < lo) lo = p.y;
      if (p.y > hi) hi = p.y;
    }
  }
  return [lo, hi];
}
