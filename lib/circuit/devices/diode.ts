/**
 * Junction diode, SPICE level 1 (L. W. Nagel, SPICE2, UCB/ERL M520, 1975, §3.1; the same
 * equations as SPICE 3f5 / ngspice `dioload.c`):
 *
 * - forward and small reverse bias (vd ≥ −3·N·Vt): Id = IS·(exp(vd/(N·Vt)) − 1) (Shockley);
 * - reverse bias: Id = −IS·(1 + (3·N·Vt/(e·vd))³) (SPICE 3's smooth reverse region);
 * - breakdown (vd < −BV'): Id = −IS·exp(−(BV' + vd)/(N·Vt)), BV' chosen so that Id(−BV) = −IBV;
 * - GMIN in parallel with the junction; series resistance RS through an internal node;
 * - depletion charge with CJO, VJ, M and the FC linearisation, diffusion charge TT·Id;
 * - junction voltage limiting `pnjlim` (SPICE 3, after Colon's thesis) around the critical
 *   voltage Vcrit = N·Vt·ln(N·Vt/(√2·IS)).
 * Vt = k·T/q at T = 300.15 K (SPICE's default TNOM of 27 °C): 0.025865 V.
 */
import type { DiodeModel } from '../netlist/types';
import type { BindContext, Device, LoadState, SetupContext } from './device';

/** Boltzmann constant (J/K), CODATA 2018 exact. */
const BOLTZMANN = 1.380649e-23;
/** Elementary charge (C), CODATA 2018 exact. */
const CHARGE = 1.602176634e-19;
/** SPICE's nominal temperature, 27 °C, in kelvin. */
export const SPICE_TNOM_K = 300.15;
/** Thermal voltage kT/q at 27 °C (V). */
export const THERMAL_VOLTAGE_V = (BOLTZMANN * SPICE_TNOM_K) / CHARGE;

/** Static junction current and conductance (without GMIN) at junction voltage vd. */
export function diodeStatic(
  vd: number,
  isA: number,
  vte: number,
  breakdownV: number | undefined,
): { currentA: number; conductanceS: number } {
  if (vd >= -3 * vte) {
    const e = Math.exp(Math.min(vd / vte, 700));
    return { currentA: isA * (e - 1), conductanceS: (isA * e) / vte };
  }
  if (breakdownV === undefined || vd >= -breakdownV) {
    const arg0 = (3 * vte) / (vd * Math.E);
    const arg = arg0 * arg0 * arg0;
    return { currentA: -isA * (1 + arg), conductanceS: (isA * 3 * arg) / vd };
  }
  const e = Math.exp(Math.min(-(breakdownV + vd) / vte, 700));
  return { currentA: -isA * e, conductanceS: (isA * e) / vte };
}

/** SPICE 3 `DEVpnjlim`: limits a new junction voltage against the previous one. */
export function pnjlim(vnew: number, vold: number, vt: number, vcrit: number): { v: number; limited: boolean } {
  if (vnew > vcrit && Math.abs(vnew - vold) > 2 * vt) {
    if (vold > 0) {
      const arg = 1 + (vnew - vold) / vt;
      return { v: arg > 0 ? vold + vt * Math.log(arg) : vcrit, limited: true };
    }
    return { v: vt * Math.log(vnew / vt), limited: true };
  }
  return { v: vnew, limited: false };
}

export class DiodeDevice implements Device {
  readonly isA: number;
  readonly vte: number;
  readonly rsOhm: number;
  readonly vcrit: number;
  /** Effective breakdown voltage BV' (positive) or undefined. */
  readonly breakdownV: number | undefined;
  readonly cjoF: number;
  readonly ttS: number;
  readonly hasCharge: boolean;
  private a = -1;
  private k = -1;
  private j = -1;
  /** Solution offsets: anode, cathode, junction (internal node, = anode when RS = 0). */
  ia = 0;
  ik = 0;
  ij = 0;
  private pAA = 0;
  private pAJ = 0;
  private pJA = 0;
  private pJJ = 0;
  private pJK = 0;
  private pKJ = 0;
  private pKK = 0;
  slot = -1;
  /** Junction voltage used at the last load, and the last accepted one. */
  private vdIter = 0;
  private vdAccepted = 0;
  private idIter = 0;
  private gdIter = 0;

  constructor(
    readonly name: string,
    private readonly nodes: [string, string],
    readonly model: DiodeModel,
    area = 1,
  ) {
    this.isA = model.isA * area;
    this.vte = model.n * THERMAL_VOLTAGE_V;
    this.rsOhm = model.rsOhm / area;
    this.vcrit = this.vte * Math.log(this.vte / (Math.SQRT2 * this.isA));
    this.cjoF = model.cjoF * area;
    this.ttS = model.ttS;
    this.hasCharge = this.cjoF > 0 || this.ttS > 0;
    if (model.bvV !== undefined && Number.isFinite(model.bvV)) {
      const ibv = Math.max(model.ibvA, this.isA * model.bvV / this.vte);
      this.breakdownV = model.bvV - this.vte * Math.log(1 + ibv / this.isA);
    }
  }

