/**
 * The results panel's logic on real engine output (a 3-stage half-wave and a 2-stage symmetric
 * starter run through the worker's request handler) and on hand-made cases for the edges.
 */
import { describe, expect, it } from 'vitest';
import { halfWaveStarter, symmetricStarter } from '@/lib/circuit';
import {
  TIGHT_MARGIN,
  checkStatus,
  compareRows,
  decimateMinMax,
  maxAbsRipple,
  nextSort,
  niceTicks,
  nodeRows,
  solvedMaxPivV,
  solvedOutput,
  sortNodeRows,
  statusLine,
  stressCounts,
  stressRows,
  toggleNodeSelection,
  waveformSeries,
  warmupPlot,
  type NodeRow,
} from '@/components/editor/panel/panel-model';
import type { EngineSnapshot, PartStress } from '@/lib/editor/types';
import { engineSnapshot } from './panel-fixture';

const VP = 10e3;
const N = 3;
const half = engineSnapshot(
  halfWaveStarter(N, { amplitudeV: VP, frequencyHz: 40e3, capacitanceF: 10e-9, capacitorRatedV: 25e3, loadCurrentA: 0.5e-3, bleederOhm: 2e9 }),
  { warmup: true },
);
const sym = engineSnapshot(symmetricStarter(2, { amplitudeV: 5e3, frequencyHz: 20e3, capacitanceF: 10e-9, loadResistanceOhm: 100e6 }));

function row(node: string, label: string, meanV: number | null): NodeRow {
  return { node, label, meanV, rippleV: meanV === null ? null : 1, minV: meanV, maxV: meanV };
}

describe('statusLine', () => {
  it('says solved when the solve belongs to the current edit', () => {
    const s = statusLine(half);
    expect(half.status).toBe('solved');
    expect(s.tone).toBe('current');
    expect(s.text).toMatch(/^Solved in \d+ ms$/);
    expect(s.solveStale).toBe(false);
  });
  it('says out of date when the canvas moved on', () => {
    const s = statusLine({ ...half, currentVersion: 3 });
    expect(s.tone).toBe('stale');
    expect(s.solveStale).toBe(true);
    expect(s.estimateStale).toBe(true);
    expect(s.text).toContain('edit 1');
    expect(s.text).toContain('edit 3');
  });
  it('says solving while only compile and estimate are current', () => {
    const pending: EngineSnapshot = { ...half, status: 'solving', solve: null, solvedVersion: null };
    expect(statusLine(pending)).toMatchObject({ tone: 'busy', solveStale: false });
    expect(statusLine(pending).text).toContain('solving');
    const withOld: EngineSnapshot = { ...half, status: 'solving', currentVersion: 2, compiledVersion: 2 };
    expect(statusLine(withOld).text).toContain('out of date');
    expect(statusLine(withOld).estimateStale).toBe(false);
  });
  it('says cannot solve with the reason', () => {
    const failed: EngineSnapshot = { ...half, status: 'cannot-solve', reason: 'the drawing does not compile: no ground', solve: null };
    expect(statusLine(failed)).toMatchObject({ tone: 'failed', text: 'Cannot solve: the drawing does not compile: no ground' });
    expect(statusLine({ ...half, status: 'compiling', currentVersion: 2 }).tone).toBe('busy');
    expect(statusLine({ ...half, status: 'idle', compile: null, solve: null }).tone).toBe('idle');
  });
});

