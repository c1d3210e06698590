// Engine against ngspice (Debian package, `ngspice -b`) over a matrix of generated ladders, with
// the same SPICE level-1 diode model in both: full-wave, bipolar, negative polarity, a 12-stage
// half-wave, an inverter-frequency ladder, a source resistance, stray capacitance, and the
// warm-up from power-on. Tolerances from the brief: output mean 0.2 %, every node mean 0.5 % of
// the output, ripple p-p 3 %, diode PIV 1 %, t90 5 %.
//
// Two ways to get ngspice's steady state:
// - Settled reference (small ladders): a plain transient from the ideal no-load charge state for
//   12·n² + 40 periods at T/400 (REFERENCES §6: loaded settling takes a few times 3.4·n² cycles),
//   doubled until the last two periods' output means agree to 1e-5 (tests/fixtures/ngspice.ts).
// - Hold from the engine's state (larger ladders, where that costs thousands of periods): every
//   capacitor starts at the voltage the engine's periodic solution has at t = 0 (`IC=`, `uic`)
//   and ngspice runs M periods. Once the fast modes have died, what is left of the distance to
//   ngspice's own periodic state decays like e^(−k/τ), τ the slowest settling time constant in
//   periods, so the drift per period δ (last period's mean − the one before) and the remaining
//   distance d are tied by d ≈ δ·τ. The engine's distance to ngspice's steady state is then at
//   most |engine − ngspice after M periods| + |δ|·τ, and that sum is what is asserted, per node.
//   τ comes from REFERENCES §6's warm-up scaling (N90 ≈ 3.4·n², N99 ≈ 7.1·n² half-wave, 1.4·n² and
//   2.8·n² full-wave, so τ = (N99 − N90)/ln 10; measured: 25 periods = 1.57·n² at n = 4), or, where
//   a source resistance slows settling, the larger of that and the same ratio from the engine's
//   own warm-up; the allowance uses twice it to stay on the safe side. M = 4·τ(§6) periods: by then the
//   ripple, which carries the charge the capacitors still take each cycle, has settled with the
//   mean (at n = 4, held for only 1.6·τ, ngspice's ripple is still 1 % off).
// The same allowance |δ|·τ is added for the settled references; it is negligible there.
import { beforeAll, describe, expect, it } from 'vitest';
import { generateLadder, GENERIC_RECTIFIER, ladderOutputs, type LadderOptions } from '@/lib/circuit/netlist/generate';
import { solveNetlist } from '@/lib/circuit/analysis/solve';
import type { Netlist } from '@/lib/circuit/netlist/types';
import { crossingCycles, ensureNgspice, maxDifference, ngspicePowerOn, ngspiceReference, withNodeIc, type NgspiceReference } from '../../fixtures/ngspice';
import type { Solved } from './helpers';

let available = false;
beforeAll(() => {
  available = ensureNgspice();
}, 600_000);

const STEPS_PER_PERIOD = 400;

/** 1 kV peak, C·f = 5e-4 F·Hz, 1 mA, Rs 0.1 Ω, generic rectifier. */
function ladder(kind: LadderOptions['kind'], n: number, f: number, extra: Partial<LadderOptions> = {}): LadderOptions {
  return { kind, stages: n, peakV: 1000, frequencyHz: f, capacitanceF: 5e-4 / f, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-3, sourceResistanceOhm: 0.1, ...extra };
}

/** Settling time constant (periods) from REFERENCES §6's scaling, (N99 − N90)/ln 10. */
function tauSection6(o: LadderOptions): number {
  const n = o.stages;
  return ((o.kind === 'full-wave' ? 2.8 - 1.4 : 7.1 - 3.4) * n * n) / Math.LN10;
}

/** Settling time constant (periods) from the engine's warm-up, (cycles99 − cycles90)/ln 10. */
function tauFromWarmup(r: Solved): number {
  const w = r.warmup;
  if (!w || w.cycles90 === null || w.cycles99 === null) throw new Error('warm-up did not reach 99 %');
  return (w.cycles99 - w.cycles90) / Math.LN10;
}

function solve(nl: Netlist, warmup = false): Solved {
  const r = solveNetlist(nl, { waveformPoints: 2, warmup, budgetMs: 60_000 });
  if (!r.ok) throw new Error(`engine: ${r.reason}`);
  return r;
}

const userNodes = (r: Solved) => Object.keys(r.nodes).filter((k) => !k.includes('#'));

/** Asserts the brief's steady-state tolerances, with ngspice's remaining distance |δ|·τ added. */
function expectAgreement(nl: Netlist, ours: Solved, ng: NgspiceReference, out: string, tau: number): void {
  const outMean = ng.nodes[out].mean;
  const tail = (node: string) => Math.abs(ng.nodes[node].mean - ng.previousMeans[node]) * tau;
  // The argument needs ngspice close to its own steady state; 0.05 % of the output is a quarter
  // of the tightest tolerance.
  expect(tail(out) / Math.abs(outMean), 'ngspice remaining distance |δ|·τ').toBeLessThan(5e-4);
  expect((Math.abs(ours.nodes[out].mean - outMean) + tail(out)) / Math.abs(outMean), 'output mean').toBeLessThan(2e-3);
  for (const node of Object.keys(ng.nodes)) {
    expect((Math.abs(ours.nodes[node].mean - ng.nodes[node].mean) + tail(node)) / Math.abs(outMean), `mean of ${node}`).toBeLessThan(5e-3);
  }
  expect(Math.abs(ours.nodes[out].ripple - ng.nodes[out].ripple) / ng.nodes[out].ripple, 'output ripple').toBeLessThan(0.03);
  for (const el of nl.elements) {
    if (el.kind !== 'D') continue;
    const m = ours.parts[el.name];
    if (m?.kind !== 'D') throw new Error(`no measure for ${el.name}`);
    const piv = maxDifference(ng.wave, el.nodes[1], el.nodes[0], ng.lastPeriod[0], ng.lastPeriod[1]);
    expect(Math.abs(m.pivV - piv) / piv, `PIV of ${el.name}`).toBeLessThan(0.01);
  }
}

