// The crest-model initial state (lib/circuit/analysis/crest-guess.ts) against the exact
// small-ripple crest model of REFERENCES §1.3 (deriv) — charge moves only at the crests, the
// load drains continuously — whose closed forms for a half-wave ladder with equal C are
// mean drop u·(2n³/3 + n²/2 + n/3), maximum drop u·(2n³/3 + n²/4 + n/12) and ripple
// u·n(n+1)/2 with u = I/(fC); and the mean-current balance: in steady state every diode of a
// half-wave ladder passes the load's charge I/f per period (REFERENCES §5, deriv).
import { describe, expect, it } from 'vitest';
import { crestGuess } from '@/lib/circuit/analysis/crest-guess';
import { solveNetlist } from '@/lib/circuit/analysis/solve';
import { buildCircuit, type Circuit } from '@/lib/circuit/mna/circuit';
import { generateLadder, GENERIC_RECTIFIER, NEAR_IDEAL_DIODE, type LadderOptions } from '@/lib/circuit/netlist/generate';
import type { Netlist } from '@/lib/circuit/netlist/types';

function circuitOf(nl: Netlist): Circuit {
  const b = buildCircuit(nl);
  if (!b.ok) throw new Error(b.reason);
  return b.circuit;
}

const ideal = (n: number, extra: Partial<LadderOptions> = {}): LadderOptions => ({
  kind: 'half-wave',
  stages: n,
  peakV: 1000,
  frequencyHz: 1000,
  capacitanceF: 1e-6,
  diode: NEAR_IDEAL_DIODE,
  loadCurrentA: 1e-3,
  ...extra,
});

describe('crest-model initial state', () => {
  for (const n of [1, 2, 4, 8]) {
    it(`half-wave n = ${n}: output mean, maximum and ripple match the exact crest model (§1.3)`, () => {
      const c = circuitOf(generateLadder(ideal(n)));
      const g = crestGuess(c, 1000, 256);
      expect(g).not.toBeNull();
      if (!g) return;
      const u = 1e-3 / (1000 * 1e-6);
      const out = c.nodeOffset.get(`s${n}`)!;
      const meanDrop = (2000 * n - g.mean[out]) / u;
      const ripple = g.swing[out] / u;
      expect(Math.abs(meanDrop / ((2 * n ** 3) / 3 + n ** 2 / 2 + n / 3) - 1)).toBeLessThan(0.02);
      expect(Math.abs(ripple / ((n * (n + 1)) / 2) - 1)).toBeLessThan(0.03);
      // The state at t = 0 puts the output at its maximum less the drain since the last crest.
      const maxDrop = (2000 * n - (g.mean[out] + g.swing[out] / 2)) / u;
      expect(maxDrop).toBeGreaterThan(0);
      // Every diode passes I/f per period.
      for (const q of g.pulseChargeC) expect(q * 1000).toBeCloseTo(1e-3, 6);
    });
  }

  it('full-wave n = 3: each diode passes half the load charge per period', () => {
    const c = circuitOf(generateLadder(ideal(3, { kind: 'full-wave' })));
    const g = crestGuess(c, 1000);
    expect(g).not.toBeNull();
    if (!g) return;
    let total = 0;
    for (const q of g.pulseChargeC) total += q;
    // 4 diodes per stage, 2 in series per path: each passes I/(2f).
    for (const q of g.pulseChargeC) expect(q * 1000).toBeCloseTo(0.5e-3, 6);
    expect(total * 1000).toBeCloseTo(12 * 0.5e-3, 6);
  });

  it('drops a diode that would have to pass negative charge (it never conducts)', () => {
    const nl = generateLadder(ideal(2));
    // A diode from the output to ground, reversed: blocks 4 kV and never conducts.
    nl.elements.push({ kind: 'D', name: 'Dclamp', nodes: ['0', 's2'], model: NEAR_IDEAL_DIODE.name });
    const c = circuitOf(nl);
    const g = crestGuess(c, 1000);
    expect(g).not.toBeNull();
    if (!g) return;
    const idx = c.diodes.findIndex((d) => d.name === 'Dclamp');
    expect(g.pulseChargeC[idx]).toBe(0);
    const out = c.nodeOffset.get('s2')!;
    expect(Math.abs((4000 - g.mean[out]) / 8 - 1)).toBeLessThan(0.02);
  });

  it('returns null for a circuit without diodes', () => {
    const nl: Netlist = {
      title: 'rc',
      elements: [
        { kind: 'V', name: 'V1', nodes: ['a', '0'], dcV: 0, sine: { offsetV: 0, amplitude: 1, frequencyHz: 50, delayS: 0, damping: 0, phaseDeg: 0 } },
        { kind: 'R', name: 'R1', nodes: ['a', 'b'], resistanceOhm: 1e3 },
        { kind: 'C', name: 'C1', nodes: ['b', '0'], capacitanceF: 1e-6 },
      ],
      models: {},
      ignored: [],
    };
    const c = circuitOf(nl);
    expect(crestGuess(c, 50)).toBeNull();
  });

  it('lets shooting converge in a few Newton iterations on a heavily loaded 20-stage ladder', () => {
    // 1 kV, 40 kHz, C·f = 5e-4, 1 mA: the output sags by about a quarter of 2nVp. From the
    // no-load state this took 36 shooting iterations; from the crest model Newton needs few.
    const nl = generateLadder({ kind: 'half-wave', stages: 20, peakV: 1000, frequencyHz: 40_000, capacitanceF: 5e-4 / 40_000, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-3, sourceResistanceOhm: 0.1 });
    const r = solveNetlist(nl, { waveformPoints: 0 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.stats.shootingIterations).toBeLessThanOrEqual(3);
    expect(r.stats.periodsIntegrated).toBeLessThanOrEqual(6);
    expect(r.diagnostics.some((d) => d.code === 'no-load-guess')).toBe(false);
  });
});