describe('node rows', () => {
  it('lists every solved node but ground, with the solve’s numbers', () => {
    const rows = nodeRows(half.solve, half.compile!.nodeLabels);
    expect(rows.length).toBe(Object.keys(half.solve!.nodes).filter((n) => n !== '0').length);
    expect(rows.some((r) => r.node === '0')).toBe(false);
    const out = half.solve!.outputs[0].node;
    const r = rows.find((x) => x.node === out)!;
    expect(r.meanV).toBe(half.solve!.nodes[out].meanV);
  });
  it('lists the compiled labels without numbers while the solve is pending', () => {
    const rows = nodeRows(null, half.compile!.nodeLabels);
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r) => r.meanV === null && r.maxV === null)).toBe(true);
    expect(nodeRows(null, null)).toEqual([]);
  });
  it('sorts labels naturally and numbers by value, missing values last', () => {
    const rows = [row('a', 'Stage 10', 5), row('b', 'Stage 2', -3), row('c', 'Stage 1', null), row('d', 'Output', 12)];
    expect(sortNodeRows(rows, 'label', 'asc').map((r) => r.label)).toEqual(['Output', 'Stage 1', 'Stage 2', 'Stage 10']);
    expect(sortNodeRows(rows, 'label', 'desc').map((r) => r.label)).toEqual(['Stage 10', 'Stage 2', 'Stage 1', 'Output']);
    expect(sortNodeRows(rows, 'meanV', 'asc').map((r) => r.node)).toEqual(['b', 'a', 'd', 'c']);
    expect(sortNodeRows(rows, 'meanV', 'desc').map((r) => r.node)).toEqual(['d', 'a', 'b', 'c']);
    expect(rows.map((r) => r.node)).toEqual(['a', 'b', 'c', 'd']);
  });
  it('sorts the real ladder so the output is the highest DC node', () => {
    const rows = sortNodeRows(nodeRows(half.solve, null), 'meanV', 'desc');
    expect(rows[0].node).toBe(half.solve!.outputs[0].node);
    const ripple = sortNodeRows(nodeRows(half.solve, null), 'rippleV', 'asc');
    for (let i = 1; i < ripple.length; i++) expect(ripple[i].rippleV!).toBeGreaterThanOrEqual(ripple[i - 1].rippleV!);
  });
  it('flips the direction on the same column and starts values descending', () => {
    expect(nextSort({ key: 'label', dir: 'asc' }, 'label')).toEqual({ key: 'label', dir: 'desc' });
    expect(nextSort({ key: 'label', dir: 'asc' }, 'meanV')).toEqual({ key: 'meanV', dir: 'desc' });
    expect(nextSort({ key: 'meanV', dir: 'desc' }, 'label')).toEqual({ key: 'label', dir: 'asc' });
  });
  it('selects one node on a click and adds or removes with the modifier', () => {
    expect(toggleNodeSelection([], 'a', false)).toEqual(['a']);
    expect(toggleNodeSelection(['a', 'b'], 'c', false)).toEqual(['c']);
    expect(toggleNodeSelection(['a'], 'a', false)).toEqual([]);
    expect(toggleNodeSelection(['a'], 'b', true)).toEqual(['a', 'b']);
    expect(toggleNodeSelection(['a', 'b'], 'a', true)).toEqual(['b']);
  });
});

describe('part stress flags', () => {
  const check = (margin?: number) => ({ quantity: 'voltage' as const, actual: 1, unit: 'V' as const, ...(margin !== undefined ? { rating: 2, allowed: 1.6, margin } : {}) });
  it('flags over past the derated limit and tight within 10 % of it', () => {
    expect(checkStatus(check(-0.01))).toBe('over');
    expect(checkStatus(check(0))).toBe('tight');
    expect(checkStatus(check(TIGHT_MARGIN - 1e-9))).toBe('tight');
    expect(checkStatus(check(TIGHT_MARGIN))).toBe('ok');
    expect(checkStatus(check(0.5))).toBe('ok');
    expect(checkStatus(check())).toBe('unrated');
  });
  it('agrees with the engine bridge on every real part', () => {
    for (const p of half.solve!.parts) {
      const worst = p.checks.map(checkStatus).sort((a, b) => ['over', 'tight', 'ok', 'unrated'].indexOf(a) - ['over', 'tight', 'ok', 'unrated'].indexOf(b))[0] ?? 'unrated';
      expect(worst, p.label).toBe(p.status);
    }
  });
  it('puts the worst parts first and keeps the drawing order otherwise', () => {
    const parts = half.solve!.parts;
    const rows = stressRows(parts, true);
    expect(rows.length).toBe(parts.reduce((s, p) => s + p.checks.length, 0));
    const order = ['over', 'tight', 'ok', 'unrated'];
    const partStatus = new Map(parts.map((p) => [`${p.blockId}:${p.role}`, p.status]));
    const seq = rows.filter((r) => r.firstOfPart).map((r) => order.indexOf(partStatus.get(r.key.split(':').slice(0, 2).join(':'))!));
    for (let i = 1; i < seq.length; i++) expect(seq[i]).toBeGreaterThanOrEqual(seq[i - 1]);
    expect(stressRows(parts, false)[0].blockId).toBe(parts[0].blockId);
    // 20 kV on a 25 kV part derated to 80 %: the smoothing capacitors sit right at the limit.
    const smooth = rows.find((r) => r.element === 'Csmooth_s1')!;
    expect(smooth.allowed).toBe(20e3);
    expect(smooth.status).toBe('tight');
  });
  it('counts over, tight and unrated parts', () => {
    const mk = (status: PartStress['status']): PartStress => ({ blockId: 'b', role: status, element: 'X', kind: 'C', label: status, checks: [], worstMargin: null, status });
    expect(stressCounts([mk('over'), mk('tight'), mk('tight'), mk('ok'), mk('unrated')])).toEqual({ over: 1, tight: 2, unrated: 1, total: 5 });
  });
});

