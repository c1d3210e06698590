/**
 * Loaded initial state for the shooting method from the ideal-diode crest model, solved on the
 * netlist itself (any topology): every diode is an ideal switch that passes one impulse of
 * charge Q_d per period at the crest of its no-load voltage swing and blocks otherwise; between
 * impulses the rest of the circuit is linear. This is the model behind the exact small-ripple
 * ladder result of REFERENCES §1.3 ("charge moves only at the crests", deriv): there the
 * end-of-conduction conditions are solved by hand for a half-wave ladder; here they are solved
 * numerically, which covers full-wave, symmetric and custom shapes, source and load resistors,
 * stray capacitance and bleeders alike.
 *
 * Method (superposition on one fixed backward-Euler grid, modified nodal analysis with the
 * diodes removed, one factorisation):
 * - unknowns: every capacitor's voltage u at t = 0 and every diode's impulse charge Q_d;
 * - the linear period is integrated once for the sources alone, once per unit capacitor
 *   voltage and once per unit impulse (all as right-hand sides of one multi-column solve);
 * - periodicity: u(T) = u(0) for every capacitor;
 * - end of conduction: right after its impulse a diode sits at its forward drop,
 *   v_anode − v_cathode = n·Vt·ln(1 + I_pk/IS) + RS·I_pk, with the pulse's peak current taken as
 *   10× its mean (common practice for a rough conduction angle; it only refines the guess).
 * A diode whose impulse comes out negative does not conduct in that circuit and is dropped
 * (active set). The result is a guess: the shooting–Newton iteration on the full device models
 * makes it exact. Typical ladders land within about 1 % of the output sag, against tens of
 * per cent for the no-load state, which saves most of the shooting iterations on heavy loads.
 */
import { DenseLu } from '../linalg/dense-lu';
import { BandMatrix } from '../linalg/band-lu';
import { driveAmplitudeV, type Circuit } from '../mna/circuit';
import type { InitialGuess } from './initial-guess';
import { phasorSolution } from './initial-guess';

export interface CrestGuess extends InitialGuess {
  /** Impulse charge per period of every diode (C), 0 for diodes found not to conduct. */
  pulseChargeC: Float64Array;
  /** Grid point (1…steps) of every diode's impulse, −1 for a diode with no swing. */
  pulseStep: Int32Array;
  /** Mean and peak-to-peak swing of every unknown over the crest-model period (V or A). */
  mean: Float64Array;
  swing: Float64Array;
}

/** Ratio of a conduction pulse's peak current to its mean over the period (common practice). */
const PEAK_TO_MEAN = 10;

/**
 * Crest-model periodic state of `circuit` driven at `frequencyHz`, or null when the model does
 * not apply (no capacitors, a singular system, or an implausible answer).
 */
