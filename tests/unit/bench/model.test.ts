/**
 * The model side of the bench comparison, solved with the project's engine. External checks:
 * the load-curve slope and the ripple of a lightly loaded ideal ladder against the textbook
 * formulas of /work/shared/REFERENCES.md §1.1 — regulation ΔV = (I/(fC))·(2n³/3 + n²/2 − n/6)
 * as given by J. Lux, "Cockroft Walton Voltage Multipliers" [S1], "Various Voltage Multipliers"
 * (2008) [S2] and A. Munich, "CW multipliers" [S9] (and, from memory, Kuffel, Zaengl & Kuffel,
 * High Voltage Engineering: Fundamentals, 2nd ed. 2000, §2.2.2; Naidu & Kamaraju §6.1.3), and
 * ripple p-p δV = (I/(fC))·n(n+1)/2 [S1][S2].
 */
import { describe, expect, it } from 'vitest';
import { designDocumentSchema, halfWaveStarter, type DesignDocument } from '@/lib/circuit';
import { compareWithModel, modelLoadCurve, solveOutput, withLoadCurrent } from '@/lib/bench/model';
import { fitSlope, PeriodicWave } from '@/lib/bench/compare';
import type { BenchPoint } from '@/lib/bench/parse';

const f = 50_000;
const C = 10e-9;
const n = 4;
/** A near-ideal diode (IS 1 pA, N 1, no series resistance): forward drop ≈ 0.6 V against 1 kV stages. */
const IDEAL = { model: { isA: 1e-12, n: 1, rsOhm: 0 } };
const ideal: DesignDocument = designDocumentSchema.parse(halfWaveStarter(n, { amplitudeV: 1000, frequencyHz: f, capacitanceF: C, diode: IDEAL, loadCurrentA: 0 }));

describe('load curve of a lightly loaded ideal ladder against the textbook regulation', () => {
  it('has the slope (I/(fC))·(2n³/3 + n²/2 − n/6) per ampere within 5 %', () => {
    // 0.2…1 mA: u = I/(fC) ≤ 2 V against 2nVp = 8 kV, the textbook's small-ripple regime
    const currents = [0.2e-3, 0.4e-3, 0.6e-3, 0.8e-3, 1e-3];
    const r = modelLoadCurve(ideal, currents);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const slopeOhm = -(fitSlope(r.curve) as number);
    const textbookOhm = (1 / (f * C)) * ((2 * n ** 3) / 3 + n ** 2 / 2 - n / 6); // 100 kΩ for n = 4
    expect(textbookOhm).toBeCloseTo(100_000, 6);
    // measured here: 103.1 kΩ (+3.1 %). The textbook's −n/6 term is approximate: the exact crest
    // model of REFERENCES §1.3 (deriv) has +n/3, 104 kΩ; the solve sits between the two.
    expect(Math.abs(slopeOhm / textbookOhm - 1)).toBeLessThan(0.05);
    // and the curve is straight (a linear drop) in this regime: each point within 0.1 V of the line
    const s = fitSlope(r.curve) as number;
    const mx = currents.reduce((a, b) => a + b, 0) / currents.length;
    const my = r.curve.reduce((a, p) => a + p.y, 0) / r.curve.length;
    for (const p of r.curve) expect(Math.abs(p.y - (my + s * (p.x - mx)))).toBeLessThan(0.1);
  });

  it('has the p-p ripple (I/(fC))·n(n+1)/2 within 2 % at 1 mA', () => {
    const loaded = withLoadCurrent(ideal, 1e-3);
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    const out = solveOutput(loaded.document, 20_000, 400);
    expect(out.ok).toBe(true);
    if (!out.ok || !out.wave) return;
    const pp = Math.max(...out.wave.v) - Math.min(...out.wave.v);
    const textbook = (1e-3 / (f * C)) * ((n * (n + 1)) / 2); // 20 V
    expect(Math.abs(pp / textbook - 1)).toBeLessThan(0.02);
  });
});

describe('comparing the model with measurements made from the model itself', () => {
  it('load curve: zero error at every point, solved at each measured current', () => {
    const currents = [0, 0.25e-3, 0.5e-3, 1e-3];
    const r = modelLoadCurve(ideal, currents);
    if (!r.ok) throw new Error(r.reason);
    const points: BenchPoint[] = r.curve.map((p, k) => ({ line: k + 2, x: p.x, y: p.y }));
    const c = compareWithModel(ideal, 'loadCurve', points);
    expect(c.ok).toBe(true);
    if (!c.ok || c.comparison.kind !== 'loadCurve') return;
    expect(c.comparison.exact).toBe(true);
    expect(c.comparison.summary.maxAbsErrorV).toBeLessThan(1e-9);
    // a measurement 2 % low reads −2 % at every point
    const low = compareWithModel(ideal, 'loadCurve', points.map((p) => ({ ...p, y: 0.98 * p.y })));
    if (!low.ok || low.comparison.kind !== 'loadCurve') throw new Error('no comparison');
    for (const p of low.comparison.points) expect(p.errorPct).toBeCloseTo(-2, 6);
  });

  it('ripple: ~0 error for the model waveform captured at another rate and phase', () => {
    const loaded = withLoadCurrent(ideal, 1e-3);
    if (!loaded.ok) throw new Error(loaded.reason);
    const out = solveOutput(loaded.document, 20_000, 400);
    if (!out.ok || !out.wave) throw new Error('no waveform');
    const wave = new PeriodicWave(out.wave, out.periodS);
    // 2.6 periods at 333 samples a period, starting 0.3 T into the model's period, through a probe with 50 V offset
    const points: BenchPoint[] = Array.from({ length: 866 }, (_, k) => {
      const t = (k * out.periodS) / 333;
      return { line: k + 3, x: t, y: wave.at(t + 0.3 * out.periodS) + 50 };
    });
    const c = compareWithModel(loaded.document, 'ripple', points);
    expect(c.ok).toBe(true);
    if (!c.ok || c.comparison.kind !== 'ripple') return;
    const s = c.comparison.summary;
    expect(s.rmsErrorV).toBeLessThan(0.005 * s.modelPpV);
    // 333 samples a period straddle the sharp recharge crest: the capture's p-p reads up to ~1.3 % low
    expect(Math.abs(s.ppErrorPct as number)).toBeLessThan(2);
    expect(s.measuredMeanV - s.modelMeanV).toBeCloseTo(50, 0);
  });
});

describe('failures give reasons, not throws', () => {
  it('no load block, two load blocks, no time left', () => {
    const noLoad = { ...ideal, blocks: ideal.blocks.filter((b) => b.kind !== 'load'), wires: ideal.wires.filter((w) => w.source !== 'load' && w.target !== 'load') };
    expect(modelLoadCurve(noLoad, [1e-4])).toEqual({ ok: false, reason: expect.stringMatching(/no load block/) });
    const load = ideal.blocks.find((b) => b.kind === 'load')!;
    const twoLoads = { ...ideal, blocks: [...ideal.blocks, { ...load, id: 'load2' }] };
    expect(modelLoadCurve(twoLoads, [1e-4])).toEqual({ ok: false, reason: expect.stringMatching(/2 load blocks/) });
    expect(modelLoadCurve(ideal, [1e-4], 0)).toEqual({ ok: false, reason: expect.stringMatching(/at 100 µA: the time budget .* ran out/) });
    expect(compareWithModel(ideal, 'ripple', [{ line: 2, x: 0, y: 1 }])).toEqual({ ok: false, reason: expect.stringMatching(/fewer than 2/) });
  });
});