describe('estimate vs solve', () => {
  it('compares a real half-wave ladder: ideal no-load 2nVp, PIV 2Vp (Cockcroft–Walton, common practice)', () => {
    const e = half.estimate!.result;
    expect(e.idealNoLoadV).toBe(2 * N * VP);
    expect(e.diodePivV).toBe(2 * VP);
    const rows = compareRows(e, half.solve);
    const by = Object.fromEntries(rows.map((r) => [r.key, r]));
    const out = half.solve!.nodes[half.solve!.outputs[0].node];
    expect(by.outputV.solve).toBe(Math.abs(out.meanV));
    expect(by.outputV.estimate).toBe(e.outputMeanV);
    expect(by.dropV.solve).toBeCloseTo(2 * N * VP - Math.abs(out.meanV), 9);
    expect(by.rippleV.solve).toBe(out.rippleV);
    expect(by.rippleFraction.solve).toBeCloseTo(out.rippleV / Math.abs(out.meanV), 12);
    expect(by.pivV.solve).toBe(solvedMaxPivV(half.solve!.parts));
    expect(by.storedEnergyJ.solve).toBe(half.solve!.safety.totalEnergyJ);
    expect(by.t90S.solve).toBe(half.solve!.warmup!.t90S);
    for (const r of rows) {
      expect(r.difference, r.key).not.toBeNull();
      expect(r.difference!, r.key).toBeCloseTo((r.estimate! - r.solve!) / Math.abs(r.solve!), 12);
    }
    // Light load: the closed form and the full solve agree on the output within 0.1 %, the PIV
    // within a diode drop's share, the ripple within 5 %.
    expect(Math.abs(by.outputV.difference!)).toBeLessThan(1e-3);
    expect(Math.abs(by.pivV.difference!)).toBeLessThan(1e-2);
    expect(Math.abs(by.rippleV.difference!)).toBeLessThan(0.05);
  });
  it('takes a symmetric pair across both outputs (V+ − V−, 4nVp ideal)', () => {
    const e = sym.estimate!.result;
    expect(e.idealNoLoadV).toBe(4 * 2 * 5e3);
    const so = solvedOutput(sym.solve!)!;
    const pos = sym.solve!.outputs.find((o) => o.polarity === 'positive')!.node;
    const neg = sym.solve!.outputs.find((o) => o.polarity === 'negative')!.node;
    expect(so.outputV).toBeCloseTo(sym.solve!.nodes[pos].meanV - sym.solve!.nodes[neg].meanV, 9);
    const rows = compareRows(e, sym.solve);
    expect(Math.abs(rows.find((r) => r.key === 'outputV')!.difference!)).toBeLessThan(1e-3);
    // The two outputs' ripples partly cancel in V+ − V−: never more than their sum.
    expect(so.rippleV).not.toBeNull();
    expect(so.rippleV!).toBeLessThanOrEqual(sym.solve!.nodes[pos].rippleV + sym.solve!.nodes[neg].rippleV + 1e-9);
  });
  it('keeps the estimate column when the solve is pending and says why cells are empty', () => {
    const rows = compareRows(half.estimate!.result, null);
    expect(rows.every((r) => r.solve === null && r.difference === null)).toBe(true);
    expect(rows.find((r) => r.key === 'outputV')!.estimate).toBe(half.estimate!.result.outputMeanV);
    const noWarm = compareRows(half.estimate!.result, { ...half.solve!, warmup: undefined }, true);
    expect(noWarm.find((r) => r.key === 't90S')).toMatchObject({ solve: null, solveNote: 'warm-up running' });
    const custom = compareRows(null, half.solve);
    expect(custom.find((r) => r.key === 'outputV')!.solve).not.toBeNull();
    expect(custom.find((r) => r.key === 'dropV')!.solveNote).toBeDefined();
    expect(custom.every((r) => r.estimate === null && r.difference === null)).toBe(true);
  });
});

