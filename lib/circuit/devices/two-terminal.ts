/**
 * The part every two-terminal linear element shares in modified nodal analysis (Ho, Ruehli,
 * Brennan 1975): its four matrix entries, their positions resolved once at bind time, and the
 * conductance stamp g·[1 −1; −1 1] that each Newton iteration adds.
 */
import type { BindContext, SetupContext } from './device';

export abstract class TwoTerminalDevice {
  protected a = -1;
  protected b = -1;
  private pAA = 0;
  private pAB = 0;
  private pBA = 0;
  private pBB = 0;
  /** Solution offsets of the terminals (for measures). */
  ia = 0;
  ib = 0;

  constructor(
    readonly name: string,
    private readonly nodes: [string, string],
  ) {}

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

  /** Adds the conductance `g` (S) between the two terminals to the MNA matrix. */
  protected stampConductance(m: Float64Array, g: number): void {
    m[this.pAA] += g;
    m[this.pAB] -= g;
    m[this.pBA] -= g;
    m[this.pBB] += g;
  }
}
