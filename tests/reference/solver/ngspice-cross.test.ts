// Cross-checks against ngspice (Debian package, `ngspice -b`) on netlists generated here, with
// the same SPICE level-1 diode parameters. ngspice runs a plain transient from the ideal
// no-load charge state until the last two periods' output means agree (see tests/fixtures/
// ngspice.ts); the warm-up run starts from empty capacitors. Tolerances from the brief: output
// mean 0.2 %, node means 0.5 % of the output, ripple 3 %, PIV 1 %, t90 5 %.
import { beforeAll, describe, expect, it } from 'vitest';
import { generateLadder, GENERIC_RECTIFIER, type LadderOptions } from '@/lib/circuit/netlist/generate';
import { solveNetlist } from '@/lib/circuit/analysis/solve';
import { ensureNgspice, maxDifference, ngspiceSteadyState } from '../../fixtures/ngspice';

let available = false;
beforeAll(() => {
  available = ensureNgspice();
}, 600_000);

const cases: { label: string; o: LadderOptions; out: string }[] = [
  { label: 'half-wave n = 4 at 50 Hz', o: { kind: 'half-wave', stages: 4, peakV: 1000, frequencyHz: 50, capacitanceF: 10e-6, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-3, sourceResistanceOhm: 0.1 }, out: 's4' },
];

describe('steady state against ngspice', () => {
  for (const c of cases) {
    it(`${c.label}: means, ripple and PIV`, () => {
      expect(available, 'ngspice could not be installed').toBe(true);
      const nl = generateLadder(c.o);
      const ours = solveNetlist(nl, { waveformPoints: 0 });
      if (!ours.ok) throw new Error(ours.reason);
      const nodes = Object.keys(ours.nodes).filter((n) => !n.includes('#'));
      const n = c.o.stages;
      const ng = ngspiceSteadyState(nl, { frequencyHz: c.o.frequencyHz, nodes, outputNode: c.out, periods: 12 * n * n + 40, settleTol: 1e-5, maxPeriods: 1000, stepsPerPeriod: 400 });
      expect(ng.settle).toBeLessThan(1e-5);
      const outMean = ng.nodes[c.out].mean;
      expect(Math.abs(ours.nodes[c.out].mean - outMean) / Math.abs(outMean), 'output mean').toBeLessThan(2e-3);
      for (const node of nodes) {
        expect(Math.abs(ours.nodes[node].mean - ng.nodes[node].mean) / Math.abs(outMean), `mean of ${node}`).toBeLessThan(5e-3);
      }
      expect(Math.abs(ours.nodes[c.out].ripple - ng.nodes[c.out].ripple) / ng.nodes[c.out].ripple, 'output ripple').toBeLessThan(0.03);
      // PIV of every diode from ngspice's simultaneous node samples over the last period.
      for (const el of nl.elements) {
        if (el.kind !== 'D') continue;
        const m = ours.parts[el.name];
        if (m.kind !== 'D') throw new Error('diode measure missing');
        const [anode, cathode] = el.nodes;
        const piv = maxDifference(ng.wave, cathode, anode, ng.lastPeriod[0], ng.lastPeriod[1]);
        expect(Math.abs(m.pivV - piv) / piv, `PIV of ${el.name}`).toBeLessThan(0.01);
      }
    }, 120_000);
  }
});
