/** Linear resistor: conductance stamp of modified nodal analysis (Ho, Ruehli, Brennan 1975). */
import type { BindContext, Device, LoadState, SetupContext } from './device';

export class ResistorDevice implements Device {
  private a = -1;
  private b = -1;
  private pAA = 0;
  private pAB = 0;
  private pBA = 0;
  private pBB = 0;
  /** Solution offsets of the terminals (for measures). */
  ia = 0;
  ib = 0;
  readonly conductanceS: number;

  constructor(
    readonly name: string,
    private readonly nodes: [string, string],
    readonly resistanceOhm: number,
  ) {
    this.conductanceS = 1 / resistanceOhm;
  }

  setup(ctx: SetupContext): void {
    this.a = ctx.node(this.nodes[0]);
    this.b = ctx.node(this.nodes[1]);
    ctx.entry(this.a, this.a);
    ctx.entry(this.a, this.b);
    ctx.entry(this.b, this.a);
    ctx.entry(this.b, this.b);
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
    const g = this.conductanceS;
    const m = state.matrix;
    m[this.pAA] += g;
    m[this.pAB] -= g;
    m[this.pBA] -= g;
    m[this.pBB] += g;
  }

  /** Current from terminal a to b (A) for a solution vector. */
  current(x: Float64Array): number {
    return (x[this.ia] - x[this.ib]) * this.conductanceS;
  }
}
