/**
 * Charge states of every reactive element (capacitors, diode junction and diffusion charge),
 * owned by the analysis rather than the devices so that integration methods are pluggable and
 * the shooting method can read and set the whole state vector at once.
 */
import { backwardEuler, type IntegrationMethod } from './methods';

export type ChargeKind = 'capacitor' | 'junction';

export class ChargeStore {
  readonly count: number;
  /** Solution offsets of each slot's terminals (set at bind). */
  readonly pos: Int32Array;
  readonly neg: Int32Array;
  readonly owners: string[];
  readonly kinds: ChargeKind[];
  /** q at the step being solved (0), and at the last three accepted points (1..3). */
  private q: Float64Array[];
  /** Times matching q[1..3] (accepted points). */
  private t = new Float64Array(4);
  /** Companion current of the step being solved and of the last accepted point. */
  iNow: Float64Array;
  iAccepted: Float64Array;
  /** dq/dv at the current iterate. */
  cNow: Float64Array;
  /** Derivative coefficients of the current step. */
  readonly alpha = new Float64Array(3);
  /** Accepted points available for history (1 after initialisation). */
  historyLength = 0;
  private readonly scratchT = new Float64Array(4);
  private readonly scratchQ = new Float64Array(4);
  method: IntegrationMethod;

  constructor(slots: { pos: number; neg: number; owner: string; kind: ChargeKind }[], method: IntegrationMethod) {
    this.count = slots.length;
    this.pos = Int32Array.from(slots.map((s) => s.pos));
    this.neg = Int32Array.from(slots.map((s) => s.neg));
    this.owners = slots.map((s) => s.owner);
    this.kinds = slots.map((s) => s.kind);
    this.q = [0, 1, 2, 3].map(() => new Float64Array(this.count));
    this.iNow = new Float64Array(this.count);
    this.iAccepted = new Float64Array(this.count);
    this.cNow = new Float64Array(this.count);
    this.method = method;
  }

  /** Remaps logical terminal indices to solution offsets. */
  bindTerminals(unknown: (logical: number) => number, logicalPos: number[], logicalNeg: number[]): void {
    for (let s = 0; s < this.count; s++) {
      this.pos[s] = unknown(logicalPos[s]);
      this.neg[s] = unknown(logicalNeg[s]);
    }
  }

  /** Starts a fresh history at time t0 with the given charges (one accepted point). */
  initialise(t0: number, charges: ArrayLike<number>): void {
    for (let s = 0; s < this.count; s++) {
      this.q[1][s] = charges[s];
      this.iAccepted[s] = 0;
    }
    this.t[1] = t0;
    this.historyLength = 1;
  }

  /** Order to use for the next step (limited by the history available). */
  usableOrder(): 1 | 2 {
    return this.historyLength >= 2 && this.method.order === 2 ? 2 : 1;
  }

  /** Prepares the coefficients of a step of length h with the given order. */
  beginStep(h: number, order: 1 | 2): void {
    const hPrev = this.historyLength >= 2 ? this.t[1] - this.t[2] : h;
    if (order === 2) this.method.coefficients(h, hPrev, this.alpha);
    else backwardEuler.coefficients(h, hPrev, this.alpha);
  }

  /**
   * Records the charge of a slot at the current iterate and returns its companion current
   * dq/dt; the companion conductance is `alpha[0]·c`.
   */
  integrate(slot: number, charge: number, capacitance: number): number {
    this.q[0][slot] = charge;
    this.cNow[slot] = capacitance;
    const i = this.alpha[0] * charge + this.alpha[1] * this.q[1][slot] + this.alpha[2] * this.q[2][slot];
    this.iNow[slot] = i;
    return i;
  }

  /** Accepted charge at point k (1 = latest). */
  accepted(slot: number, k = 1): number {
    return this.q[k][slot];
  }

  /** Charge at the step being solved. */
  current(slot: number): number {
    return this.q[0][slot];
  }

  /**
   * Largest ratio (LTE in volts)/(tolerance) over all slots for the step being solved at time
   * tNew, or 0 when the history is too short to estimate. `tolV` may be a number or one per slot.
   */
  errorRatio(tNew: number, order: 1 | 2, tolV: number | Float64Array): number {
    if (this.historyLength < order + 1) return 0;
    const tt = this.scratchT;
    tt[0] = tNew;
    tt[1] = this.t[1];
    tt[2] = this.t[2];
    tt[3] = this.t[3];
    const m = order === 2 ? this.method : backwardEuler;
    const qq = this.scratchQ;
    const [q0, q1, q2, q3] = this.q;
    let worst = 0;
    for (let s = 0; s < this.count; s++) {
      const c = this.cNow[s];
      if (!(c > 0)) continue;
      qq[0] = q0[s];
      qq[1] = q1[s];
      qq[2] = q2[s];
      qq[3] = q3[s];
      const errV = m.truncationError(qq, tt) / c;
      const r = errV / (typeof tolV === 'number' ? tolV : tolV[s]);
      if (r > worst) worst = r;
    }
    return worst;
  }

  /** Drops the history back to the latest accepted point (after a breakpoint). */
  restart(): void {
    this.historyLength = 1;
  }

  /** Accepts the step just solved at time tNew. */
  accept(tNew: number): void {
    const oldest = this.q[3];
    this.q[3] = this.q[2];
    this.q[2] = this.q[1];
    this.q[1] = this.q[0];
    this.q[0] = oldest;
    this.t[3] = this.t[2];
    this.t[2] = this.t[1];
    this.t[1] = tNew;
    this.iAccepted.set(this.iNow);
    this.historyLength = Math.min(this.historyLength + 1, 4);
  }

  /** Accepted time of the latest point. */
  lastTime(): number {
    return this.t[1];
  }
}
