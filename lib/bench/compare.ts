/**
 * Model against measurement (pure). Two comparisons:
 *
 * Load curve. The model is solved at load currents chosen by {@link modelCurrents}: every
 * distinct measured current when there are at most {@link MAX_EXACT_LOAD_POINTS} of them, else
 * {@link SAMPLED_LOAD_POINTS} currents evenly spread from the smallest to the largest measured
 * current, the model then read between them by linear interpolation. Voltages are compared as
 * magnitudes (a negative ladder may be logged with either sign). Per point: error = measured −
 * model (V) and that error as a per cent of the model's value. The summary also fits a straight
 * line V(I) to each side (least squares) and gives its slope, the supply's regulation in V/A (Ω).
 *
 * Ripple. The capture and the model's one-period output waveform are compared as AC: each side's
 * time-average is removed (the capture's over the largest whole number of model periods it holds,
 * all of it when it is shorter than one period). The capture's clock has no relation to the
 * model's period start, so the model is shifted by the φ in [0, T) that minimises the RMS error:
 * a grid of {@link PHASE_GRID} shifts over one period, then a golden-section search in the grid
 * cells either side of the best one (the error is smooth in φ there). The capture is assumed to be
 * taken at the model's drive frequency. Per point: error = measured − model (V), also as a per
 * cent of the model's peak-to-peak ripple. Both peak-to-peak ripples are reported (noise on the
 * capture raises its p-p; filter or average on the scope).
 */
import type { BenchPoint } from './parse';

/** At most this many distinct measured currents are solved one by one. */
export const MAX_EXACT_LOAD_POINTS = 50;
/** Above that, the model is solved at this many currents across the measured range. */
export const SAMPLED_LOAD_POINTS = 25;
/** Phase shifts tried over one period before the fine search. */
export const PHASE_GRID = 360;
/** Points of the model curve drawn under a ripple capture. */
const RIPPLE_CURVE_POINTS = 600;

export interface CurvePoint {
  x: number;
  y: number;
}

export interface PointError {
  line: number;
  /** Load current (A) or time from the capture's first row (s). */
  x: number;
  /** Measured (V; magnitude for a load curve, AC part for ripple). */
  measured: number;
  /** Model at the same x (V). */
  model: number;
  /** measured − model (V). */
  errorV: number;
  /** errorV as a per cent of |model| (load curve) or of the model's p-p ripple (ripple); null when that is 0. */
  errorPct: number | null;
}

export interface LoadCurveComparison {
  kind: 'loadCurve';
  /** The solved model points (A, V magnitude), by current. */
  model: CurvePoint[];
  /** True when the model was solved at every measured current, false when sampled and interpolated. */
  exact: boolean;
  points: PointError[];
  summary: {
    rmsErrorV: number;
    maxAbsErrorV: number;
    maxAbsErrorPct: number | null;
    meanErrorPct: number | null;
    /** −dV/dI of a least-squares line through the measured points (Ω); null with one distinct current. */
    measuredSlopeOhm: number | null;
    /** The same for the model points. */
    modelSlopeOhm: number | null;
  };
}

export interface RippleComparison {
  kind: 'ripple';
  periodS: number;
  /** The shift φ applied to the model (s, in [0, T)). */
  shiftS: number;
  /** The model's AC waveform over the capture's span, shifted (s from the first row, V). */
  model: CurvePoint[];
  points: PointError[];
  summary: {
    measuredPpV: number;
    modelPpV: number;
    /** measured − model p-p (V). */
    ppErrorV: number;
    ppErrorPct: number | null;
    rmsErrorV: number;
    maxAbsErrorV: number;
    measuredMeanV: number;
    modelMeanV: number;
    /** Capture length in model periods. */
    periods: number;
  };
}

export type Comparison = LoadCurveComparison | RippleComparison;

/** The currents to solve the model at for these measured points (see the file comment). */
export function modelCurrents(points: readonly BenchPoint[]): { currents: number[]; exact: boolean } {
  const distinct = [...new Set(points.map((p) => p.x))].sort((a, b) => a - b);
  if (distinct.length <= MAX_EXACT_LOAD_POINTS) return { currents: distinct, exact: true };
  const lo = distinct[0];
  const hi = distinct[distinct.length - 1];
  const currents = Array.from({ length: SAMPLED_LOAD_POINTS }, (_, k) => lo + ((hi - lo) * k) / (SAMPLED_LOAD_POINTS - 1));
  return { currents, exact: false };
}