describe('plots', () => {
  it('thins a waveform by min–max buckets and keeps its extremes in time order', () => {
    const t = Array.from({ length: 5000 }, (_, i) => i * 1e-8);
    const v = t.map((x, i) => Math.sin(2 * Math.PI * 4e4 * x) + (i === 1234 ? 5 : 0));
    const d = decimateMinMax(t, v, 400);
    expect(d.t.length).toBeLessThanOrEqual(400);
    expect(Math.max(...d.v)).toBe(Math.max(...v));
    expect(Math.min(...d.v)).toBe(Math.min(...v));
    for (let i = 1; i < d.t.length; i++) expect(d.t[i]).toBeGreaterThan(d.t[i - 1]);
    expect(decimateMinMax([0, 1], [2, 3])).toEqual({ t: [0, 1], v: [2, 3] });
  });
  it('scales the real output waveform to µs and kV', () => {
    const out = half.solve!.nodes[half.solve!.outputs[0].node];
    const [s] = waveformSeries([out], 1e6, 1e-3);
    expect(s.points.length).toBe(out.waveform!.t.length);
    expect(s.mean).toBeCloseTo(out.meanV / 1e3, 9);
    const last = s.points[s.points.length - 1];
    expect(last.x).toBeLessThanOrEqual(half.solve!.periodS * 1e6 * (1 + 1e-9));
    // The 200 sent points sample the period; its true maximum lies at or just above the highest sample.
    const top = Math.max(...s.points.map((p) => p.y));
    expect(top).toBeLessThanOrEqual(out.maxV / 1e3 + 1e-9);
    expect(top).toBeGreaterThan((out.maxV - 0.05 * out.rippleV) / 1e3);
    expect(waveformSeries([{ ...out, waveform: undefined }], 1, 1)).toEqual([]);
  });
  it('draws the warm-up with its 90 % line at 90 % of the final value', () => {
    const w = warmupPlot(half.solve!.warmup, 1e-3)!;
    const curve = half.solve!.warmup!.curve;
    expect(w.final).toBeCloseTo(curve.meanV[curve.meanV.length - 1] / 1e3, 9);
    expect(w.level90).toBeCloseTo(0.9 * w.final, 12);
    expect(w.cycles90).toBe(half.solve!.warmup!.cycles90);
    // The curve crosses its 90 % level at the reported cycle count.
    const before = w.points.filter((p) => p.cycles < w.cycles90! * 0.97);
    const after = w.points.filter((p) => p.cycles > w.cycles90! * 1.03);
    expect(before.every((p) => p.v < w.level90)).toBe(true);
    expect(after.some((p) => p.v >= w.level90)).toBe(true);
    expect(warmupPlot(undefined, 1)).toBeNull();
  });
});

describe('niceTicks', () => {
  it('steps by 1, 2, 2.5 or 5 × 10^k and covers the range', () => {
    expect(niceTicks(0, 60, 4)).toEqual({ domain: [0, 60], ticks: [0, 20, 40, 60], decimals: 0 });
    expect(niceTicks(0.3, 9.7, 5).ticks).toEqual([0, 2, 4, 6, 8, 10]);
    const t = niceTicks(-10, 10, 4);
    expect(t.ticks).toEqual([-10, -5, 0, 5, 10]);
    expect(niceTicks(0, 1, 4)).toMatchObject({ ticks: [0, 0.25, 0.5, 0.75, 1], decimals: 2 });
  });
  it('tells a few volts of ripple on 60 kV apart in kV', () => {
    const t = niceTicks(59.9616, 59.9696, 4);
    // 8 V over 4 intervals: a 2.5 V step, written 59.9600, 59.9625 … kV.
    expect(t.ticks[1] - t.ticks[0]).toBeCloseTo(0.0025, 12);
    expect(t.decimals).toBe(4);
    expect(new Set(t.ticks.map((x) => x.toFixed(t.decimals))).size).toBe(t.ticks.length);
    expect(t.domain[0]).toBeLessThanOrEqual(59.9616);
    expect(t.domain[1]).toBeGreaterThanOrEqual(59.9696);
  });
  it('gives a flat signal a band around its value', () => {
    const t = niceTicks(5, 5);
    expect(t.domain[0]).toBeLessThan(5);
    expect(t.domain[1]).toBeGreaterThan(5);
    expect(niceTicks(0, 0).domain).toEqual([-1, 1]);
  });
});

describe('centred waveform', () => {
  it('removes each node’s mean so both outputs of a symmetric pair share one ripple axis', () => {
    const readings = sym.solve!.outputs.map((o) => sym.solve!.nodes[o.node]);
    const series = waveformSeries(readings, 1e6, 1, 600, true);
    expect(series).toHaveLength(2);
    readings.forEach((r, i) => {
      const ys = series[i].points.map((p) => p.y);
      expect(series[i].mean).toBe(0);
      expect(Math.max(...ys)).toBeLessThanOrEqual(r.maxV - r.meanV + 1e-9);
      expect(Math.min(...ys)).toBeGreaterThanOrEqual(r.minV - r.meanV - 1e-9);
      expect(Math.max(...ys) - Math.min(...ys)).toBeLessThanOrEqual(r.rippleV + 1e-9);
    });
    expect(maxAbsRipple(readings)).toBeLessThan(Math.max(...readings.map((r) => r.rippleV)) + 1e-9);
    expect(maxAbsRipple(readings)).toBeGreaterThan(0);
  });
});
