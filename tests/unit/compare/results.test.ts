import { describe, expect, it } from 'vitest';
import { compileDocument, halfWaveStarter, parseNetlist, recognizeTopology, solveNetlist, symmetricStarter, type DesignBlock, type DesignDocument } from '@/lib/circuit';
import { netlistTextOf } from '@/lib/editor/engine/netlist-text';
import { diffResults, resultsOf, type DesignResults, type MetricRow } from '@/lib/compare';

/** Invented demo values: 1 kV peak at 20 kHz, 10 nF stages rated 3 kV, a 100 µA current load. */
const N = 3;
const O = { amplitudeV: 1000, frequencyHz: 20e3, capacitanceF: 10e-9, capacitorRatedV: 3000, loadCurrentA: 100e-6 };

function withCapacitance(doc: DesignDocument, c: number): DesignDocument {
  const out = structuredClone(doc);
  for (const b of out.blocks) {
    if (b.kind !== 'stage') continue;
    b.data.pumpC.capacitanceF = c;
    b.data.smoothC.capacitanceF = c;
  }
  return out;
}

/** An independent solve of a document: the exported netlist text read back and solved, output taken from its own topology. */
function independentSolve(doc: DesignDocument) {
  const compiled = compileDocument(doc);
  if (!compiled.ok) throw new Error(compiled.reason);
  const parsed = parseNetlist(netlistTextOf(compiled.netlist));
  if (!parsed.ok) throw new Error('netlist does not read back');
  const topology = recognizeTopology(parsed.netlist);
  const solved = solveNetlist(parsed.netlist, { outputNodes: topology.outputs.map((o) => o.node), waveformPoints: 200 });
  if (!solved.ok) throw new Error(solved.reason);
  const out = solved.nodes[topology.outputs[0].node];
  return { solved, outputV: Math.abs(out.mean), rippleV: out.ripple, energyJ: solved.safety.totalEnergyJ };
}

function row(rows: MetricRow[], metric: MetricRow['metric']): MetricRow {
  const r = rows.find((x) => x.metric === metric);
  if (!r) throw new Error(`no row ${metric}`);
  return r;
}

function ok(r: DesignResults): Extract<DesignResults, { ok: true }> {
  if (!r.ok) throw new Error(r.reason);
  return r;
}

describe('resultsOf + diffResults', () => {
  const a = halfWaveStarter(N, O);
  const b = withCapacitance(a, 20e-9);
  const ra = resultsOf(a);
  const rb = resultsOf(b);

  it('carries the numbers of two independent solves of the same documents', () => {
    const sa = independentSolve(a);
    const sb = independentSolve(b);
    const rows = diffResults(ra, rb);
    expect(rows.map((r) => r.metric)).toEqual(['outputDc', 'ripple', 'sag', 'margin', 'energy']);
    const out = row(rows, 'outputDc');
    expect(out.a).toBeCloseTo(sa.outputV, 6);
    expect(out.b).toBeCloseTo(sb.outputV, 6);
    expect(out.delta).toBeCloseTo(sb.outputV - sa.outputV, 6);
    expect(out.relDelta).toBeCloseTo((sb.outputV - sa.outputV) / sa.outputV, 9);
    const ripple = row(rows, 'ripple');
    expect(ripple.a).toBeCloseTo(sa.rippleV, 6);
    expect(ripple.b).toBeCloseTo(sb.rippleV, 6);
    const energy = row(rows, 'energy');
    expect(energy.a).toBeCloseTo(sa.energyJ, 9);
    expect(energy.b).toBeCloseTo(sb.energyJ, 9);
    // Sag is below the ideal no-load output 2nVp (REFERENCES §1.1: V0 = 2nVp [S1][S5]).
    const sag = row(rows, 'sag');
    expect(sag.a).toBeCloseTo(2 * N * O.amplitudeV - sa.outputV, 6);
    expect(sag.b).toBeCloseTo(2 * N * O.amplitudeV - sb.outputV, 6);
  });

  it('shows the ripple falling when every capacitor is doubled, as ripple ∝ 1/(fC)', () => {
    // REFERENCES §1.1, the classic half-wave ladder: ripple p-p δV = (I/(fC))·n(n+1)/2
    // ([S1] J. Lux, "Cockroft Walton Voltage Multipliers"; [S2] the same as I/(2fC)·n(n+1)).
    // Doubling C halves it; the solve sits within a few per cent of the crest model (§1.3).
    const rows = diffResults(ra, rb);
    const ripple = row(rows, 'ripple');
    const textbook = (c: number) => (O.loadCurrentA / (O.frequencyHz * c)) * ((N * (N + 1)) / 2);
    expect(ripple.a as number).toBeGreaterThan(0.9 * textbook(10e-9));
    expect(ripple.a as number).toBeLessThan(1.05 * textbook(10e-9));
    expect(ripple.b as number).toBeGreaterThan(0.9 * textbook(20e-9));
    expect(ripple.b as number).toBeLessThan(1.05 * textbook(20e-9));
    expect(ripple.delta as number).toBeLessThan(0);
    expect(ripple.relDelta as number).toBeGreaterThan(-0.55);
    expect(ripple.relDelta as number).toBeLessThan(-0.45);
    // Sag falls with C too (ΔV ∝ 1/(fC), §1.1) and the output rises.
    expect(row(rows, 'sag').delta as number).toBeLessThan(0);
    expect(row(rows, 'outputDc').delta as number).toBeGreaterThan(0);
    // Stored energy ½CV² roughly doubles with C at about the same voltages.
    expect(row(rows, 'energy').relDelta as number).toBeGreaterThan(0.9);
  });

  it('names the part with the worst margin against its derated rating', () => {
    const r = ok(ra);
    expect(r.worstMargin).not.toBeNull();
    // Every smoothing C holds 2Vp = 2 kV at no load, against 0.8 × 3 kV = 2.4 kV allowed; the
    // generic diode's 1000 V PIV rating derated to 800 V against 2Vp = 2 kV is the worst.
    expect(r.worstMargin?.quantity).toBe('piv');
    expect(r.worstMargin?.margin).toBeLessThan(0);
    const m = row(diffResults(ra, rb), 'margin');
    expect(m.a).toBe(r.worstMargin?.margin);
    expect(m.aPart).toMatch(/^Stage \d · diode [AB]$/);
    expect(m.relDelta).toBeNull();
  });

  it('shows a side’s reason instead of numbers when it does not compile', () => {
    const broken = structuredClone(a);
    broken.wires = broken.wires.filter((w) => w.source !== 'src' && w.target !== 'src');
    broken.blocks = broken.blocks.filter((x: DesignBlock) => x.kind !== 'acSource');
    const rBroken = resultsOf(broken);
    expect(rBroken.ok).toBe(false);
    const rows = diffResults(ra, rBroken);
    for (const r of rows) {
      expect(r.b).toBeNull();
      expect(r.delta).toBeNull();
      expect(r.bNote).toBe((rBroken as { reason: string }).reason);
    }
    expect(row(rows, 'outputDc').a).toBe(ok(ra).outputDcV);
  });

  it('takes V+ − V− and its ripple for a symmetric pair', () => {
    const r = ok(resultsOf(symmetricStarter(2, O)));
    // Both outputs together: about 4nVp = 8 kV less the drop.
    expect(r.idealNoLoadV).toBeCloseTo(4 * 2 * O.amplitudeV, 6);
    expect(r.outputDcV).toBeGreaterThan(0.95 * 8000);
    expect(r.outputDcV).toBeLessThan(8000);
    expect(r.rippleV).not.toBeNull();
  });
});
