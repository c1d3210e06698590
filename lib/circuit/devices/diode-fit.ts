/**
 * Fitting the engine's diode model (Shockley junction with series resistance, the forward part
 * of lib/circuit/devices/diode.ts) to points read off a datasheet's forward I–V curve:
 *
 *   V = N·Vt·ln(I/IS + 1) + I·RS,   Vt = k·T/q at T = 300.15 K (SPICE's TNOM, 27 °C)
 *
 * (the Shockley diode equation with an ohmic series term; Sedra & Smith, Microelectronic
 * Circuits, the diode chapter, "from memory").
 *
 * - Two points fix IS and N with RS = 0. For I ≫ IS the curve is N·Vt·ln(I/IS), so
 *   N·Vt = (V2 − V1) / ln(I2/I1) and IS = I1 / exp(V1/(N·Vt)) in closed form; that start is then
 *   polished on the exact equation (the "+1") by Newton's method on one unknown.
 * - Three points fix IS, N and RS: Newton–Raphson on the three equations in (ln IS, N, RS) with
 *   the analytic Jacobian and a backtracking line search, started from the two-point fit of the
 *   two lowest currents. A fit that needs RS < 0 (the curve bends the wrong way for an ohmic
 *   series resistance: a misread point, or points from different temperatures) is refused with
 *   that reason rather than clamped.
 *
 * Pure engine code: runs in the browser, the worker and on the server.
 */
import { THERMAL_VOLTAGE_V } from './diode';

/** One point of a forward curve: current (A, > 0) and the voltage across the diode at it (V, > 0). */
export interface DiodeFitPoint {
  currentA: number;
  voltageV: number;
}

/** Fitted model parameters, named as in the document's diode model (`isA`, `n`, `rsOhm`). */
export interface DiodeFitModel {
  isA: number;
  n: number;
  rsOhm: number;
}

export type DiodeFitResult =
  | { ok: true; model: DiodeFitModel; /** model voltage − datasheet voltage at each point, in the order given (V). */ residualsV: number[] }
  | { ok: false; reason: string };

/** Forward voltage of the fitted model at `currentA` (V). */
export function diodeForwardVoltage(model: DiodeFitModel, currentA: number, vtV = THERMAL_VOLTAGE_V): number {
  return model.n * vtV * Math.log1p(currentA / model.isA) + currentA * model.rsOhm;
}

function checkPoints(points: readonly DiodeFitPoint[]): string | null {
  if (points.length !== 2 && points.length !== 3) return `give 2 or 3 points of the forward curve (got ${points.length})`;
  for (const [i, p] of points.entries()) {
    if (!Number.isFinite(p.currentA) || p.currentA <= 0) return `point ${i + 1}: the current must be a positive number`;
    if (!Number.isFinite(p.voltageV) || p.voltageV <= 0) return `point ${i + 1}: the voltage must be a positive number`;
  }
  const sorted = [...points].sort((a, b) => a.currentA - b.currentA);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i].currentA / sorted[i - 1].currentA < 1 + 1e-9) return 'two points have the same current; pick points at different currents';
    if (sorted[i].voltageV <= sorted[i - 1].voltageV) return 'the voltage must rise with the current; check the points';
  }
  return null;
}

/** N·Vt through two points of V = N·Vt·ln(I/IS + 1) exactly (RS = 0): Newton on x = N·Vt. */
function twoPointNvt(i1: number, v1: number, i2: number, v2: number): number | null {
  // closed form for I ≫ IS
  let x = (v2 - v1) / Math.log(i2 / i1);
  if (!(x > 0) || !Number.isFinite(x)) return null;
  // g(x) = ln(expm1(v2/x)) − ln(expm1(v1/x)) − ln(i2/i1) = 0
  const target = Math.log(i2 / i1);
  const lnExpm1 = (a: number) => (a > 30 ? a + Math.log1p(-Math.exp(-a)) : Math.log(Math.expm1(a)));
  const dLnExpm1 = (a: number) => (a > 30 ? 1 / -Math.expm1(-a) : Math.exp(a) / Math.expm1(a));
  for (let k = 0; k < 60; k++) {
    const a1 = v1 / x;
    const a2 = v2 / x;
    const g = lnExpm1(a2) - lnExpm1(a1) - target;
    // d/dx ln(expm1(v/x)) = −(v/x²)·e^{v/x}/expm1(v/x)
    const dg = (-a2 / x) * dLnExpm1(a2) + (a1 / x) * dLnExpm1(a1);
    if (!Number.isFinite(g) || !Number.isFinite(dg) || dg === 0) return null;
    let step = g / dg;
    if (x - step <= 0) step = x / 2;
    x -= step;
    if (Math.abs(step) <= 1e-15 * x) break;
  }
  return x > 0 && Number.isFinite(x) ? x : null;
}

function residuals(model: DiodeFitModel, points: readonly DiodeFitPoint[]): number[] {
  return points.map((p) => diodeForwardVoltage(model, p.currentA) - p.voltageV);
}

