/**
 * Warm-up from power-on (all capacitors empty) by envelope following (K. S. Kundert, J. K.
 * White, A. Sangiovanni-Vincentelli, Steady-State Methods for Simulating Analog and Microwave
 * Circuits, Kluwer 1990, ch. 7; L. Petzold, "An efficient numerical method for highly
 * oscillatory ordinary differential equations", SIAM J. Numer. Anal. 18(3), 1981): the state at
 * the start of each drive cycle changes slowly from cycle to cycle (a ladder charges with time
 * constants of order n² cycles), so after the first cycles one cycle is integrated with its
 * monodromy M, and the next K cycles follow from the period map linearised there,
 * s_{k+i+1} − s_{k+i} ≈ M^i·(φ(s_k) − s_k), i.e. a jump of Σ_{i<K} M^i·(φ(s_k) − s_k). Unlike a
 * backward-Euler envelope step this has no lag of its own; its error is M's change over the K
 * cycles, so K stays at a tenth of the envelope's time constant and of the time elapsed, and M is
 * recomputed at every envelope step. Each step costs one cycle of transient analysis instead of K.
 *
 * The first cycles, where the diodes start conducting one stage after another, are integrated
 * cycle by cycle. Output: the output's mean over each integrated cycle, placed at the end of
 * that cycle, and the 90 % / 99 % crossings interpolated between those points. Checked against
 * the cycle-by-cycle transient (tests/unit/circuit/solver/warmup.test.ts) and ngspice (t90).
 */
import type { Circuit } from '../mna/circuit';
import { integratePeriod, type PeriodRecord } from './shooting';
import { TransientEngine, type StepControl } from './transient';

export interface WarmupResult {
  /** Time to reach 90 % / 99 % of the steady-state output mean (s); null if not reached. */
  t90: number | null;
  t99: number | null;
  /** The same in drive cycles. */
  cycles90: number | null;
  cycles99: number | null;
  /** Drive cycles of warm-up covered (from power-on to the last point). */
  cyclesCovered: number;
  /** Cycles actually integrated (the envelope steps over the rest). */
  cyclesIntegrated: number;
  /** The warm-up curve: output mean over a cycle (V), at the end of that cycle (cycles from power-on). */
  curve: { cycles: number[]; meanV: number[] };
}

export interface WarmupOptions {
  periodS: number;
  outputNode: string;
  /** Steady-state mean of the output (V), from the periodic solve. */
  finalMeanV: number;
  control: StepControl;
  /** Cycles integrated one by one before the envelope steps start. */
  bruteCycles: number;
  /** Envelope step as a fraction of the envelope's time constant. Default 0.1. */
  stepFraction?: number;
  /** Envelope steps between monodromy refreshes. Default 1 (every step). */
  refreshEvery?: number;
  /** Stop above this fraction of the final mean. Default 0.995. */
  stopAt?: number;
}

function periodMean(record: PeriodRecord, offset: number): number {
  const t = record.timesS;
  let acc = 0;
  for (let k = 1; k < t.length; k++) acc += 0.5 * (record.solutions[k][offset] + record.solutions[k - 1][offset]) * (t[k] - t[k - 1]);
  return acc / (t[t.length - 1] - t[0]);
}

/** Crossing of `level` on the piecewise-linear curve, in cycles; null if not reached. */
function crossing(cycles: number[], meanV: number[], level: number): number | null {
  for (let i = 1; i < cycles.length; i++) {
    const a = Math.abs(meanV[i - 1]);
    const b = Math.abs(meanV[i]);
    if (b >= level && a < level) return cycles[i - 1] + ((level - a) / (b - a)) * (cycles[i] - cycles[i - 1]);
  }
  return null;
}

export function warmupFromPowerOn(circuit: Circuit, o: WarmupOptions): { ok: true; result: WarmupResult } | { ok: false; reason: string } {
  const out = circuit.nodeOffset.get(o.outputNode);
  if (out === undefined) return { ok: false, reason: `warm-up: no node ${o.outputNode}` };
  const m = circuit.slots.length;
  const engine = new TransientEngine(circuit);
  const target = Math.abs(o.finalMeanV);
  const stopAt = (o.stopAt ?? 0.995) * target;
  const fraction = o.stepFraction ?? 0.1;
  const refreshEvery = o.refreshEvery ?? 1;
  const cycles = [0];
  const meanV = [0];
  let s = new Float64Array(m);
  let seed: Float64Array | undefined;
  let k = 0;
  let integrated = 0;
  let mono: Float64Array | null = null;
  let monoAge = 0;
  let lastK = 1;
  while (k < 1_000_000) {
    // Envelope step length from the last two points: remaining distance r ∝ e^(−k/τ).
    let K = 1;
    const n = cycles.length;
    if (k >= o.bruteCycles && n >= 3) {
      const ra = target - Math.abs(meanV[n - 2]);
      const rb = target - Math.abs(meanV[n - 1]);
      if (ra > 0 && rb > 0 && rb < ra) {
        const tau = (cycles[n - 1] - cycles[n - 2]) / Math.log(ra / rb);
        // Early on, the charge front is still climbing the ladder and the output rises
        // slower than its final time constant says; steps also stay below a tenth of the
        // time elapsed.
        K = Math.max(1, Math.min(2 * lastK, Math.floor(fraction * tau), Math.floor(0.1 * k)));
      }
    }
    const needM = K > 1 && (mono === null || monoAge >= refreshEvery);
    const run = integratePeriod(engine, s, seed, o.periodS, o.control, needM);
    if (!run.ok) {
      if (cycles.length <= 1) return { ok: false, reason: `warm-up: ${run.reason}` };
      break;
    }
    integrated++;
    if (needM) {
      mono = run.run.monodromy;
      monoAge = 0;
    }
    const mean = periodMean(run.run.record, out);
    cycles.push(k + 1);
    meanV.push(mean);
    seed = run.run.record.solutions[run.run.record.solutions.length - 1];
    if (Math.abs(mean) >= stopAt) break;
    if (K === 1 || !mono) {
      s = Float64Array.from(run.run.endV);
      k += 1;
      lastK = 1;
      continue;
    }
    // Linearised map s_{i+1} − s_i = M^i·(φ(s) − s): K cycles move the state by Σ_{i<K} M^i·F.
    let v: Float64Array = new Float64Array(m);
    for (let j = 0; j < m; j++) v[j] = run.run.endV[j] - s[j];
    const d = new Float64Array(m);
    for (let i = 0; i < K; i++) {
      for (let j = 0; j < m; j++) d[j] += v[j];
      if (i + 1 < K) v = matVec(mono, v, m);
    }
    s = Float64Array.from(s, (x, j) => x + d[j]);
    // The envelope point lands at cycle k + K; the next integrated cycle starts there.
    k += K;
    lastK = K;
    monoAge++;
  }
  const c90 = crossing(cycles, meanV, 0.9 * target);
  const c99 = crossing(cycles, meanV, 0.99 * target);
  return {
    ok: true,
    result: {
      t90: c90 === null ? null : c90 * o.periodS,
      t99: c99 === null ? null : c99 * o.periodS,
      cycles90: c90,
      cycles99: c99,
      cyclesCovered: cycles[cycles.length - 1],
      cyclesIntegrated: integrated,
      curve: { cycles, meanV },
    },
  };
}

function matVec(a: Float64Array, x: Float64Array, m: number): Float64Array {
  const y = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let acc = 0;
    const row = i * m;
    for (let j = 0; j < m; j++) acc += a[row + j] * x[j];
    y[i] = acc;
  }
  return y;
}
