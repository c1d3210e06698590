import { solveNetlist, type SolveOptions, type SolveResult } from '@/lib/circuit/analysis/solve';
import { generateLadder, NEAR_IDEAL_DIODE, type LadderOptions } from '@/lib/circuit/netlist/generate';

export type Solved = Extract<SolveResult, { ok: true }>;

/** Solves and fails the test with the engine's reason when the solve fails. */
export function solveOk(o: LadderOptions, options: SolveOptions = {}): Solved {
  const r = solveNetlist(generateLadder(o), { waveformPoints: 0, ...options });
  if (!r.ok) throw new Error(`solve failed: ${r.reason}`);
  return r;
}

/** REFERENCES §9 setup: near-ideal diodes, ±1000 V sine, 0.01 Ω source, 1 kHz, 1 µF; u = I/(fC). */
export function section9(kind: LadderOptions['kind'], stages: number, loadCurrentA = 1e-3, extra: Partial<LadderOptions> = {}): LadderOptions {
  return { kind, stages, peakV: 1000, frequencyHz: 1000, capacitanceF: 1e-6, diode: NEAR_IDEAL_DIODE, loadCurrentA, sourceResistanceOhm: 0.01, ...extra };
}

/** Drops below 2nVp and ripple of a node, in units of u. */
export function inUnits(r: Solved, node: string, noLoadV: number, u: number) {
  const m = r.nodes[node];
  return { max: (noLoadV - m.max) / u, mean: (noLoadV - m.mean) / u, rip: m.ripple / u };
}

/** Relative difference |a − b| / |b|. */
export function rel(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b);
}
