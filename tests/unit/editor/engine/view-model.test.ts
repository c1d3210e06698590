/**
 * The view model on real compiles and solves of small starter ladders: every number it shows is
 * the solver's own (checked against the solve result's maps), derating and margins by hand
 * arithmetic, and the stresses against the textbook Cockcroft–Walton values (REFERENCES §5:
 * bottom pumping capacitor Vp, every other capacitor 2Vp, every diode 2Vp reverse, average
 * diode current = load current for half-wave).
 */
import { describe, expect, it } from 'vitest';
import {
  compileDocument,
  fullWaveStarter,
  halfWaveStarter,
  parseNetlist,
  recognizeTopology,
  solveNetlist,
  symmetricStarter,
  type CompileResult,
  type DesignDocument,
  type SolveResult,
} from '@/lib/circuit';
import { compileView, partStress, peakDifferenceV, solveView, topologyBadge } from '@/lib/editor/engine/view-model';
import { netlistTextOf } from '@/lib/editor/engine/netlist-text';

const VP = 1000;
const O = { amplitudeV: VP, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 1e-4, capacitorRatedV: 3000 };

function compiled(doc: DesignDocument): CompileResult & { ok: true } {
  const r = compileDocument(doc);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

/** The `npm run solve` path: exported text → parseNetlist → solveNetlist with the script's output nodes. */
function solveExported(doc: DesignDocument): SolveResult & { ok: true } {
  const parsed = parseNetlist(netlistTextOf(compiled(doc).netlist));
  if (!parsed.ok) throw new Error(parsed.errors[0].message);
  const outputs = recognizeTopology(parsed.netlist).outputs.map((o) => o.node);
  const r = solveNetlist(parsed.netlist, { outputNodes: outputs, waveformPoints: 200, budgetMs: 15_000 });
  if (!r.ok) throw new Error(r.reason);
  return r;
}

function withResistor(doc: DesignDocument, data: { resistanceOhm: number; ratedPowerW?: number; ratedVoltageV?: number }, from: [string, string], to: [string, string]): DesignDocument {
  return {
    ...doc,
    blocks: [...doc.blocks, { id: 'r1', kind: 'resistor', position: { x: 0, y: 400 }, label: 'Sense R', data }],
    wires: [...doc.wires, { id: 'wr1', source: from[0], sourcePort: from[1], target: 'r1', targetPort: 'a' }, { id: 'wr2', source: 'r1', sourcePort: 'b', target: to[0], targetPort: to[1] }],
  };
}

describe('topology badge', () => {
  it('labels symmetric, half-wave and full-wave ladders with stage count and polarity', () => {
    expect(compileView(symmetricStarter(3, O), compileDocument(symmetricStarter(3, O))).badge).toEqual({ kind: 'symmetric', stages: 3, polarity: 'bipolar', label: 'Symmetric · 3 stages · ±' });
    expect(compileView(halfWaveStarter(4, O), compileDocument(halfWaveStarter(4, O))).badge.label).toBe('Half-wave · 4 stages · +');
    const neg = fullWaveStarter(2, { ...O, polarity: 'negative' });
    expect(topologyBadge(compiled(neg).topology)).toEqual({ kind: 'full-wave', stages: 2, polarity: 'negative', label: 'Full-wave · 2 stages · −' });
    expect(topologyBadge(compiled(halfWaveStarter(1, O)).topology).label).toBe('Half-wave · 1 stage · +');
  });

  it('calls a drawing that is no ladder "Custom"', () => {
    const doc = halfWaveStarter(1, O);
    // A source feeding a resistor only: solvable, not a ladder.
    const custom: DesignDocument = {
      ...doc,
      blocks: doc.blocks.filter((b) => b.kind !== 'stage' && b.kind !== 'load'),
      wires: doc.wires.filter((w) => w.source !== 's1' && w.target !== 's1' && w.source !== 'load' && w.target !== 'load'),
    };
    const withR = withResistor(custom, { resistanceOhm: 1e3 }, ['src', 'hot'], ['gnd', 'g']);
    const view = compileView(withR, compileDocument(withR));
    expect(view.ok).toBe(true);
    expect(view.badge).toEqual({ kind: 'custom', stages: null, polarity: null, label: 'Custom' });
  });

  it('reports a failed compile with its reason and no nets', () => {
    const doc = halfWaveStarter(2, O);
    const shorted: DesignDocument = { ...doc, wires: [...doc.wires, { id: 'wx', source: 'src', sourcePort: 'hot', target: 'gnd', targetPort: 'g' }] };
    const result = compileDocument(shorted);
    expect(result.ok).toBe(false);
    const view = compileView(shorted, result);
    expect(view.ok).toBe(false);
    expect(view.reason).toBe(result.ok ? undefined : result.reason);
    expect(view.reason).toMatch(/short/);
    expect(view.nodeOfPort).toEqual({});
    expect(view.netlistText).toBeNull();
    expect(view.diagnostics.some((d) => d.severity === 'error' && d.blockId === 'src')).toBe(true);
  });
});

describe('compile view: nets under ports and node labels', () => {
  const doc = halfWaveStarter(3, O);
  const view = compileView(doc, compileDocument(doc));

  it('maps wired and unwired ports to their netlist node', () => {
    expect(view.nodeOfPort['s1:xOut']).toBe('x_s1');
    expect(view.nodeOfPort['s2:xIn']).toBe('x_s1');
    expect(view.nodeOfPort['s2:yOut']).toBe('y_s2');
    expect(view.nodeOfPort['s3:yIn']).toBe('y_s2');
    expect(view.nodeOfPort['gnd:g']).toBe('0');
    expect(view.nodeOfPort['s1:yIn']).toBe('0');
    expect(view.nodeOfPort['load:a']).toBe('y_s3');
    // Nothing is wired to the top stage's pumping output, but its parts make it a real node.
    expect(view.nodeOfPort['s3:xOut']).toBe('x_s3');
    expect(view.nodeOfPort['src:hot']).toBe(view.nodeOfPort['s1:xIn']);
  });

  it('names nodes for people', () => {
    expect(view.nodeLabels['0']).toBe('Ground');
    expect(view.nodeLabels['y_s3']).toBe('Output +');
    expect(view.nodeLabels['y_s2']).toBe('Stage 2 · smoothing (y2)');
    expect(view.nodeLabels['x_s3']).toBe('Stage 3 · pumping (x3)');
    expect(view.nodeLabels[view.nodeOfPort['src:hot']]).toBe('Drive');
    expect(view.outputs).toEqual([{ node: 'y_s3', polarity: 'positive' }]);
  });

  it('labels a symmetric pair per ladder and a full-wave ladder with both drives', () => {
    const sym = symmetricStarter(2, O);
    const s = compileView(sym, compileDocument(sym)).nodeLabels;
    expect(s['y_p2']).toBe('Output +');
    expect(s['y_m2']).toBe('Output −');
    expect(s['y_m1']).toBe('− Stage 1 · smoothing (y1)');
    expect(s['x_p1']).toBe('+ Stage 1 · pumping (x1)');
    const fw = fullWaveStarter(2, O);
    const fv = compileView(fw, compileDocument(fw));
    expect(fv.nodeLabels[fv.nodeOfPort['src:hot']]).toBe('Drive A');
    expect(fv.nodeLabels[fv.nodeOfPort['src:hotB']]).toBe('Drive B');
    expect(fv.nodeLabels['x2_s1']).toBe('Stage 1 · second pumping (x′1)');
  });

  it('carries the export text', () => {
    expect(view.netlistText).toBe(netlistTextOf(compiled(doc).netlist));
    expect(view.netlistText?.split('\n')[0]).toBe('Kilorung design');
  });
});

describe('solve view and part stress (2-stage half-wave, solved)', () => {
  const doc = withResistor(halfWaveStarter(2, O), { resistanceOhm: 20e6, ratedPowerW: 0.25, ratedVoltageV: 5000 }, ['s2', 'yOut'], ['gnd', 'g']);
  const c = compiled(doc);
  const solve = solveExported(doc);
  const view = solveView(doc, c, solve);

  it('shows the solver’s own numbers for every node; the output is its mean exactly', () => {
    const out = solve.outputs[0].node;
    expect(out).toBe('y_s2');
    expect(view.nodes[out].meanV).toBe(solve.nodes[out].mean);
    expect(view.nodes[out].label).toBe('Output +');
    expect(view.nodes[out].ports).toEqual(expect.arrayContaining(['s2:yOut', 'load:a', 'r1:a']));
    for (const [node, m] of Object.entries(solve.nodes)) {
      expect(view.nodes[node]).toMatchObject({ node, meanV: m.mean, minV: m.min, maxV: m.max, rippleV: m.ripple });
      expect(view.nodes[node].waveform?.v.length).toBeGreaterThan(100);
    }
    expect(view.outputs).toEqual(solve.outputs);
    expect(view.frequencyHz).toBe(1e3);
    expect(view.power).toEqual(solve.power);
    expect(view.safety).toEqual(solve.safety);
  });

  it('lists every placed part once, with the solve’s stresses', () => {
    const parts = partStress(doc, c, solve);
    // 2 stages × (2 C + 2 D), the resistor, the current load is a source and not a part.
    expect(parts.map((p) => p.element).sort()).toEqual(['Cpump_s1', 'Cpump_s2', 'Csmooth_s1', 'Csmooth_s2', 'DA_s1', 'DA_s2', 'DB_s1', 'DB_s2', 'R_r1']);
    for (const p of parts) {
      const m = solve.parts[p.element];
      if (m.kind === 'C') expect(p.checks).toEqual([expect.objectContaining({ quantity: 'voltage', actual: m.peakV, unit: 'V' })]);
      if (m.kind === 'D') {
        expect(p.checks.map((x) => [x.quantity, x.actual])).toEqual([
          ['piv', m.pivV],
          ['averageCurrent', Math.abs(m.averageCurrentA)],
          ['peakCurrent', Math.abs(m.peakCurrentA)],
        ]);
      }
      if (m.kind === 'R') expect(p.checks[0]).toMatchObject({ quantity: 'power', actual: Math.abs(m.powerW), unit: 'W' });
    }
    const label = (el: string) => parts.find((p) => p.element === el)?.label;
    expect(label('Cpump_s2')).toBe('Stage 2 · pumping C');
    expect(label('DB_s1')).toBe('Stage 1 · diode B');
    expect(label('R_r1')).toBe('Sense R');
  });

  it('matches the textbook stresses of a lightly loaded Cockcroft–Walton ladder (REFERENCES §5)', () => {
    const parts = partStress(doc, c, solve);
    const actual = (el: string, q: string) => parts.find((p) => p.element === el)!.checks.find((x) => x.quantity === q)!.actual;
    // Light load (0.1 mA + 50 µA at 1 kHz, 1 µF): drops are a few volts, ripple well under 1 %.
    expect(actual('Cpump_s1', 'voltage')).toBeGreaterThan(0.97 * VP);
    expect(actual('Cpump_s1', 'voltage')).toBeLessThan(1.02 * VP);
    for (const el of ['Csmooth_s1', 'Csmooth_s2', 'Cpump_s2']) {
      expect(actual(el, 'voltage') / (2 * VP)).toBeGreaterThan(0.97);
      expect(actual(el, 'voltage') / (2 * VP)).toBeLessThan(1.02);
    }
    for (const el of ['DA_s1', 'DB_s1', 'DA_s2', 'DB_s2']) {
      expect(actual(el, 'piv') / (2 * VP)).toBeGreaterThan(0.97);
      expect(actual(el, 'piv') / (2 * VP)).toBeLessThan(1.01);
    }
    // Half-wave: every diode's average current is the DC current out of the top (charge conservation).
    const iOut = 1e-4 + solve.nodes.y_s2.mean / 20e6;
    for (const el of ['DA_s1', 'DB_s1', 'DA_s2', 'DB_s2']) expect(actual(el, 'averageCurrent') / iOut).toBeCloseTo(1, 2);
    // The resistor from the output to ground: P ≈ V²/R, peak |V| is the output's largest excursion.
    const vOut = solve.nodes.y_s2;
    expect(actual('R_r1', 'power') / (vOut.mean ** 2 / 20e6)).toBeCloseTo(1, 4);
    expect(actual('R_r1', 'voltage')).toBe(Math.max(Math.abs(vOut.min), Math.abs(vOut.max)));
  });

  it('derates ratings by the team’s fraction and computes margins by hand', () => {
    const parts = partStress(doc, c, solve);
    const pump1 = parts.find((p) => p.element === 'Cpump_s1')!;
    const v = solve.parts.Cpump_s1.kind === 'C' ? solve.parts.Cpump_s1.peakV : NaN;
    // 3000 V rated × 0.8 = 2400 V allowed.
    expect(pump1.checks[0]).toMatchObject({ rating: 3000, allowed: 2400 });
    expect(pump1.checks[0].margin).toBeCloseTo((2400 - v) / 2400, 12);
    expect(pump1.status).toBe('ok');
    // Smoothing capacitors at ≈ 2000 V against 2400 V: margin ≈ 0.17.
    const smooth = parts.find((p) => p.element === 'Csmooth_s2')!;
    expect(smooth.worstMargin).toBeGreaterThan(0.15);
    expect(smooth.worstMargin).toBeLessThan(0.19);
    // Starter diodes: 1000 V PIV rating → 800 V allowed against ≈ 2000 V: over, margin ≈ −1.5.
    const d = parts.find((p) => p.element === 'DA_s2')!;
    expect(d.status).toBe('over');
    expect(d.worstMargin).toBeCloseTo((800 - d.checks[0].actual) / 800, 12);
    expect(d.checks[2]).not.toHaveProperty('rating'); // no surge rating given
    // Resistor: 0.25 W × 0.8 = 0.2 W allowed; ≈ 0.2 W dissipated (2 kV over 20 MΩ) → tight or over.
    const r = parts.find((p) => p.element === 'R_r1')!;
    const pw = r.checks[0].actual;
    expect(r.checks[0].margin).toBeCloseTo((0.2 - pw) / 0.2, 12);
    expect(r.checks[1]).toMatchObject({ rating: 5000, allowed: 4000 });
  });

  it('sorts status into over / tight / ok / unrated from the worst rated check', () => {
    const pivOf = (el: string) => (solve.parts[el].kind === 'D' ? (solve.parts[el] as { pivV: number }).pivV : NaN);
    const worst = Math.max(pivOf('DA_s1'), pivOf('DB_s1'), pivOf('DA_s2'), pivOf('DB_s2'));
    const rated = (ratedPivV: number | undefined, deratingFraction = 0.8): DesignDocument => ({
      ...doc,
      settings: { ...doc.settings, deratingFraction },
      blocks: doc.blocks.map((b) =>
        b.kind === 'stage' ? { ...b, data: { ...b.data, diodeA: { ...b.data.diodeA, ratedPivV, ratedAvgCurrentA: undefined }, diodeB: { ...b.data.diodeB, ratedPivV, ratedAvgCurrentA: undefined } } } : b,
      ),
    });
    const statusOf = (d: DesignDocument) => new Set(partStress(d, c, solve).filter((p) => p.kind === 'D').map((p) => p.status));
    // allowed = 0.8 · rating; a rating with allowed = worst / 0.95 leaves a 5 % margin on the worst diode.
    expect(statusOf(rated(worst / 0.95 / 0.8)).has('tight')).toBe(true);
    expect(statusOf(rated(worst / 0.5 / 0.8))).toEqual(new Set(['ok']));
    expect(statusOf(rated(undefined))).toEqual(new Set(['unrated']));
    // Derating 1: the full rating is allowed.
    const at1 = partStress(rated(4000, 1), c, solve).find((p) => p.element === 'DA_s1')!;
    expect(at1.checks[0].allowed).toBe(4000);
    expect(at1.worstMargin).toBeCloseTo((4000 - pivOf('DA_s1')) / 4000, 12);
  });
});

describe('peak voltage across a part between two live nodes', () => {
  const node = (v: number[]) => ({ mean: v.reduce((s, x) => s + x, 0) / v.length, min: Math.min(...v), max: Math.max(...v), ripple: Math.max(...v) - Math.min(...v), waveform: { t: v.map((_, i) => i), v } });
  const solve = { nodes: { a: node([10, 12, 14, 12]), b: node([1, 3, 1, -1]) } } as unknown as SolveResult & { ok: true };
  it('uses the sampled difference when both waveforms are there', () => {
    // a − b = 9, 9, 13, 13 → 13.
    expect(peakDifferenceV(solve, 'a', 'b')).toBe(13);
    expect(peakDifferenceV(solve, 'b', 'a')).toBe(13);
  });
  it('falls back to the bound from the extremes without waveforms', () => {
    const bare = { nodes: { a: { ...solve.nodes.a, waveform: undefined }, b: { ...solve.nodes.b, waveform: undefined } } } as unknown as SolveResult & { ok: true };
    // max(14 − (−1), 3 − 10) = 15.
    expect(peakDifferenceV(bare, 'a', 'b')).toBe(15);
    expect(peakDifferenceV(bare, 'a', '0')).toBe(14);
  });
});