/**
 * Settled reference from the ideal no-load state, compared node by node; ngspice starts with
 * `periodsPerN2`·n² + 40 periods.
 */
function checkSettled(o: LadderOptions, { tau, periodsPerN2 = 12 }: { tau?: (r: Solved) => number; periodsPerN2?: number } = {}): void {
  expect(available, 'ngspice could not be installed').toBe(true);
  const nl = generateLadder(o);
  const ours = solve(nl, tau !== undefined);
  const out = ladderOutputs(o)[0].node;
  const first = periodsPerN2 * o.stages * o.stages + 40;
  const ng = ngspiceReference(nl, { frequencyHz: o.frequencyHz, nodes: userNodes(ours), outputNode: out, periods: first, settleTol: 1e-5, maxPeriods: 4 * first, stepsPerPeriod: STEPS_PER_PERIOD, start: 'no-load' });
  expect(ng.settled, `ngspice settle ${ng.settle} after ${ng.periods} periods`).toBe(true);
  expectAgreement(nl, ours, ng, out, 2 * Math.max(tauSection6(o), tau ? tau(ours) : 0));
}

/** ngspice started from the engine's periodic state and held for M = 4·τ(§6) periods. */
function checkHold(o: LadderOptions): void {
  expect(available, 'ngspice could not be installed').toBe(true);
  const nl = generateLadder(o);
  const ours = solve(nl);
  const out = ladderOutputs(o)[0].node;
  const v0: Record<string, number> = {};
  for (const [node, m] of Object.entries(ours.nodes)) {
    if (!m.waveform) throw new Error('engine returned no waveform');
    v0[node] = m.waveform.v[0];
  }
  const periods = Math.ceil(4 * tauSection6(o));
  const ng = ngspiceReference(withNodeIc(nl, v0), { frequencyHz: o.frequencyHz, nodes: userNodes(ours), outputNode: out, periods, settleTol: Infinity, maxPeriods: periods, stepsPerPeriod: STEPS_PER_PERIOD, start: 'netlist' });
  expectAgreement(nl, ours, ng, out, 2 * tauSection6(o));
}

describe('steady state against ngspice, settled from the no-load state', () => {
  it('full-wave n = 4 at 50 Hz', () => checkSettled(ladder('full-wave', 4, 50)), 60_000);
  it('bipolar n = 4 at 1 kHz', () => checkSettled(ladder('bipolar', 4, 1000)), 60_000);
  it('negative half-wave n = 4 at 40 kHz', () => checkSettled(ladder('half-wave', 4, 40_000, { polarity: 'negative' })), 60_000);
  // 50 Ω is about a sixth of the 318 Ω stage-capacitor reactance; it slows settling, so τ also
  // comes from the engine's warm-up.
  it('half-wave n = 4 at 50 Hz behind a 50 Ω source', () => checkSettled(ladder('half-wave', 4, 50, { sourceResistanceOhm: 50 }), { tau: tauFromWarmup }), 60_000);
  // Stray capacitance to ground of 1 % (pumping column) and 0.5 % (smoothing column) of the stage
  // C. ngspice's period-to-period change decays more slowly here (3.7e-6 after 12·n² + 40
  // periods, 5e-7 after twice that, while the mean itself moves by only 5e-6 between the two), so
  // it gets twice the periods and the |δ|·τ allowance stays well inside its 0.05 % bound.
  it('half-wave n = 6 at 40 kHz with stray capacitance', () => checkSettled(ladder('half-wave', 6, 40_000, { strayPumpF: 1.25e-10, straySmoothF: 6.25e-11 }), { periodsPerN2: 24 }), 60_000);
});

describe('steady state against ngspice, held from the engine state', () => {
  it('half-wave n = 12 at 50 Hz', () => checkHold(ladder('half-wave', 12, 50)), 90_000);
  it('half-wave n = 8 at 40 kHz', () => checkHold(ladder('half-wave', 8, 40_000)), 60_000);
});

describe('warm-up from power-on against ngspice', () => {
  for (const o of [ladder('half-wave', 3, 50), ladder('full-wave', 3, 50)]) {
    it(`${o.kind} n = ${o.stages}: t90 within 5 %`, () => {
      expect(available, 'ngspice could not be installed').toBe(true);
      const nl = generateLadder(o);
      const r = solveNetlist(nl, { waveformPoints: 0, warmup: true });
      if (!r.ok) throw new Error(r.reason);
      const t90 = r.warmup?.t90;
      if (t90 === null || t90 === undefined) throw new Error('engine warm-up did not reach 90 %');
      const out = ladderOutputs(o)[0].node;
      // Long enough for ngspice's own final value: 12·n² + 40 periods, as for the settled references.
      const periods = 12 * o.stages * o.stages + 40;
      const on = ngspicePowerOn(nl, { frequencyHz: o.frequencyHz, outputNode: out, periods, stepsPerPeriod: STEPS_PER_PERIOD });
      const means = on.cycleMeans;
      const final = means[means.length - 1];
      expect(Math.abs(final - means[means.length - 2]) / Math.abs(final), 'ngspice settled').toBeLessThan(1e-5);
      const c90 = crossingCycles(means, final, 0.9);
      if (c90 === null) throw new Error('ngspice did not reach 90 %');
      expect(Math.abs(t90 - c90 / o.frequencyHz) / (c90 / o.frequencyHz), 't90').toBeLessThan(0.05);
    }, 60_000);
  }
});