export function crestGuess(circuit: Circuit, frequencyHz: number, steps = 128): CrestGuess | null {
  const n = circuit.size;
  const caps = circuit.capacitors;
  const diodes = circuit.diodes;
  const mc = caps.length;
  const nd = diodes.length;
  if (mc === 0 || nd === 0 || !(frequencyHz > 0)) return null;
  const phasor = phasorSolution(circuit, frequencyHz);
  if (!phasor) return null;
  const periodS = 1 / frequencyHz;
  const h = periodS / steps;
  const omega = 2 * Math.PI * frequencyHz;

  const amplitude = driveAmplitudeV(circuit);
  if (!(amplitude > 0)) return null;

  // Impulse instant of every diode: the crest of its AC voltage Im(D·e^{jωt}) = re·sin + im·cos.
  const pulseStep = new Int32Array(nd).fill(-1);
  for (let d = 0; d < nd; d++) {
    const dev = diodes[d];
    const a = phasor.re(dev.ia) - phasor.re(dev.ik);
    const b = phasor.im(dev.ia) - phasor.im(dev.ik);
    if (Math.hypot(a, b) < 1e-6 * amplitude) continue;
    let t = Math.atan2(a, b) / omega;
    t -= Math.floor(t / periodS) * periodS;
    let k = Math.round(t / h);
    if (k <= 0) k = steps;
    pulseStep[d] = k;
  }

  // Backward-Euler matrix of the linear part: G + C/h, diode junctions open (a conductance of
  // 1e-12·C_min/h keeps a junction's internal node defined), RS kept.
  let cMin = Infinity;
  for (const c of caps) cMin = Math.min(cMin, c.capacitanceF);
  const gOpen = (1e-12 * cMin) / h;
  const band = new BandMatrix(n, circuit.band.lower, circuit.band.upper);
  const put = (r: number, c: number, v: number) => {
    if (r >= n || c >= n) return;
    band.data[band.offset(r, c)] += v;
  };
  const conductance = (a: number, b: number, g: number) => {
    put(a, a, g);
    put(a, b, -g);
    put(b, a, -g);
    put(b, b, g);
  };
  for (const r of circuit.resistors) conductance(r.ia, r.ib, r.conductanceS);
  for (const c of caps) conductance(c.ia, c.ib, c.capacitanceF / h);
  for (const d of diodes) {
    if (d.ij !== d.ia) conductance(d.ia, d.ij, 1 / d.rsOhm);
    conductance(d.ij, d.ik, gOpen);
  }
  for (const v of circuit.voltageSources) {
    put(v.ip, v.ibr, 1);
    put(v.in, v.ibr, -1);
    put(v.ibr, v.ip, 1);
    put(v.ibr, v.in, -1);
  }
  for (let i = 0; i < n; i++) if (circuit.isVoltage[i]) put(i, i, 1e-12);
  if (!band.factor().ok) return null;

  // Columns: 0 = sources alone, 1…mc = unit voltage on capacitor j at t = 0, mc+1… = unit
  // impulse of diode d. `x` is row-major by unknown with `cols` values per row (+ ground row);
  // after the last step it holds the solution at t = T of every column.
  const cols = 1 + mc + nd;
  const x = new Float64Array((n + 1) * cols);
  const capA = Int32Array.from(caps, (c) => c.ia);
  const capB = Int32Array.from(caps, (c) => c.ib);
  const capG = Float64Array.from(caps, (c) => c.capacitanceF / h);
  const capV = new Float64Array(mc * cols);
  for (let j = 0; j < mc; j++) capV[j * cols + 1 + j] = 1;
  // Diode voltage right after its impulse, per column.
  const clampV = new Float64Array(nd * cols);
  const diodeA = Int32Array.from(diodes, (d) => d.ia);
  const diodeK = Int32Array.from(diodes, (d) => d.ik);
  // Right-hand side of step k for `w` columns: the capacitors' history currents from `cv`, the
  // sources in column 0, and the impulses `impulse(d)` gives as (column, charge).
  const rightHandSide = (b: Float64Array, cv: Float64Array, w: number, k: number, impulse: (d: number) => [number, number] | null) => {
    const t = k * h;
    b.fill(0);
    addHistory(b, cv, capA, capB, capG, w);
    for (const v of circuit.voltageSources) b[v.ibr * w] += v.value(t);
    for (const s of circuit.currentSources) {
      const i = s.value(t);
      b[s.ip * w] -= i;
      b[s.in * w] += i;
    }
    for (let d = 0; d < nd; d++) {
      if (pulseStep[d] !== k) continue;
      const p = impulse(d);
      if (!p) continue;
      b[diodeA[d] * w + p[0]] -= p[1] / h;
      b[diodeK[d] * w + p[0]] += p[1] / h;
    }
    b.fill(0, n * w);
  };
  for (let k = 1; k <= steps; k++) {
    rightHandSide(x, capV, cols, k, (d) => [1 + mc + d, 1]);
    band.solveMany(x, cols);
    x.fill(0, n * cols);
    branchColumns(x, capV, capA, capB, 0, mc, cols);
    for (let d = 0; d < nd; d++) if (pulseStep[d] === k) branchColumns(x, clampV, diodeA, diodeK, d, d + 1, cols);
  }

  // Linear system in z = [u (mc), Q (active diodes)], refined for the forward drop and the
  // active set a few times.
  const active = Array.from({ length: nd }, (_, d) => pulseStep[d] > 0);
  const charge = new Float64Array(nd);
  let z: Float64Array | null = null;
  for (let pass = 0; pass < 8; pass++) {
    const act = active.flatMap((on, d) => (on ? [d] : []));
    const size = mc + act.length;
    const a = new Float64Array(size * size);
    const b = new Float64Array(size);
    for (let c = 0; c < mc; c++) {
      const row = c * size;
      for (let j = 0; j < mc; j++) a[row + j] = capV[c * cols + 1 + j];
      a[row + c] -= 1;
      act.forEach((d, i) => (a[row + mc + i] = capV[c * cols + 1 + mc + d]));
      b[c] = -capV[c * cols];
    }
    act.forEach((d, i) => {
      const row = (mc + i) * size;
      for (let j = 0; j < mc; j++) a[row + j] = clampV[d * cols + 1 + j];
      act.forEach((d2, i2) => (a[row + mc + i2] = clampV[d * cols + 1 + mc + d2]));
      const dev = diodes[d];
      const ipk = PEAK_TO_MEAN * Math.max(0, charge[d]) * frequencyHz;
      b[mc + i] = dev.vte * Math.log1p(ipk / dev.isA) + dev.rsOhm * ipk - clampV[d * cols];
    });
    const f = DenseLu.factor(a, size);
    if (!f.ok) return null;
    z = f.lu.solve(b);
    charge.fill(0);
    act.forEach((d, i) => (charge[d] = z![mc + i]));
    let worst = -1;
    let worstQ = 0;
    let qScale = 0;
    for (const d of act) qScale = Math.max(qScale, Math.abs(charge[d]));
    for (const d of act) {
      if (charge[d] < worstQ - 1e-9 * qScale) {
        worstQ = charge[d];
        worst = d;
      }
    }
    if (worst < 0 && pass >= 2) break;
    if (worst >= 0) {
      active[worst] = false;
      charge[worst] = 0;
    }
  }
  if (!z) return null;
  for (let d = 0; d < nd; d++) if (!active[d] || charge[d] < 0) charge[d] = 0;

  // Solution at t = T (≡ 0) by superposition, then the charge-slot voltages.
  const coeff = new Float64Array(cols);
  coeff[0] = 1;
  for (let j = 0; j < mc; j++) coeff[1 + j] = z[j];
  for (let d = 0; d < nd; d++) coeff[1 + mc + d] = charge[d];
  const sol = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let col = 0; col < cols; col++) s += coeff[col] * x[i * cols + col];
    sol[i] = s;
  }
  // One more pass with the solved state and impulses gives the crest model's waveforms, whose
  // swing tells the solver how small the ripple it must resolve is.
  const mean = new Float64Array(n + 1);
  const lo = new Float64Array(n + 1).fill(Infinity);
  const hi = new Float64Array(n + 1).fill(-Infinity);
  const u = new Float64Array(mc);
  for (let j = 0; j < mc; j++) u[j] = z[j];
  const b1 = new Float64Array(n + 1);
  for (let k = 1; k <= steps; k++) {
    rightHandSide(b1, u, 1, k, (d) => (charge[d] === 0 ? null : [0, charge[d]]));
    band.solveMany(b1, 1);
    b1[n] = 0;
    branchColumns(b1, u, capA, capB, 0, mc, 1);
    for (let i = 0; i < n; i++) {
      mean[i] += b1[i] / steps;
      if (b1[i] < lo[i]) lo[i] = b1[i];
      if (b1[i] > hi[i]) hi[i] = b1[i];
    }
  }
  const swing = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) swing[i] = hi[i] - lo[i];
  const limit = 4 * (nd + 1) * amplitude;
  for (let i = 0; i < n; i++) if (!Number.isFinite(sol[i]) || (circuit.isVoltage[i] && Math.abs(sol[i]) > limit)) return null;
  const store = circuit.createChargeStore({ name: 'none', order: 1, coefficients: () => undefined, truncationError: () => 0 });
  const branchV = new Float64Array(circuit.slots.length);
  for (let s = 0; s < branchV.length; s++) branchV[s] = sol[store.pos[s]] - sol[store.neg[s]];
  // The linear model has no junction between impulses, so a diode can read volts forward at
  // t = 0; a real junction sits at most near its critical voltage (a charge state far beyond it
  // would overflow the exponential of the diffusion charge).
  for (const d of diodes) {
    if (d.slot < 0) continue;
    branchV[d.slot] = Math.min(branchV[d.slot], d.vcrit);
    sol[d.ij] = Math.min(sol[d.ij], sol[d.ik] + d.vcrit);
  }
  return { x: sol, branchV, pulseChargeC: charge, pulseStep, mean, swing };
}

/** Adds every capacitor's backward-Euler history current g·v to the right-hand sides of all columns. */
function addHistory(rhs: Float64Array, capV: Float64Array, a: Int32Array, b: Int32Array, g: Float64Array, cols: number): void {
  for (let j = 0; j < a.length; j++) {
    const gj = g[j];
    const rowA = a[j] * cols;
    const rowB = b[j] * cols;
    const base = j * cols;
    for (let col = 0; col < cols; col++) {
      const ieq = gj * capV[base + col];
      rhs[rowA + col] += ieq;
      rhs[rowB + col] -= ieq;
    }
  }
}

/** out[j·cols + col] = x[a_j·cols + col] − x[b_j·cols + col] for j in [from, to). */
function branchColumns(x: Float64Array, out: Float64Array, a: Int32Array, b: Int32Array, from: number, to: number, cols: number): void {
  for (let j = from; j < to; j++) {
    const rowA = a[j] * cols;
    const rowB = b[j] * cols;
    const base = j * cols;
    for (let col = 0; col < cols; col++) out[base + col] = x[rowA + col] - x[rowB + col];
  }
}
