/**
 * Periodic steady state by the shooting–Newton method (T. J. Aprille, T. N. Trick, "Steady-state
 * analysis of nonlinear circuits with periodic inputs", Proc. IEEE 60(1), 1972; K. S. Kundert,
 * J. K. White, A. Sangiovanni-Vincentelli, Steady-State Methods for Simulating Analog and
 * Microwave Circuits, Kluwer 1990, ch. 5). The unknown is the charge-state vector s (the branch
 * voltage of every capacitor and diode charge) at the start of a period; one period of
 * transient analysis maps it to φ(s). Newton's method solves φ(s) − s = 0 with the monodromy
 * (sensitivity) matrix M = ∂φ/∂s, propagated along the period's own time steps by re-using
 * each step's factorised Jacobian: J_{k+1}·X_{k+1} = −(α1·C_k·X_k + α2·C_{k−1}·X_{k−1}).
 *
 * Globalisation: pseudo-transient continuation (below), a trust region on the state change, and
 * a frozen time grid once the residual is small so that the period map is smooth and Newton
 * converges quadratically.
 */
import { DenseLu } from '../linalg/dense-lu';
import type { Circuit } from '../mna/circuit';
import type { StepControl } from './transient';
import { TransientEngine } from './transient';

/** Samples of one period: accepted times and solutions, plus every slot's companion current. */
export interface PeriodRecord {
  timesS: Float64Array;
  /** Row k: solution vector at timesS[k] (size + 1 values). */
  solutions: Float64Array[];
  /** Row k: companion current of every charge slot at timesS[k]. */
  slotCurrents: Float64Array[];
}

export interface PeriodRun {
  /** Slot branch voltages at the end of the period. */
  endV: Float64Array;
  /** Monodromy matrix (row-major, slots × slots), when requested. */
  monodromy: Float64Array | null;
  record: PeriodRecord;
  steps: number;
  newtonIterations: number;
}

export type PeriodOutcome = { ok: true; run: PeriodRun } | { ok: false; reason: string };

/** Integrates one period [0, T] from slot voltages s0, optionally with sensitivities. */
export function integratePeriod(
  engine: TransientEngine,
  s0: Float64Array,
  guess: Float64Array | undefined,
  periodS: number,
  control: StepControl,
  withSensitivity: boolean,
): PeriodOutcome {
  const { circuit, store } = engine;
  const m = store.count;
  const size = circuit.size;
  engine.start(0, s0, guess);
  const startNewton = engine.newton.totalIterations;
  const startSteps = engine.steps;
  const times: number[] = [0];
  const sols: Float64Array[] = [Float64Array.from(engine.x)];
  const currents: Float64Array[] = [new Float64Array(m)];
  let qd1 = new Float64Array(withSensitivity ? m * m : 0);
  let qd2 = new Float64Array(withSensitivity ? m * m : 0);
  let vd = new Float64Array(withSensitivity ? m * m : 0);
  // Sensitivity right-hand sides, (size + 1) rows × m columns; the last row is ground.
  const rhs = new Float64Array(withSensitivity ? (size + 1) * m : 0);
  const { pos, neg } = store;
  if (withSensitivity) {
    for (let j = 0; j < m; j++) qd1[j * m + j] = engine.slotCharge(j, s0[j]).c;
  }
  const onAccept = (t: number, _h: number, x: Float64Array) => {
    times.push(t);
    sols.push(Float64Array.from(x));
    currents.push(Float64Array.from(store.iAccepted));
    if (!withSensitivity) return;
    const a1 = store.alpha[1];
    const a2 = store.alpha[2];
    const next = qd2;
    // Right-hand side of every sensitivity column at once, row-major by unknown (see
    // BandMatrix.solveMany): column s gets −(α1·q'_k + α2·q'_{k−1}) at each slot's terminals.
    rhs.fill(0);
    for (let s = 0; s < m; s++) {
      const base = s * m;
      for (let j = 0; j < m; j++) {
        const v = a1 * qd1[base + j] + a2 * qd2[base + j];
        if (v === 0) continue;
        rhs[pos[j] * m + s] -= v;
        rhs[neg[j] * m + s] += v;
      }
    }
    rhs.fill(0, size * m);
    circuit.matrix.solveMany(rhs, m);
    rhs.fill(0, size * m);
    for (let s = 0; s < m; s++) {
      const base = s * m;
      for (let j = 0; j < m; j++) {
        const dv = rhs[pos[j] * m + s] - rhs[neg[j] * m + s];
        vd[base + j] = dv;
        next[base + j] = store.cNow[j] * dv;
      }
    }
    qd2 = qd1;
    qd1 = next;
  };
  const r = engine.run(periodS, control, onAccept);
  if (!r.ok) return { ok: false, reason: r.reason };
  let monodromy: Float64Array | null = null;
  if (withSensitivity) {
    // vd is stored column-major (column s = ∂v/∂s_s); return it row-major.
    monodromy = new Float64Array(m * m);
    for (let s = 0; s < m; s++) for (let j = 0; j < m; j++) monodromy[j * m + s] = vd[s * m + j];
    vd = new Float64Array(0);
  }
  return {
    ok: true,
    run: {
      endV: engine.branchVoltages(),
      monodromy,
      record: { timesS: Float64Array.from(times), solutions: sols, slotCurrents: currents },
      steps: engine.steps - startSteps,
      newtonIterations: engine.newton.totalIterations - startNewton,
    },
  };
}

