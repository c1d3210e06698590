// Envelope-following warm-up (lib/circuit/analysis/warmup.ts) against the plain cycle-by-cycle
// transient from power-on on the same circuit — the method must reproduce what it skips — and
// the shape of its result. t90 against ngspice is in tests/reference/solver/ngspice-matrix.
import { describe, expect, it } from 'vitest';
import { solveNetlist } from '@/lib/circuit/analysis/solve';
import { warmupFromPowerOn } from '@/lib/circuit/analysis/warmup';
import { buildCircuit } from '@/lib/circuit/mna/circuit';
import { generateLadder, GENERIC_RECTIFIER, type LadderOptions } from '@/lib/circuit/netlist/generate';

function setup(o: LadderOptions) {
  const nl = generateLadder(o);
  const ss = solveNetlist(nl, { waveformPoints: 0 });
  if (!ss.ok) throw new Error(ss.reason);
  const b = buildCircuit(nl);
  if (!b.ok) throw new Error(b.reason);
  const T = 1 / o.frequencyHz;
  const base = {
    periodS: T,
    outputNode: `s${o.stages}`,
    finalMeanV: ss.nodes[`s${o.stages}`].mean,
    control: { hMaxS: T / 40, hMinS: T * 1e-9, hInitS: T * 1e-4, lteRel: 2e-5, lteAbsV: 1e-8 * o.peakV, vScaleV: o.peakV },
  };
  return { circuit: b.circuit, base };
}

describe('warm-up by envelope following', () => {
  for (const kind of ['half-wave', 'full-wave'] as const) {
    it(`${kind} n = 6: the envelope's 90 % and 99 % crossings match the cycle-by-cycle transient within 0.5 %`, () => {
      const { circuit, base } = setup({ kind, stages: 6, peakV: 1000, frequencyHz: 40_000, capacitanceF: 12.5e-9, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-3, sourceResistanceOhm: 0.1 });
      const plain = warmupFromPowerOn(circuit, { ...base, bruteCycles: Number.POSITIVE_INFINITY });
      const env = warmupFromPowerOn(circuit, { ...base, bruteCycles: 12 });
      if (!plain.ok || !env.ok) throw new Error('warm-up failed');
      const p = plain.result;
      const e = env.result;
      expect(p.cycles90).not.toBeNull();
      expect(p.cycles99).not.toBeNull();
      expect(Math.abs(e.cycles90! / p.cycles90! - 1)).toBeLessThan(5e-3);
      expect(Math.abs(e.cycles99! / p.cycles99! - 1)).toBeLessThan(5e-3);
      // The envelope skipped most cycles; the plain run integrated every one it covers.
      expect(p.cyclesIntegrated).toBe(p.cyclesCovered);
      expect(e.cyclesIntegrated).toBeLessThan(0.6 * e.cyclesCovered);
      // The curve rises from 0 V at power-on towards the steady-state mean, never past it.
      expect(e.curve.cycles[0]).toBe(0);
      expect(e.curve.meanV[0]).toBe(0);
      for (let i = 1; i < e.curve.cycles.length; i++) expect(e.curve.cycles[i]).toBeGreaterThan(e.curve.cycles[i - 1]);
      expect(Math.max(...e.curve.meanV)).toBeLessThan(base.finalMeanV * 1.001);
      expect(e.t90).toBeCloseTo(e.cycles90! * base.periodS, 12);
    }, 60_000);
  }

  it('reports an unknown output node as a value', () => {
    const { circuit, base } = setup({ kind: 'half-wave', stages: 2, peakV: 100, frequencyHz: 50, capacitanceF: 1e-5, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-4 });
    const r = warmupFromPowerOn(circuit, { ...base, outputNode: 'nowhere', bruteCycles: 4 });
    expect(r.ok).toBe(false);
  });
});
