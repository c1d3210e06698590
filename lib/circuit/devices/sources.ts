/**
 * Independent sources with the SPICE 3 / ngspice `SIN(VO VA FREQ TD THETA PHASE)` waveform:
 * v(t) = VO + VA·sin(PHASE) for t ≤ TD, VO + VA·sin(2π·FREQ·(t−TD) + PHASE)·exp(−(t−TD)·THETA)
 * after (ngspice `vsrcload.c`). The voltage source adds a branch-current unknown (modified
 * nodal analysis, Ho, Ruehli, Brennan 1975); its current flows from n+ through the source to n−.
 */
import type { SineSpec } from '../netlist/types';
import type { BindContext, LoadState, SetupContext, SourceDevice } from './device';

/** Source value (V or A) at time t for a DC level plus an optional sine. */
export function sourceValue(dc: number, sine: SineSpec | undefined, timeS: number): number {
  if (!sine) return dc;
  const phase = (sine.phaseDeg * Math.PI) / 180;
  const t = timeS - sine.delayS;
  // As in SPICE's transient analysis, a SIN specification replaces the DC value.
  const base = sine.offsetV;
  if (t <= 0) return base + sine.amplitude * Math.sin(phase);
  return base + sine.amplitude * Math.sin(2 * Math.PI * sine.frequencyHz * t + phase) * Math.exp(-t * sine.damping);
}

export class VoltageSourceDevice implements SourceDevice {
  private p = -1;
  private n = -1;
  private br = -1;
  private pPB = 0;
  private pNB = 0;
  private pBP = 0;
  private pBN = 0;
  ip = 0;
  in = 0;
  ibr = 0;

  constructor(
    readonly name: string,
    private readonly nodes: [string, string],
    readonly dcV: number,
    readonly sine: SineSpec | undefined,
  ) {}

  setup(ctx: SetupContext): void {
    this.p = ctx.node(this.nodes[0]);
    this.n = ctx.node(this.nodes[1]);
    this.br = ctx.branch(this.name);
    ctx.entry(this.p, this.br);
    ctx.entry(this.n, this.br);
    ctx.entry(this.br, this.p);
    ctx.entry(this.br, this.n);
  }

  bind(ctx: BindContext): void {
    this.pPB = ctx.position(this.p, this.br);
    this.pNB = ctx.position(this.n, this.br);
    this.pBP = ctx.position(this.br, this.p);
    this.pBN = ctx.position(this.br, this.n);
    this.ip = ctx.unknown(this.p);
    this.in = ctx.unknown(this.n);
    this.ibr = ctx.unknown(this.br);
  }

  value(timeS: number): number {
    return sourceValue(this.dcV, this.sine, timeS);
  }

  load(state: LoadState): void {
    const m = state.matrix;
    m[this.pPB] += 1;
    m[this.pNB] -= 1;
    m[this.pBP] += 1;
    m[this.pBN] -= 1;
    state.rhs[this.ibr] += state.sourceFactor * this.value(state.time);
  }

  frequencyHz(): number {
    return this.sine && this.sine.amplitude !== 0 ? this.sine.frequencyHz : 0;
  }

  breakpoints(): number[] {
    return this.sine && this.sine.delayS > 0 ? [this.sine.delayS] : [];
  }
}

export class CurrentSourceDevice implements SourceDevice {
  private p = -1;
  private n = -1;
  ip = 0;
  in = 0;

  constructor(
    readonly name: string,
    private readonly nodes: [string, string],
    readonly dcA: number,
    readonly sine: SineSpec | undefined,
  ) {}

  setup(ctx: SetupContext): void {
    this.p = ctx.node(this.nodes[0]);
    this.n = ctx.node(this.nodes[1]);
  }

  bind(ctx: BindContext): void {
    this.ip = ctx.unknown(this.p);
    this.in = ctx.unknown(this.n);
  }

  value(timeS: number): number {
    return sourceValue(this.dcA, this.sine, timeS);
  }

  load(state: LoadState): void {
    const i = state.sourceFactor * this.value(state.time);
    state.rhs[this.ip] -= i;
    state.rhs[this.in] += i;
  }

  frequencyHz(): number {
    return this.sine && this.sine.amplitude !== 0 ? this.sine.frequencyHz : 0;
  }

  breakpoints(): number[] {
    return this.sine && this.sine.delayS > 0 ? [this.sine.delayS] : [];
  }
}