export interface ShootingOptions {
  periodS: number;
  /** Converged when max|φ(s) − s| ≤ tolerance·max|s| (relative period-to-period change). */
  tolerance: number;
  maxIterations: number;
  control: StepControl;
  /** Freeze the time grid once the relative residual is below this. */
  freezeBelow: number;
  /** Most plain periods integrated from the initial state before Newton starts. */
  warmupPeriods: number;
  /** Initial pseudo-time step of the continuation, in periods. */
  initialPeriods: number;
  /**
   * Start with Newton's step (K = 1e6) instead when the first relative residual is below this
   * (a close initial state, such as the crest model's on a ladder below its optimum load); the
   * time grid is then frozen at once, from that first period, since the state will not move
   * far enough to need another (so the first Newton step already works on one smooth map).
   */
  newtonBelow?: number;
  /** Keep the monodromy across steps (chord method) once the residual is below this. Default 1e-4. */
  chordBelow?: number;
}

export type ShootingOutcome =
  | {
      ok: true;
      state: Float64Array;
      run: PeriodRun;
      /** Monodromy matrix of the last period integrated with sensitivities (row-major). */
      monodromy: Float64Array;
      iterations: number;
      residual: number;
      periodsIntegrated: number;
      history: number[];
    }
  | { ok: false; reason: string; iterations: number; residual: number; periodsIntegrated: number; history: number[] };

function lastSolution(run: PeriodRun): Float64Array {
  return run.record.solutions[run.record.solutions.length - 1];
}

/** True when every diode passes a forward charge of at least 1e-3 of the largest one's. */
export function allDiodesConduct(circuit: Circuit, record: PeriodRecord): boolean {
  const diodes = circuit.diodes;
  if (diodes.length === 0) return true;
  const charge = new Float64Array(diodes.length);
  const t = record.timesS;
  for (let k = 1; k < t.length; k++) {
    const dt = t[k] - t[k - 1];
    for (let d = 0; d < diodes.length; d++) {
      const i = diodes[d].staticCurrent(record.solutions[k]);
      if (i > 0) charge[d] += i * dt;
    }
  }
  let most = 0;
  for (const q of charge) most = Math.max(most, q);
  return charge.every((q) => q >= 1e-3 * most);
}

function norm2(v: Float64Array): number {
  let s = 0;
  for (const x of v) s += x * x;
  return Math.sqrt(s);
}

/**
 * Period-to-period change from state s to end: max|end − s| / max(max|s|, floorV) (`rel`, the
 * convergence measure) and its 2-norm (V).
 */
export function relResidual(s: Float64Array, end: Float64Array, floorV: number): { rel: number; norm: number } {
  let worst = 0;
  let scale = floorV;
  let norm = 0;
  for (let j = 0; j < s.length; j++) {
    const d = end[j] - s[j];
    worst = Math.max(worst, Math.abs(d));
    scale = Math.max(scale, Math.abs(s[j]));
    norm += d * d;
  }
  return { rel: worst / scale, norm: Math.sqrt(norm) };
}

