/**
 * Transient analysis: implicit integration of the charge equations with a Newton–Raphson solve
 * per time point, step-size control from the local truncation error (SPICE's scheme, Nagel
 * 1975 §4.3: reject a step whose estimated error exceeds the tolerance, otherwise grow or shrink
 * the next step by (tol/err)^(1/(order+1))), breakpoints at source discontinuities, and a
 * restart at first order after each breakpoint. A fixed time grid can be imposed instead (the
 * shooting method freezes its grid so that its period map is smooth).
 */
import type { ChargeStore } from '../integration/charge-store';
import { bdf2, type IntegrationMethod } from '../integration/methods';
import type { Circuit } from '../mna/circuit';
import { DEFAULT_TOLERANCES, NewtonSolver, type NewtonTolerances } from './newton';

export interface StepControl {
  /** Largest step (s). */
  hMaxS: number;
  /** Smallest step before giving up (s). */
  hMinS: number;
  /** First step after a start or breakpoint (s). */
  hInitS: number;
  /** LTE tolerance per step, volts: lteRel·vScaleV + lteAbsV. */
  lteRel: number;
  lteAbsV: number;
  vScaleV: number;
  /** Impose these time points (ascending, after t0, last = tEnd); no LTE control. */
  grid?: Float64Array;
  /** Wall-clock deadline (performance.now() ms). */
  deadlineMs?: number;
}

export type RunOutcome =
  | { ok: true; steps: number; rejected: number }
  | { ok: false; reason: string; timeS: number; steps: number };

/** Called after each accepted point; `x` is the accepted solution (do not keep a reference). */
export type AcceptHook = (timeS: number, stepS: number, x: Float64Array) => void;

export class TransientEngine {
  readonly newton: NewtonSolver;
  readonly store: ChargeStore;
  /** Accepted solution at `timeS` (ground cell included). */
  readonly x: Float64Array;
  private readonly xPrev: Float64Array;
  timeS = 0;
  private hPrev = 0;
  private hNext = 0;
  private hasPrev = false;
  steps = 0;
  rejected = 0;

  constructor(
    readonly circuit: Circuit,
    method: IntegrationMethod = bdf2,
    tol: NewtonTolerances = DEFAULT_TOLERANCES,
  ) {
    this.newton = new NewtonSolver(circuit, tol);
    this.store = circuit.createChargeStore(method);
    this.newton.setMode('transient', this.store);
    this.x = new Float64Array(circuit.size + 1);
    this.xPrev = new Float64Array(circuit.size + 1);
    this.slotOwner = this.resolveOwners();
  }

  /** Charge (C) and dq/dv (F) of a slot at branch voltage v. */
  slotCharge(slot: number, v: number): { q: number; c: number } {
    const owner = this.slotOwner[slot];
    if (owner.kind === 'C') return { q: owner.capacitanceF * v, c: owner.capacitanceF };
    const d = owner.diode;
    const vte = d.vte;
    const e = v >= -3 * vte ? Math.exp(Math.min(v / vte, 700)) : 0;
    const id = d.isA * (e - 1);
    const gd = (d.isA * e) / vte;
    return d.charge(v, gd, id);
  }

  private slotOwner: ReturnType<TransientEngine['resolveOwners']> = [];

  private resolveOwners() {
    const owners: ({ kind: 'C'; capacitanceF: number } | { kind: 'D'; diode: Circuit['diodes'][number] })[] = [];
    for (const c of this.circuit.capacitors) owners[c.slot] = { kind: 'C', capacitanceF: c.capacitanceF };
    for (const d of this.circuit.diodes) if (d.slot >= 0) owners[d.slot] = { kind: 'D', diode: d };
    return owners;
  }

  /**
   * Starts at t0 from the given branch voltage of every charge slot; `guess` seeds Newton's
   * first iterate (node voltages), and sets the diodes' previous junction voltages.
   */
  start(t0: number, branchV: ArrayLike<number>, guess?: Float64Array): void {
    const q = new Float64Array(this.store.count);
    for (let s = 0; s < q.length; s++) q[s] = this.slotCharge(s, branchV[s]).q;
    this.store.initialise(t0, q);
    this.x.fill(0);
    if (guess) this.x.set(guess.subarray(0, this.x.length));
    this.x[this.circuit.size] = 0;
    // Never start a junction above Vcrit: pnjlim then walks it up safely (SPICE starts at Vcrit).
    for (const d of this.circuit.diodes) d.setJunctionVoltage(Math.min(this.x[d.ij] - this.x[d.ik], d.vcrit));
    for (const d of this.circuit.diodes) if (d.slot >= 0) d.setJunctionVoltage(branchV[d.slot]);
    this.timeS = t0;
    this.hasPrev = false;
    this.hPrev = 0;
    this.hNext = 0;
  }

  /**
   * Re-evaluates every charge at the converged solution. Newton's last load happened at the
   * previous iterate; keeping those charges would leak up to one Newton tolerance of charge per
   * step, which breaks charge conservation over thousands of steps.
   */
  private commitCharges(x: Float64Array): void {
    const { store } = this;
    const { pos, neg } = store;
    for (let s = 0; s < store.count; s++) {
      const { q, c } = this.slotCharge(s, x[pos[s]] - x[neg[s]]);
      store.integrate(s, q, c);
    }
  }