  setup(ctx: SetupContext): void {
    this.a = ctx.node(this.nodes[0]);
    this.k = ctx.node(this.nodes[1]);
    this.j = this.rsOhm > 0 ? ctx.internalNode(`${this.name}#junction`) : this.a;
    if (this.rsOhm > 0) {
      ctx.entry(this.a, this.a);
      ctx.entry(this.a, this.j);
      ctx.entry(this.j, this.a);
    }
    ctx.entry(this.j, this.j);
    ctx.entry(this.j, this.k);
    ctx.entry(this.k, this.j);
    ctx.entry(this.k, this.k);
    if (this.hasCharge) this.slot = ctx.chargeSlot(this.j, this.k, this.name, 'junction');
  }

  bind(ctx: BindContext): void {
    if (this.rsOhm > 0) {
      this.pAA = ctx.position(this.a, this.a);
      this.pAJ = ctx.position(this.a, this.j);
      this.pJA = ctx.position(this.j, this.a);
    }
    this.pJJ = ctx.position(this.j, this.j);
    this.pJK = ctx.position(this.j, this.k);
    this.pKJ = ctx.position(this.k, this.j);
    this.pKK = ctx.position(this.k, this.k);
    this.ia = ctx.unknown(this.a);
    this.ik = ctx.unknown(this.k);
    this.ij = ctx.unknown(this.j);
  }

  /** Depletion plus diffusion charge (C) and its derivative (F) at junction voltage vd. */
  charge(vd: number, gd: number, id: number): { q: number; c: number } {
    let q = this.ttS * id;
    let c = this.ttS * gd;
    if (this.cjoF > 0) {
      const { vjV: vj, m, fc } = this.model;
      const fcpb = fc * vj;
      if (vd < fcpb) {
        const arg = 1 - vd / vj;
        const sarg = Math.exp(-m * Math.log(arg));
        q += (this.cjoF * vj * (1 - arg * sarg)) / (1 - m);
        c += this.cjoF * sarg;
      } else {
        const f1 = (vj * (1 - Math.pow(1 - fc, 1 - m))) / (1 - m);
        const f2 = Math.pow(1 - fc, 1 + m);
        const f3 = 1 - fc * (1 + m);
        q += this.cjoF * f1 + (this.cjoF / f2) * (f3 * (vd - fcpb) + (m / (2 * vj)) * (vd * vd - fcpb * fcpb));
        c += (this.cjoF / f2) * (f3 + (m * vd) / vj);
      }
    }
    return { q, c };
  }

  load(state: LoadState): void {
    const x = state.x;
    const vOld = state.iteration === 0 ? this.vdAccepted : this.vdIter;
    let vd = x[this.ij] - x[this.ik];
    let limited: boolean;
    if (this.breakdownV !== undefined && vd < Math.min(0, -this.breakdownV + 10 * this.vte)) {
      const r = pnjlim(-(vd + this.breakdownV), -(vOld + this.breakdownV), this.vte, this.vcrit);
      vd = -(r.v + this.breakdownV);
      limited = r.limited;
    } else {
      const r = pnjlim(vd, vOld, this.vte, this.vcrit);
      vd = r.v;
      limited = r.limited;
    }
    if (limited) state.noncon++;
    const s = diodeStatic(vd, this.isA, this.vte, this.breakdownV);
    let id = s.currentA + state.gmin * vd;
    let gd = s.conductanceS + state.gmin;
    this.vdIter = vd;
    this.idIter = id;
    this.gdIter = gd;
    if (this.hasCharge && state.mode === 'transient' && state.charges) {
      const { q, c } = this.charge(vd, s.conductanceS, s.currentA);
      const iq = state.charges.integrate(this.slot, q, c);
      id += iq;
      gd += state.charges.alpha[0] * c;
    }
    const ieq = id - gd * vd;
    const m = state.matrix;
    if (this.rsOhm > 0) {
      const g = 1 / this.rsOhm;
      m[this.pAA] += g;
      m[this.pAJ] -= g;
      m[this.pJA] -= g;
      m[this.pJJ] += g;
    }
    m[this.pJJ] += gd;
    m[this.pJK] -= gd;
    m[this.pKJ] -= gd;
    m[this.pKK] += gd;
    state.rhs[this.ij] -= ieq;
    state.rhs[this.ik] += ieq;
  }

  converged(state: LoadState, xNew: Float64Array): boolean {
    const vdNew = xNew[this.ij] - xNew[this.ik];
    const delta = this.gdIter * (vdNew - this.vdIter);
    const cdhat = this.idIter + delta;
    const tol = state.reltol * Math.max(Math.abs(cdhat), Math.abs(this.idIter)) + state.abstolA;
    return Math.abs(delta) <= tol;
  }

  accept(): void {
    this.vdAccepted = this.vdIter;
  }

  rollback(): void {
    this.vdIter = this.vdAccepted;
  }

  /** Sets the accepted junction voltage (initial state of a transient). */
  setJunctionVoltage(vd: number): void {
    this.vdAccepted = vd;
    this.vdIter = vd;
  }

  /** Static junction current (A, anode → cathode, without GMIN) for a solution vector. */
  staticCurrent(x: Float64Array): number {
    return diodeStatic(x[this.ij] - x[this.ik], this.isA, this.vte, this.breakdownV).currentA;
  }
}