export function shootPeriodicSteadyState(
  circuit: Circuit,
  engine: TransientEngine,
  s0: Float64Array,
  guess: Float64Array | undefined,
  o: ShootingOptions,
): ShootingOutcome {
  const m = s0.length;
  const floorV = 1e-6 * o.control.vScaleV;
  let periods = 0;
  const history: number[] = [];
  let control: StepControl = o.control;
  let s = Float64Array.from(s0);
  let seed = guess;
  if (o.warmupPeriods > 0) {
    // Plain periods first, until every diode conducts within the period. From an ideal no-load
    // guess the loaded ladder's diodes start conducting one stage per period; a diode that does
    // not conduct leaves the period map with a unit eigenvalue (M − I singular) and Newton's
    // step is meaningless along it.
    let plain = integratePeriod(engine, s, guess, o.periodS, control, false);
    periods++;
    for (let k = 0; plain.ok && k < o.warmupPeriods && !allDiodesConduct(circuit, plain.run.record); k++) {
      s = Float64Array.from(plain.run.endV);
      plain = integratePeriod(engine, s, lastSolution(plain.run), o.periodS, control, false);
      periods++;
    }
    if (!plain.ok) return { ok: false, reason: plain.reason, iterations: 0, residual: Infinity, periodsIntegrated: periods, history };
    seed = plain.run.record.solutions[0];
  }
  const first = integratePeriod(engine, s, seed, o.periodS, control, true);
  periods++;
  if (!first.ok) return { ok: false, reason: first.reason, iterations: 0, residual: Infinity, periodsIntegrated: periods, history };
  let run = first.run;
  let res = relResidual(s, run.endV, floorV);
  const newtonStart = o.newtonBelow !== undefined && res.rel < o.newtonBelow;
  let pseudoK = newtonStart ? 1e6 : o.initialPeriods;
  const freezeBelow = newtonStart ? Math.max(o.freezeBelow, o.newtonBelow!) : o.freezeBelow;
  const chordBelow = o.chordBelow ?? 1e-4;
  // Monodromy of the last period integrated with sensitivities, and whether it belongs to s.
  let mono = run.monodromy!;
  let fresh = true;
  history.push(res.rel);
  const refresh = (): string | null => {
    const again = integratePeriod(engine, s, run.record.solutions[0], o.periodS, control, true);
    periods++;
    if (!again.ok) return again.reason;
    run = again.run;
    mono = run.monodromy!;
    fresh = true;
    res = relResidual(s, run.endV, floorV);
    return null;
  };
  for (let it = 1; it <= o.maxIterations; it++) {
    if (res.rel <= o.tolerance) {
      return { ok: true, state: s, run, monodromy: mono, iterations: it - 1, residual: res.rel, periodsIntegrated: periods, history };
    }
    if (!control.grid && res.rel < freezeBelow) {
      // The grid is the one the last period from s chose, so that period is already the frozen
      // map's value at s: residual and monodromy carry over without another period.
      control = { ...o.control, grid: run.record.timesS.subarray(1) };
    }
    // Pseudo-transient continuation on the period map (Kelley & Keyes, SIAM J. Numer. Anal.
    // 35(2), 1998), which is backward Euler over K periods of the envelope ds/dc = φ(s) − s:
    // ((1 + 1/K)·I − M)·Δ = φ(s) − s. Small K is a damped plain-period step and keeps the
    // system regular where M has unit eigenvalues (diodes that do not conduct yet); K → ∞ is
    // Newton's step and gives quadratic convergence at the end.
    // In the Newton regime the monodromy is kept across steps while they contract well (the
    // chord method, Kelley, Iterative Methods for Linear and Nonlinear Equations, SIAM 1995,
    // §5.4): a trial period then needs no sensitivities, which cost about as much as the period.
    let accepted = false;
    for (let tries = 0; tries < 8 && !accepted; tries++) {
      const a = new Float64Array(m * m);
      const shift = 1 + 1 / pseudoK;
      for (let i = 0; i < m * m; i++) a[i] = -mono[i];
      for (let j = 0; j < m; j++) a[j * m + j] += shift;
      const rhs = new Float64Array(m);
      for (let j = 0; j < m; j++) rhs[j] = run.endV[j] - s[j];
      const f = DenseLu.factor(a, m);
      if (!f.ok) {
        pseudoK /= 8;
        continue;
      }
      const delta = f.lu.solve(rhs);
      // Trust region: no state moves by more than a quarter of the drive amplitude at once.
      let big = 0;
      for (let j = 0; j < m; j++) big = Math.max(big, Math.abs(delta[j]));
      const lambda = Math.min(1, (0.25 * o.control.vScaleV) / (big || 1));
      const trial = new Float64Array(m);
      for (let j = 0; j < m; j++) trial[j] = s[j] + lambda * delta[j];
      const chord = pseudoK >= 1e3 && res.rel < chordBelow;
      const out = integratePeriod(engine, trial, lastSolution(run), o.periodS, control, !chord);
      periods++;
      if (!out.ok) {
        pseudoK = Math.max(1, pseudoK / 8);
        continue;
      }
      const r2 = relResidual(trial, out.run.endV, floorV);
      // Acceptance by Deuflhard's natural monotonicity test (Newton Methods for Nonlinear
      // Problems, Springer 2004, §3.3): the simplified correction at the trial point, with the
      // same operator, must be shorter than the step taken. The residual itself is a poor
      // measure near the ladder's slow modes (eigenvalues of M close to 1): there a state volts
      // away from the answer changes by millivolts per period, and the way to it can raise the
      // residual on the way.
      const rTrial = new Float64Array(m);
      for (let j = 0; j < m; j++) rTrial[j] = out.run.endV[j] - trial[j];
      const bar = f.lu.solve(rTrial);
      const monotone = norm2(bar) <= (1 - lambda / 4) * norm2(delta);
      if (monotone || r2.norm < res.norm || r2.rel <= o.tolerance) {
        // Switched evolution relaxation: grow K as the residual falls.
        // The gain is the better of the residual's fall and the corrections' contraction.
        const gain = Math.max(res.norm / Math.max(r2.norm, 1e-300), norm2(delta) / Math.max(norm2(bar), 1e-300));
        pseudoK = Math.min(1e15, pseudoK * Math.min(100, Math.max(0.5, gain)) * (r2.norm < res.norm || monotone ? 2 : 1));
        const contracted = r2.norm <= 0.2 * res.norm;
        s = trial;
        run = out.run;
        res = r2;
        accepted = true;
        if (!chord) {
          mono = run.monodromy!;
          fresh = true;
        } else {
          fresh = false;
          // A chord step that contracted poorly: the kept monodromy is too far off; refresh it.
          if (!contracted && r2.rel > o.tolerance) {
            const failed = refresh();
            if (failed) return { ok: false, reason: failed, iterations: it, residual: res.rel, periodsIntegrated: periods, history };
          }
        }
      } else if (chord && !fresh) {
        // Retry from the same state with a monodromy that belongs to it.
        const failed = refresh();
        if (failed) return { ok: false, reason: failed, iterations: it, residual: res.rel, periodsIntegrated: periods, history };
      } else {
        pseudoK = Math.max(1, pseudoK / 8);
      }
    }
    if (!accepted) {
      // Fall back to one plain period (always a valid step towards the steady state).
      pseudoK = 1;
      s = Float64Array.from(run.endV);
      const out = integratePeriod(engine, s, lastSolution(run), o.periodS, control, true);
      periods++;
      if (!out.ok) return { ok: false, reason: out.reason, iterations: it, residual: res.rel, periodsIntegrated: periods, history };
      run = out.run;
      mono = run.monodromy!;
      fresh = true;
      res = relResidual(s, run.endV, floorV);
    }
    history.push(res.rel);
  }
  if (res.rel <= o.tolerance) return { ok: true, state: s, run, monodromy: mono, iterations: o.maxIterations, residual: res.rel, periodsIntegrated: periods, history };
  return { ok: false, reason: `shooting did not converge in ${o.maxIterations} iterations (residual ${res.rel.toExponential(2)})`, iterations: o.maxIterations, residual: res.rel, periodsIntegrated: periods, history };
}