  /** Branch voltage of every slot in the accepted solution. */
  branchVoltages(out = new Float64Array(this.store.count)): Float64Array {
    const { pos, neg } = this.store;
    for (let s = 0; s < out.length; s++) out[s] = this.x[pos[s]] - this.x[neg[s]];
    return out;
  }

  /** Integrates to tEnd. */
  run(tEnd: number, control: StepControl, onAccept?: AcceptHook): RunOutcome {
    const { circuit, store, newton } = this;
    const state = newton.state;
    const tolV = control.lteRel * control.vScaleV + control.lteAbsV;
    const span = tEnd - this.timeS;
    const eps = span * 1e-12;
    const breaks = circuit.sources
      .flatMap((s) => s.breakpoints())
      .filter((b) => b > this.timeS + eps && b < tEnd - eps)
      .sort((a, b) => a - b);
    let nextBreak = 0;
    let gridIndex = 0;
    if (this.hNext <= 0) this.hNext = control.hInitS;
    let firstAfterRestart = true;
    let justRejected = false;
    while (this.timeS < tEnd - eps) {
      if (control.deadlineMs !== undefined && performance.now() > control.deadlineMs) {
        return { ok: false, reason: 'time budget exhausted', timeS: this.timeS, steps: this.steps };
      }
      let target = tEnd;
      if (control.grid) {
        while (gridIndex < control.grid.length && control.grid[gridIndex] <= this.timeS + eps) gridIndex++;
        target = gridIndex < control.grid.length ? control.grid[gridIndex] : tEnd;
      } else if (nextBreak < breaks.length) {
        target = breaks[nextBreak];
      }
      let h: number;
      if (control.grid) {
        h = Math.min(target - this.timeS, this.hNext > 0 && this.hNext < target - this.timeS ? this.hNext : Infinity);
      } else {
        h = Math.min(this.hNext, control.hMaxS, target - this.timeS);
        // Avoid a sliver of a step just before the target: stretch to it, or, right after a
        // rejection (when stretching would repeat the rejected step), split what is left.
        const rest = target - this.timeS;
        if (rest - h < 0.2 * h) h = justRejected && rest > h ? rest / 2 : rest;
      }
      const order = store.usableOrder();
      store.beginStep(h, order);
      state.time = this.timeS + h;
      if (this.hasPrev) {
        const r = h / this.hPrev;
        for (let i = 0; i < circuit.size; i++) state.x[i] = this.x[i] + (this.x[i] - this.xPrev[i]) * r;
      } else {
        state.x.set(this.x);
      }
      state.x[circuit.size] = 0;
      const res = newton.solve();
      if (!res.ok) {
        for (const d of circuit.devices) d.rollback?.();
        this.rejected++;
        justRejected = true;
        this.hNext = h / 8;
        if (this.hNext < control.hMinS) {
          return { ok: false, reason: `time step too small at t = ${this.timeS.toExponential(4)} s (Newton: ${res.reason})`, timeS: this.timeS, steps: this.steps };
        }
        continue;
      }
      this.commitCharges(state.x);
      let ratio = 0;
      if (!control.grid) {
        ratio = store.errorRatio(this.timeS + h, order, tolV);
        if (ratio > 1 && h > control.hMinS * 2) {
          for (const d of circuit.devices) d.rollback?.();
          this.rejected++;
          justRejected = true;
          this.hNext = Math.max(control.hMinS, h * Math.max(0.2, 0.9 * Math.pow(ratio, -1 / (order + 1))));
          continue;
        }
      }
      justRejected = false;
      store.accept(this.timeS + h);
      for (const d of circuit.devices) d.accept?.();
      this.xPrev.set(this.x);
      this.x.set(state.x);
      this.hasPrev = true;
      this.hPrev = h;
      this.timeS += h;
      this.steps++;
      if (control.grid) {
        this.hNext = res.iterations > 12 ? h / 2 : 0;
      } else {
        const grow = ratio > 0 ? 0.9 * Math.pow(ratio, -1 / (order + 1)) : 2;
        this.hNext = h * Math.min(firstAfterRestart ? 4 : 2, Math.max(0.3, grow));
        if (res.iterations > 12) this.hNext = Math.min(this.hNext, h / 2);
        // Steps near hMin carry charge differences at round-off level, where the LTE estimate
        // is noise; never let the controller walk the step below a few hMin.
        this.hNext = Math.max(this.hNext, 4 * control.hMinS);
      }
      firstAfterRestart = false;
      onAccept?.(this.timeS, h, this.x);
      if (!control.grid && nextBreak < breaks.length && this.timeS >= breaks[nextBreak] - eps) {
        nextBreak++;
        store.restart();
        this.hasPrev = false;
        this.hNext = control.hInitS;
        firstAfterRestart = true;
      }
    }
    return { ok: true, steps: this.steps, rejected: this.rejected };
  }
}
