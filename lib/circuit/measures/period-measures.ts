/**
 * Measures over one steady-state period: time averages by the trapezoidal rule over the
 * accepted time points (nodes, parts, source, load), stored energy ½·C·V², the charge and
 * energy the output stack holds (capacitance seen from the output with diodes open, sources
 * shorted), and two self-checks: Kirchhoff's current law at every node and step, and the
 * charge balance of every capacitor (its mean current over a period must vanish in steady state).
 */
import type { Circuit } from '../mna/circuit';
import type { PeriodRecord } from '../analysis/shooting';
import { solveDense } from '../linalg/dense-lu';

/** DC level and ripple of one node (V), with an optional one-period waveform. */
export interface NodeMeasure {
  mean: number;
  min: number;
  max: number;
  /** Peak-to-peak ripple max − min (V). */
  ripple: number;
  /** One period, ≤ the requested number of points: times (s from period start) and volts. */
  waveform?: { t: number[]; v: number[] };
}

export interface CapacitorMeasure {
  kind: 'C';
  capacitanceF: number;
  /** Mean voltage (V), terminal 1 minus terminal 2. */
  dcV: number;
  /** Largest |v| over the period (V). */
  peakV: number;
  rmsCurrentA: number;
  /** Mean current (A): ≈ 0 in steady state (charge balance). */
  meanCurrentA: number;
  /** ½·C·dcV² (J). */
  energyJ: number;
}

export interface DiodeMeasure {
  kind: 'D';
  /** Peak inverse voltage: largest v(cathode) − v(anode) (V). */
  pivV: number;
  peakCurrentA: number;
  averageCurrentA: number;
  rmsCurrentA: number;
  /** Mean of v(anode, cathode)·i, including RS (W). */
  dissipationW: number;
}

export interface ResistorMeasure {
  kind: 'R';
  meanCurrentA: number;
  rmsCurrentA: number;
  powerW: number;
}

export interface SourceMeasure {
  kind: 'V' | 'I';
  rmsCurrentA: number;
  meanCurrentA: number;
  /** Mean power delivered to the circuit (W). */
  powerW: number;
}

export type PartMeasure = CapacitorMeasure | DiodeMeasure | ResistorMeasure | SourceMeasure;

export interface PeriodMeasures {
  nodes: Record<string, NodeMeasure>;
  parts: Record<string, PartMeasure>;
  /**
   * Mean powers (W): delivered by the sources, taken by the load (elements between the outputs
   * and ground), and lost in diodes and other resistors. Efficiency = load / (load + losses).
   */
  power: { sourceW: number; loadW: number; lossW: number; efficiency: number | null };
  energy: {
    totalJ: number;
    /** Per output node: capacitance seen from it (F), its charge (C) and energy (J). */
    outputs: Record<string, { capacitanceF: number; chargeC: number; energyJ: number }>;
  };
  checks: {
    /** Largest KCL residual at any node and step, relative to the largest element current. */
    kclResidual: number;
    /** Largest |mean capacitor current| relative to the largest capacitor RMS current. */
    chargeBalance: number;
  };
}

interface Acc {
  mean: number;
  sq: number;
  min: number;
  max: number;
}

/**
 * Time average and RMS with weights h_k at the right end of each step. This matches the charge
 * bookkeeping of backward-difference integration (the step's current is the charge change over
 * the step), so capacitor charge balance and source charge come out consistent even where a
 * current pulse spans only a few steps.
 */
function average(t: Float64Array, f: (k: number) => number): Acc {
  const T = t[t.length - 1] - t[0];
  let mean = 0;
  let sq = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let k = 1; k < t.length; k++) {
    const v = f(k);
    const dt = t[k] - t[k - 1];
    mean += v * dt;
    sq += v * v * dt;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { mean: mean / T, sq: Math.sqrt(Math.max(0, sq / T)), min, max };
}

/**
 * Mean power of a branch: Σ h_k · i_k · ½(v_k + v_{k−1}) / T. With the step's current at its
 * right end and the voltage averaged over the step, Tellegen's theorem holds exactly for the sum
 * over all branches (KCL holds at every point), and a capacitor's ∫v dq telescopes to ≈ 0.
 */
function meanPower(t: Float64Array, v: (k: number) => number, i: (k: number) => number): number {
  let e = 0;
  for (let k = 1; k < t.length; k++) e += (t[k] - t[k - 1]) * i(k) * 0.5 * (v(k) + v(k - 1));
  return e / (t[t.length - 1] - t[0]);
}