function fitTwo(points: readonly DiodeFitPoint[]): DiodeFitResult {
  const [a, b] = [...points].sort((p, q) => p.currentA - q.currentA);
  const x = twoPointNvt(a.currentA, a.voltageV, b.currentA, b.voltageV);
  if (x === null) return { ok: false, reason: 'these two points do not fit the Shockley equation; check them' };
  const isA = a.currentA / Math.expm1(a.voltageV / x);
  const model = { isA, n: x / THERMAL_VOLTAGE_V, rsOhm: 0 };
  if (!(isA > 0) || !Number.isFinite(isA)) return { ok: false, reason: 'the fitted saturation current IS is out of range; check the points' };
  return { ok: true, model, residualsV: residuals(model, points) };
}

/** Solve the 3×3 system A·x = b (Gaussian elimination with partial pivoting); null when singular. */
function solve3(A: number[][], b: number[]): number[] | null {
  const m = A.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < 3; c++) {
    let p = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    if (Math.abs(m[p][c]) < 1e-300) return null;
    [m[c], m[p]] = [m[p], m[c]];
    for (let r = c + 1; r < 3; r++) {
      const k = m[r][c] / m[c][c];
      for (let j = c; j < 4; j++) m[r][j] -= k * m[c][j];
    }
  }
  const x = [0, 0, 0];
  for (let r = 2; r >= 0; r--) {
    let s = m[r][3];
    for (let j = r + 1; j < 3; j++) s -= m[r][j] * x[j];
    x[r] = s / m[r][r];
  }
  return x.every(Number.isFinite) ? x : null;
}

function fitThree(points: readonly DiodeFitPoint[]): DiodeFitResult {
  const sorted = [...points].sort((p, q) => p.currentA - q.currentA);
  const start = fitTwo(sorted.slice(0, 2));
  if (!start.ok) return start;
  const vt = THERMAL_VOLTAGE_V;
  const top = sorted[2];
  // state: [ln IS, N, RS]
  let s = [Math.log(start.model.isA), start.model.n, Math.max(0, (top.voltageV - diodeForwardVoltage(start.model, top.currentA)) / top.currentA)];
  const F = (x: number[]) => sorted.map((p) => x[1] * vt * Math.log1p(p.currentA * Math.exp(-x[0])) + p.currentA * x[2] - p.voltageV);
  const norm = (r: number[]) => Math.hypot(...r);
  let r = F(s);
  const scale = Math.max(...sorted.map((p) => p.voltageV));
  let converged = false;
  for (let k = 0; k < 200; k++) {
    if (norm(r) <= 1e-13 * scale) {
      converged = true;
      break;
    }
    const J = sorted.map((p) => {
      const q = p.currentA * Math.exp(-s[0]);
      return [(-s[1] * vt * q) / (1 + q), vt * Math.log1p(q), p.currentA];
    });
    const d = solve3(J, r.map((v) => -v));
    if (!d) break;
    let t = 1;
    let next = s;
    let rn = r;
    for (let ls = 0; ls < 40; ls++) {
      next = [s[0] + t * d[0], s[1] + t * d[1], s[2] + t * d[2]];
      rn = F(next);
      if (next[1] > 0 && rn.every(Number.isFinite) && norm(rn) < norm(r)) break;
      t /= 2;
    }
    if (!(norm(rn) < norm(r))) {
      converged = norm(r) <= 1e-9 * scale;
      break;
    }
    const small = Math.abs(next[0] - s[0]) < 1e-14 * Math.max(1, Math.abs(s[0])) && Math.abs(next[1] - s[1]) < 1e-14 * s[1] && Math.abs(next[2] - s[2]) < 1e-14 * Math.max(1e-12, Math.abs(s[2]));
    s = next;
    r = rn;
    if (small) {
      converged = norm(r) <= 1e-9 * scale;
      break;
    }
  }
  if (!converged) return { ok: false, reason: 'the three points could not be fitted with one IS, N and RS; check them, or fit the two lowest points only' };
  const model = { isA: Math.exp(s[0]), n: s[1], rsOhm: s[2] };
  if (model.rsOhm < 0) {
    if (model.rsOhm > -1e-12) model.rsOhm = 0;
    else
      return {
        ok: false,
        reason: `the points need a negative series resistance (RS = ${model.rsOhm.toPrecision(3)} Ω): the curve bends the wrong way at high current; check the highest point, or fit with 2 points`,
      };
  }
  if (!(model.isA > 0) || !Number.isFinite(model.isA) || !(model.n > 0)) return { ok: false, reason: 'the fitted IS or N is out of range; check the points' };
  return { ok: true, model, residualsV: residuals(model, points) };
}

/**
 * Fit IS, N (and RS with three points) to 2 or 3 forward points (I, V) of a datasheet curve.
 * Points may come in any order; residuals come back in the order given.
 */
export function fitDiode(points: readonly DiodeFitPoint[]): DiodeFitResult {
  const bad = checkPoints(points);
  if (bad) return { ok: false, reason: bad };
  return points.length === 2 ? fitTwo(points) : fitThree(points);
}
