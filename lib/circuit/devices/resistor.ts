/** Linear resistor: conductance stamp of modified nodal analysis (Ho, Ruehli, Brennan 1975). */
import type { Device, LoadState } from './device';
import { TwoTerminalDevice } from './two-terminal';

export class ResistorDevice extends TwoTerminalDevice implements Device {
  readonly conductanceS: number;

  constructor(
    name: string,
    nodes: [string, string],
    readonly resistanceOhm: number,
  ) {
    super(name, nodes);
    this.conductanceS = 1 / resistanceOhm;
  }

  load(state: LoadState): void {
    this.stampConductance(state.matrix, this.conductanceS);
  }

  /** Current from terminal a to b (A) for a solution vector. */
  current(x: Float64Array): number {
    return (x[this.ia] - x[this.ib]) * this.conductanceS;
  }
}