/** Linear interpolation in a curve sorted by x; held flat outside its range. */
export function interpolate(curve: readonly CurvePoint[], x: number): number {
  if (curve.length === 0) return NaN;
  if (x <= curve[0].x) return curve[0].y;
  const last = curve[curve.length - 1];
  if (x >= last.x) return last.y;
  let lo = 0;
  let hi = curve.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (curve[mid].x <= x) lo = mid;
    else hi = mid;
  }
  const a = curve[lo];
  const b = curve[hi];
  return b.x === a.x ? a.y : a.y + ((b.y - a.y) * (x - a.x)) / (b.x - a.x);
}

/** Slope of the least-squares line through the points; null when all x are equal. */
export function fitSlope(points: readonly CurvePoint[]): number | null {
  const n = points.length;
  if (n < 2) return null;
  const mx = points.reduce((s, p) => s + p.x, 0) / n;
  const my = points.reduce((s, p) => s + p.y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.x - mx) ** 2;
    sxy += (p.x - mx) * (p.y - my);
  }
  return sxx > 0 ? sxy / sxx : null;
}

function rms(values: readonly number[]): number {
  return values.length === 0 ? 0 : Math.sqrt(values.reduce((s, v) => s + v * v, 0) / values.length);
}

/** Compare measured load-curve points with the model solved at `model` (A, V; any sign, any order). */
export function compareLoadCurve(measured: readonly BenchPoint[], model: readonly CurvePoint[], exact: boolean): LoadCurveComparison {
  const curve = model.map((p) => ({ x: p.x, y: Math.abs(p.y) })).sort((a, b) => a.x - b.x);
  const points: PointError[] = measured.map((p) => {
    const m = interpolate(curve, p.x);
    const v = Math.abs(p.y);
    const errorV = v - m;
    return { line: p.line, x: p.x, measured: v, model: m, errorV, errorPct: m !== 0 ? (100 * errorV) / m : null };
  });
  const pcts = points.map((p) => p.errorPct).filter((v): v is number => v !== null);
  const ms = fitSlope(points.map((p) => ({ x: p.x, y: p.measured })));
  const mm = fitSlope(curve);
  return {
    kind: 'loadCurve',
    model: curve,
    exact,
    points,
    summary: {
      rmsErrorV: rms(points.map((p) => p.errorV)),
      maxAbsErrorV: Math.max(...points.map((p) => Math.abs(p.errorV))),
      maxAbsErrorPct: pcts.length ? Math.max(...pcts.map(Math.abs)) : null,
      meanErrorPct: pcts.length ? pcts.reduce((s, v) => s + v, 0) / pcts.length : null,
      measuredSlopeOhm: ms === null ? null : -ms,
      modelSlopeOhm: mm === null ? null : -mm,
    },
  };
}

/** A periodic waveform given by samples over one period, read at any time. */
export class PeriodicWave {
  readonly periodS: number;
  private readonly t: number[];
  private readonly v: number[];

  constructor(wave: { t: readonly number[]; v: readonly number[] }, periodS: number) {
    if (wave.t.length < 2 || wave.t.length !== wave.v.length) throw new Error('a waveform needs at least 2 samples');
    if (!(periodS > 0)) throw new Error('the period must be positive');
    const t0 = wave.t[0];
    const t: number[] = [];
    const v: number[] = [];
    wave.t.forEach((ti, i) => {
      const rel = ti - t0;
      if (rel < periodS * (1 - 1e-9)) {
        t.push(rel);
        v.push(wave.v[i]);
      }
    });
    // close the period: the value at T is the value at 0
    t.push(periodS);
    v.push(v[0]);
    this.t = t;
    this.v = v;
    this.periodS = periodS;
  }

  /** The value at time `time` (any real; taken modulo the period). */
  at(time: number): number {
    const T = this.periodS;
    let tau = time % T;
    if (tau < 0) tau += T;
    const t = this.t;
    let lo = 0;
    let hi = t.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (t[mid] <= tau) lo = mid;
      else hi = mid;
    }
    const w = t[hi] > t[lo] ? (tau - t[lo]) / (t[hi] - t[lo]) : 0;
    return this.v[lo] + (this.v[hi] - this.v[lo]) * w;
  }

  /** Time-average over one period (trapezoids). */
  mean(): number {
    let s = 0;
    for (let i = 1; i < this.t.length; i += 1) s += ((this.v[i] + this.v[i - 1]) / 2) * (this.t[i] - this.t[i - 1]);
    return s / this.periodS;
  }

  /** Peak-to-peak of the samples. */
  peakToPeak(): number {
    return Math.max(...this.v) - Math.min(...this.v);
  }
}

