import { describe, expect, it } from 'vitest';
import { bestShift, compareLoadCurve, compareRipple, fitSlope, interpolate, MAX_EXACT_LOAD_POINTS, modelCurrents, PeriodicWave, SAMPLED_LOAD_POINTS } from '@/lib/bench/compare';
import type { BenchPoint } from '@/lib/bench/parse';

/** A made-up regulation curve: 12 kV at no load, 50 kΩ source resistance (linear). */
const linear = (i: number) => 12_000 - 50_000 * i;
const pts = (xs: number[], f: (x: number) => number): BenchPoint[] => xs.map((x, k) => ({ line: k + 2, x, y: f(x) }));

describe('load curve comparison', () => {
  const currents = [0, 1e-4, 2e-4, 3e-4];
  const model = currents.map((x) => ({ x, y: linear(x) }));

  it('gives zero error for measurements equal to the model', () => {
    const c = compareLoadCurve(pts(currents, linear), model, true);
    expect(c.summary.rmsErrorV).toBe(0);
    expect(c.summary.maxAbsErrorPct).toBe(0);
    expect(c.points.map((p) => p.errorV)).toEqual([0, 0, 0, 0]);
  });

  it('gives the offset and the scale back as the error', () => {
    const off = compareLoadCurve(pts(currents, (x) => linear(x) - 30), model, true);
    for (const p of off.points) {
      expect(p.errorV).toBeCloseTo(-30, 9);
      expect(p.errorPct).toBeCloseTo((-30 / linear(p.x)) * 100, 9);
    }
    expect(off.summary.rmsErrorV).toBeCloseTo(30, 9);
    const scaled = compareLoadCurve(pts(currents, (x) => 0.98 * linear(x)), model, true);
    for (const p of scaled.points) expect(p.errorPct).toBeCloseTo(-2, 9);
    expect(scaled.summary.meanErrorPct).toBeCloseTo(-2, 9);
    // the regulation slopes: 50 kΩ for the model, 0.98 × 50 kΩ for the scaled measurement
    expect(scaled.summary.modelSlopeOhm).toBeCloseTo(50_000, 6);
    expect(scaled.summary.measuredSlopeOhm).toBeCloseTo(49_000, 6);
  });

  it('compares magnitudes, so a negative ladder logged positive still matches', () => {
    const negModel = model.map((p) => ({ x: p.x, y: -p.y }));
    const c = compareLoadCurve(pts(currents, linear), negModel, true);
    expect(c.summary.maxAbsErrorV).toBe(0);
  });

  it('solves every distinct current up to the cap, else samples the range and interpolates', () => {
    const few = modelCurrents(pts([3e-4, 1e-4, 1e-4, 0], linear));
    expect(few).toEqual({ currents: [0, 1e-4, 3e-4], exact: true });
    const many = Array.from({ length: MAX_EXACT_LOAD_POINTS + 10 }, (_, k) => k * 1e-5);
    const m = modelCurrents(pts(many, linear));
    expect(m.exact).toBe(false);
    expect(m.currents).toHaveLength(SAMPLED_LOAD_POINTS);
    expect(m.currents[0]).toBe(0);
    expect(m.currents[SAMPLED_LOAD_POINTS - 1]).toBeCloseTo(many[many.length - 1], 15);
    // linear interpolation is exact on a straight line
    const sampled = compareLoadCurve(pts(many, linear), m.currents.map((x) => ({ x, y: linear(x) })), false);
    expect(sampled.summary.maxAbsErrorV).toBeLessThan(1e-9);
  });

  it('interpolates linearly and holds the ends', () => {
    const c = [{ x: 0, y: 10 }, { x: 2, y: 6 }];
    expect(interpolate(c, 1)).toBe(8);
    expect(interpolate(c, -1)).toBe(10);
    expect(interpolate(c, 5)).toBe(6);
    expect(fitSlope([{ x: 0, y: 1 }, { x: 1, y: 3 }, { x: 2, y: 5 }])).toBeCloseTo(2, 12);
    expect(fitSlope([{ x: 1, y: 1 }, { x: 1, y: 3 }])).toBeNull();
  });
});

describe('ripple comparison', () => {
  const T = 20e-6;
  // a ladder-like ripple: a linear sag between crests and a fast recharge (not symmetric, so the phase matters)
  const shape = (t: number) => {
    const u = (((t % T) + T) % T) / T;
    return u < 0.85 ? 1 - u / 0.85 : (u - 0.85) / 0.15;
  };
  const modelWave = { t: Array.from({ length: 401 }, (_, k) => (T * k) / 400), v: [] as number[] };
  modelWave.v = modelWave.t.map((t) => 12_000 + 3 * shape(t));
  const wave = new PeriodicWave(modelWave, T);

  function capture(shift: number, scale: number, dc: number, n = 700, periods = 3.4): BenchPoint[] {
    return Array.from({ length: n }, (_, k) => {
      const t = 5e-3 + (periods * T * k) / (n - 1);
      return { line: k + 2, x: t, y: dc + scale * (wave.at(t - 5e-3 + shift) - wave.mean()) };
    });
  }

  it('takes the mean and the p-p of the model waveform', () => {
    // the mean of the sawtooth is 12 000 + 3/2 (a triangle of height 3 averages 1.5)
    expect(wave.mean()).toBeCloseTo(12_001.5, 6);
    expect(wave.peakToPeak()).toBeCloseTo(3, 9);
  });

  it('gives ~0 error for a capture of the model itself, whatever its phase and DC level', () => {
    const shift = 0.37 * T;
    const c = compareRipple(capture(shift, 1, 11_800), modelWave, T);
    expect(c.summary.rmsErrorV).toBeLessThan(1e-3 * 3);
    expect(Math.abs(c.shiftS - shift)).toBeLessThan(T / 1000);
    // ~206 samples a period miss the sharp crest by up to one sample's sag (3 V / (0.85 · 206) ≈ 0.017 V)
    expect(Math.abs(c.summary.measuredPpV - 3)).toBeLessThan(0.02);
    expect(c.summary.modelPpV).toBeCloseTo(3, 9);
    expect(c.summary.measuredMeanV).toBeCloseTo(11_800, 1);
    expect(c.summary.periods).toBeCloseTo(3.4, 9);
  });

  it('gives a 10 % larger ripple as +10 % p-p and an RMS error of 10 % of the RMS ripple', () => {
    const c = compareRipple(capture(0.1 * T, 1.1, 12_000), modelWave, T);
    expect(c.summary.ppErrorPct).toBeCloseTo(10, 0);
    // RMS of the AC sawtooth is p-p/√12; the error is 0.1 of it
    expect(c.summary.rmsErrorV).toBeCloseTo((0.1 * 3) / Math.sqrt(12), 2);
  });

  it('finds the shift on the grid and between grid points', () => {
    const times = Array.from({ length: 500 }, (_, k) => (2 * T * k) / 499);
    for (const phi of [0, T / 360, 0.5001 * T, 0.9 * T]) {
      const ac = times.map((t) => wave.at(t + phi) - wave.mean());
      const got = bestShift(times, ac, wave, wave.mean());
      const d = Math.min(Math.abs(got - phi), T - Math.abs(got - phi));
      expect(d).toBeLessThan(T * 1e-4);
    }
  });
});
