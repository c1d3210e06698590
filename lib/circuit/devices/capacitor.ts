/**
 * Linear capacitor. In DC it is open; in a transient its charge q = C·v goes through the
 * integration method's companion model (a conductance α0·C in parallel with a history current,
 * Nagel, SPICE2, UCB/ERL M520, 1975, §4), so the device never needs to know which method runs.
 */
import type { Device, LoadState, SetupContext } from './device';
import { TwoTerminalDevice } from './two-terminal';

export class CapacitorDevice extends TwoTerminalDevice implements Device {
  /** Charge-state slot in the integrator. */
  slot = -1;

  constructor(
    name: string,
    nodes: [string, string],
    readonly capacitanceF: number,
  ) {
    super(name, nodes);
  }

  setup(ctx: SetupContext): void {
    super.setup(ctx);
    this.slot = ctx.chargeSlot(this.a, this.b, this.name, 'capacitor');
  }

  load(state: LoadState): void {
    const store = state.charges;
    if (state.mode !== 'transient' || !store) return;
    const x = state.x;
    const v = x[this.ia] - x[this.ib];
    const current = store.integrate(this.slot, this.capacitanceF * v, this.capacitanceF);
    const conductance = store.alpha[0] * this.capacitanceF;
    const ieq = current - conductance * v;
    this.stampConductance(state.matrix, conductance);
    state.rhs[this.ia] -= ieq;
    state.rhs[this.ib] += ieq;
  }
}