/** Time-average of sampled points (trapezoids), over the first `spanS` seconds after the first. */
function timeAverage(points: readonly BenchPoint[], spanS: number): number {
  const t0 = points[0].x;
  let area = 0;
  let width = 0;
  for (let i = 1; i < points.length; i += 1) {
    const a = points[i - 1];
    const b = points[i];
    if (b.x - t0 > spanS * (1 + 1e-9)) break;
    area += ((a.y + b.y) / 2) * (b.x - a.x);
    width += b.x - a.x;
  }
  return width > 0 ? area / width : points.reduce((s, p) => s + p.y, 0) / points.length;
}

/** Sum of squared errors of `ac` (t from the first row, V) against the model shifted by φ. */
function sse(times: readonly number[], ac: readonly number[], wave: PeriodicWave, modelMean: number, phi: number): number {
  let s = 0;
  for (let i = 0; i < times.length; i += 1) {
    const e = ac[i] - (wave.at(times[i] + phi) - modelMean);
    s += e * e;
  }
  return s;
}

/** The shift φ in [0, T) minimising the RMS error (see the file comment). */
export function bestShift(times: readonly number[], ac: readonly number[], wave: PeriodicWave, modelMean: number): number {
  const T = wave.periodS;
  // the coarse grid on at most 4000 evenly picked points, the fine search on all of them
  const stride = Math.max(1, Math.ceil(times.length / 4000));
  const ct = times.filter((_, i) => i % stride === 0);
  const ca = ac.filter((_, i) => i % stride === 0);
  let best = 0;
  let bestErr = Infinity;
  for (let k = 0; k < PHASE_GRID; k += 1) {
    const phi = (T * k) / PHASE_GRID;
    const e = sse(ct, ca, wave, modelMean, phi);
    if (e < bestErr) {
      bestErr = e;
      best = phi;
    }
  }
  const g = (Math.sqrt(5) - 1) / 2;
  let a = best - T / PHASE_GRID;
  let b = best + T / PHASE_GRID;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = sse(times, ac, wave, modelMean, c);
  let fd = sse(times, ac, wave, modelMean, d);
  for (let it = 0; it < 40; it += 1) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = sse(times, ac, wave, modelMean, c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = sse(times, ac, wave, modelMean, d);
    }
  }
  let phi = (a + b) / 2;
  if (sse(times, ac, wave, modelMean, best) < sse(times, ac, wave, modelMean, phi)) phi = best;
  return ((phi % T) + T) % T;
}

/** Compare a ripple capture (s, V) with the model's one-period output waveform (see the file comment). */
export function compareRipple(measured: readonly BenchPoint[], modelWave: { t: readonly number[]; v: readonly number[] }, periodS: number): RippleComparison {
  const wave = new PeriodicWave(modelWave, periodS);
  const modelMean = wave.mean();
  const t0 = measured[0].x;
  const span = measured[measured.length - 1].x - t0;
  const whole = Math.floor(span / periodS + 1e-9);
  const measuredMean = timeAverage(measured, whole >= 1 ? whole * periodS : span);
  const times = measured.map((p) => p.x - t0);
  const ac = measured.map((p) => p.y - measuredMean);
  const shiftS = bestShift(times, ac, wave, modelMean);
  const modelPp = wave.peakToPeak();
  const points: PointError[] = measured.map((p, i) => {
    const m = wave.at(times[i] + shiftS) - modelMean;
    const errorV = ac[i] - m;
    return { line: p.line, x: times[i], measured: ac[i], model: m, errorV, errorPct: modelPp > 0 ? (100 * errorV) / modelPp : null };
  });
  const n = Math.min(RIPPLE_CURVE_POINTS, Math.max(50, Math.ceil((span / periodS) * 100)));
  const model = Array.from({ length: n }, (_, k) => {
    const x = (span * k) / (n - 1);
    return { x, y: wave.at(x + shiftS) - modelMean };
  });
  const measuredPp = Math.max(...ac) - Math.min(...ac);
  return {
    kind: 'ripple',
    periodS,
    shiftS,
    model,
    points,
    summary: {
      measuredPpV: measuredPp,
      modelPpV: modelPp,
      ppErrorV: measuredPp - modelPp,
      ppErrorPct: modelPp > 0 ? (100 * (measuredPp - modelPp)) / modelPp : null,
      rmsErrorV: rms(points.map((p) => p.errorV)),
      maxAbsErrorV: Math.max(...points.map((p) => Math.abs(p.errorV))),
      measuredMeanV: measuredMean,
      modelMeanV: modelMean,
      periods: span / periodS,
    },
  };
}
