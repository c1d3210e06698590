/**
 * Linear capacitor. In DC it is open; in a transient its charge q = C·v goes through the
 * integration method's companion model (a conductance α0·C in parallel with a history current,
 * Nagel, SPICE2, UCB/ERL M520, 1975, §4), so the device never needs to know which method runs.
 */
import type { BindContext, Device, LoadState, SetupContext } from './device';

export class CapacitorDevice implements Device {
  private a = -1;
  private b = -1;
  private pAA = 0;
  private pAB = 0;
  private pBA = 0;
  private pBB = 0;
  ia = 0;
  ib = 0;
  /** Charge-state slot in the integrator. */
  slot = -1;

  constructor(
    readonly name: string,
    private readonly nodes: [string, string],
    readonly capacitanceF: number,
  ) {}

  setup(ctx: SetupContext): void {
    this.a = ctx.node(this.nodes[0]);
    this.b = ctx.node(this.nodes[1]);
    ctx.entry(this.a, this.a);
    ctx.entry(this.a, this.b);
    ctx.entry(this.b, this.a);
    ctx.entry(this.b, this.b);
    this.slot = ctx.chargeSlot(this.a, this.b, this.name, 'capacitor');
  }

  bind(ctx: BindContext): void {
    this.pAA = ctx.position(this.a, this.a);
    this.pAB = ctx.position(this.a, this.b);
    this.pBA = ctx.position(this.b, this.a);
    this.pBB = ctx.position(this.b, this.b);
    this.ia = ctx.unknown(this.a);
    this.ib = ctx.unknown(this.b);
  }

  load(state: LoadState): void {
    const store = state.charges;
    if (state.mode !== 'transient' || !store) return;
    const x = state.x;
    const v = x[this.ia] - x[this.ib];
    const current = store.integrate(this.slot, this.capacitanceF * v, this.capacitanceF);
    const conductance = store.alpha[0] * this.capacitanceF;
    const ieq = current - conductance * v;
    const m = state.matrix;
    m[this.pAA] += conductance;
    m[this.pAB] -= conductance;
    m[this.pBA] -= conductance;
    m[this.pBB] += conductance;
    state.rhs[this.ia] -= ieq;
    state.rhs[this.ib] += ieq;
  }
}