function downsample(t: Float64Array, v: (k: number) => number, points: number): { t: number[]; v: number[] } {
  const T = t[t.length - 1] - t[0];
  const out = { t: [] as number[], v: [] as number[] };
  let k = 1;
  for (let p = 0; p < points; p++) {
    const tp = t[0] + (T * p) / (points - 1);
    while (k < t.length - 1 && t[k] < tp) k++;
    const a = t[k - 1];
    const b = t[k];
    const w = b > a ? Math.min(1, Math.max(0, (tp - a) / (b - a))) : 1;
    out.t.push(tp - t[0]);
    out.v.push(v(k - 1) * (1 - w) + v(k) * w);
  }
  return out;
}

/** Capacitance seen from each node to ground with diodes and resistors open, V sources shorted. */
export function capacitanceSeenFrom(circuit: Circuit, nodes: string[]): Record<string, number> {
  const n = circuit.size;
  const L = new Float64Array(n * n);
  let cmax = 0;
  for (const c of circuit.capacitors) cmax = Math.max(cmax, c.capacitanceF);
  const add = (a: number, b: number, c: number) => {
    if (a < n) L[a * n + a] += c;
    if (b < n) L[b * n + b] += c;
    if (a < n && b < n) {
      L[a * n + b] -= c;
      L[b * n + a] -= c;
    }
  };
  for (const c of circuit.capacitors) add(c.ia, c.ib, c.capacitanceF);
  for (const v of circuit.voltageSources) add(v.ip, v.in, 1e6 * (cmax || 1));
  // Nodes without any capacitor (diode junctions, branch currents) are decoupled: pin them.
  // Clusters floating with diodes open (the pumping column behind a source resistor) get a
  // 1e-6·C_max leak to ground so the system stays regular without changing the answer.
  for (let i = 0; i < n; i++) L[i * n + i] += L[i * n + i] === 0 ? cmax || 1 : 1e-6 * (cmax || 1);
  const out: Record<string, number> = {};
  for (const name of nodes) {
    const k = circuit.nodeOffset.get(name);
    if (k === undefined || k >= n) continue;
    const e = new Float64Array(n);
    e[k] = 1;
    const r = solveDense(L, n, e);
    if (r.ok && r.x[k] > 0) out[name] = 1 / r.x[k];
  }
  return out;
}

/** Voltage measures of one period: every node, capacitor voltages and energies, diode PIV. */
export interface VoltageMeasures {
  nodes: Record<string, NodeMeasure>;
  capacitors: Record<string, { dcV: number; peakV: number; energyJ: number }>;
  /** Peak inverse voltage of every diode (V, ≥ 0). */
  pivV: Record<string, number>;
  /** Energy in all capacitors at their mean voltage (J). */
  totalJ: number;
}

/**
 * Node and part voltages of a period record, without the current and power bookkeeping (used
 * on the shooting method's own converged period, whose BDF2 points carry the voltages).
 */
export function measureVoltages(circuit: Circuit, record: PeriodRecord, waveformPoints: number): VoltageMeasures {
  const t = record.timesS;
  const X = record.solutions;
  const nodes: Record<string, NodeMeasure> = {};
  for (const name of circuit.nodeNames) {
    const o = circuit.nodeOffset.get(name)!;
    const a = average(t, (k) => X[k][o]);
    nodes[name] = { mean: a.mean, min: a.min, max: a.max, ripple: a.max - a.min };
    if (waveformPoints > 1) nodes[name].waveform = downsample(t, (k) => X[k][o], waveformPoints);
  }
  const capacitors: VoltageMeasures['capacitors'] = {};
  let totalJ = 0;
  for (const c of circuit.capacitors) {
    const v = average(t, (k) => X[k][c.ia] - X[k][c.ib]);
    const energyJ = 0.5 * c.capacitanceF * v.mean * v.mean;
    totalJ += energyJ;
    capacitors[c.name] = { dcV: v.mean, peakV: Math.max(Math.abs(v.min), Math.abs(v.max)), energyJ };
  }
  const pivV: Record<string, number> = {};
  for (const d of circuit.diodes) pivV[d.name] = Math.max(0, average(t, (k) => X[k][d.ik] - X[k][d.ia]).max);
  return { nodes, capacitors, pivV, totalJ };
}

/** Charge and energy of the capacitor network seen from each output at its mean voltage. */
export function outputEnergy(circuit: Circuit, nodes: Record<string, NodeMeasure>, outputs: string[]): PeriodMeasures['energy']['outputs'] {
  const seen = capacitanceSeenFrom(circuit, outputs);
  const energyOut: PeriodMeasures['energy']['outputs'] = {};
  for (const o of outputs) {
    const c = seen[o];
    const v = nodes[o]?.mean ?? 0;
    if (c !== undefined) energyOut[o] = { capacitanceF: c, chargeC: c * Math.abs(v), energyJ: 0.5 * c * v * v };
  }
  return energyOut;
}

export function measurePeriod(circuit: Circuit, record: PeriodRecord, outputs: string[], waveformPoints: number): PeriodMeasures {
  const t = record.timesS;
  const X = record.solutions;
  const I = record.slotCurrents;
  const voltages = measureVoltages(circuit, record, waveformPoints);
  const nodes = voltages.nodes;
  const totalJ = voltages.totalJ;
  const parts: Record<string, PartMeasure> = {};
  let worstMean = 0;
  let worstRms = 0;
  for (const c of circuit.capacitors) {
    const i = average(t, (k) => I[k][c.slot]);
    worstMean = Math.max(worstMean, Math.abs(i.mean));
    worstRms = Math.max(worstRms, i.sq);
    parts[c.name] = { kind: 'C', capacitanceF: c.capacitanceF, ...voltages.capacitors[c.name], rmsCurrentA: i.sq, meanCurrentA: i.mean };
  }
  const diodeCurrent = (d: Circuit['diodes'][number], k: number) => d.staticCurrent(X[k]) + (d.slot >= 0 ? I[k][d.slot] : 0);
  for (const d of circuit.diodes) {
    const i = average(t, (k) => diodeCurrent(d, k));
    const p = { mean: meanPower(t, (k) => X[k][d.ia] - X[k][d.ik], (k) => diodeCurrent(d, k)) };
    parts[d.name] = { kind: 'D', pivV: voltages.pivV[d.name], peakCurrentA: i.max, averageCurrentA: i.mean, rmsCurrentA: i.sq, dissipationW: p.mean };
  }
  const outSet = new Set(outputs.map((o) => circuit.nodeOffset.get(o)));
  const ground = circuit.size;
  const isLoad = (a: number, b: number) => (outSet.has(a) || outSet.has(b)) && (outSet.has(a) || a === ground) && (outSet.has(b) || b === ground);
  let loadW = 0;
  let lossW = 0;
  for (const d of circuit.diodes) lossW += (parts[d.name] as DiodeMeasure).dissipationW;
  for (const r of circuit.resistors) {
    const i = average(t, (k) => r.current(X[k]));
    const p = { mean: meanPower(t, (k) => X[k][r.ia] - X[k][r.ib], (k) => r.current(X[k])) };
    parts[r.name] = { kind: 'R', meanCurrentA: i.mean, rmsCurrentA: i.sq, powerW: p.mean };
    if (isLoad(r.ia, r.ib)) loadW += p.mean;
    else lossW += p.mean;
  }
  let sourceW = 0;
  for (const v of circuit.voltageSources) {
    const i = average(t, (k) => X[k][v.ibr]);
    const p = { mean: -meanPower(t, (k) => X[k][v.ip] - X[k][v.in], (k) => X[k][v.ibr]) };
    parts[v.name] = { kind: 'V', rmsCurrentA: i.sq, meanCurrentA: i.mean, powerW: p.mean };
    sourceW += p.mean;
  }
  for (const s of circuit.currentSources) {
    const i = average(t, (k) => s.value(t[k]));
    const p = { mean: -meanPower(t, (k) => X[k][s.ip] - X[k][s.in], (k) => s.value(t[k])) };
    parts[s.name] = { kind: 'I', rmsCurrentA: i.sq, meanCurrentA: i.mean, powerW: p.mean };
    if (isLoad(s.ip, s.in)) loadW -= p.mean;
    else sourceW += p.mean;
  }
  // Kirchhoff's current law at every node and accepted point.
  let kcl = 0;
  let scale = 0;
  const sum = new Float64Array(circuit.size + 1);
  for (let k = 1; k < t.length; k++) {
    sum.fill(0);
    const x = X[k];
    const flow = (a: number, b: number, i: number) => {
      sum[a] += i;
      sum[b] -= i;
      scale = Math.max(scale, Math.abs(i));
    };
    for (const r of circuit.resistors) flow(r.ia, r.ib, r.current(x));
    for (const c of circuit.capacitors) flow(c.ia, c.ib, I[k][c.slot]);
    for (const d of circuit.diodes) flow(d.ia, d.ik, diodeCurrent(d, k) + 1e-12 * (x[d.ij] - x[d.ik]));
    for (const v of circuit.voltageSources) flow(v.ip, v.in, x[v.ibr]);
    for (const s of circuit.currentSources) flow(s.ip, s.in, s.value(t[k]));
    for (const name of circuit.nodeNames) kcl = Math.max(kcl, Math.abs(sum[circuit.nodeOffset.get(name)!]));
  }
  const energyOut = outputEnergy(circuit, nodes, outputs);
  return {
    nodes,
    parts,
    power: { sourceW, loadW, lossW, efficiency: loadW + lossW > 0 ? loadW / (loadW + lossW) : null },
    energy: { totalJ, outputs: energyOut },
    checks: { kclResidual: scale > 0 ? kcl / scale : 0, chargeBalance: worstRms > 0 ? worstMean / worstRms : 0 },
  };
}
