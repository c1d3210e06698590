/**
 * The engine's public solve: netlist → devices bound into one MNA system → periodic steady
 * state by shooting–Newton (see `shooting.ts`) → measures over the converged period, and
 * optionally the warm-up transient from power-on (all capacitors empty) integrated until the
 * output's per-cycle mean reaches 99 % of its steady-state mean. Every solve has a wall-clock
 * budget and returns a plain, serialisable value; failures are `{ ok: false, reason }`.
 */
import type { Netlist } from '../netlist/types';
import { buildCircuit, driveAmplitudeV, type Circuit, type SolverDiagnostic } from '../mna/circuit';
import { measurePeriod, measureVoltages, outputEnergy, type NodeMeasure, type PartMeasure, type PeriodMeasures } from '../measures/period-measures';
import { crestGuess, type CrestGuess } from './crest-guess';
import { noLoadGuess } from './initial-guess';
import { safetySummary, type SafetySummary } from '../measures/safety-summary';
import { solveOperatingPoint } from './operating-point';
import { integratePeriod, relResidual, shootPeriodicSteadyState } from './shooting';
import { TransientEngine, type StepControl } from './transient';
import { warmupFromPowerOn, type WarmupResult } from './warmup';

export type { WarmupResult } from './warmup';
import { backwardEuler } from '../integration/methods';
import { DenseLu } from '../linalg/dense-lu';

export interface SolveOptions {
  /** Also integrate the warm-up transient from power-on. Default false. */
  warmup?: boolean;
  /** Wall-clock budget for the whole solve (ms). Default 20 000. */
  budgetMs?: number;
  /** Output node names; default: the node(s) with the largest |mean|. */
  outputNodes?: string[];
  /** Waveform points per node (0 = none). Default 200, at most 400. */
  waveformPoints?: number;
  /** Relative period-to-period change accepted as steady state. Default 1e-6. */
  tolerance?: number;
  /** LTE tolerance relative to the drive amplitude. Default: 1e-4 of the output ripple the crest model predicts, within 1e-7…1e-5. */
  lteRel?: number;
  /** Largest time step as a fraction of the period. Default 1/100. */
  maxStepFraction?: number;
}

export interface SolveStats {
  solveMs: number;
  newtonIterations: number;
  shootingIterations: number;
  periodsIntegrated: number;
  /** Accepted time points in the steady-state period. */
  steps: number;
  unknowns: number;
  bandwidth: { lower: number; upper: number };
  /** Period-to-period change of the converged state (relative). */
  residual: number;
  /** Wall time of the phases (ms): initial state, shooting, measuring periods and measures. */
  phaseMs?: { guess: number; shooting: number; measuring: number };
  warmupMs?: number;
}

export type SolveResult =
  | {
      ok: true;
      periodS: number;
      frequencyHz: number;
      outputs: { node: string; polarity: 'positive' | 'negative' }[];
      nodes: Record<string, NodeMeasure>;
      parts: Record<string, PartMeasure>;
      power: PeriodMeasures['power'];
      energy: PeriodMeasures['energy'];
      checks: PeriodMeasures['checks'];
      /** Node voltage classes, stack charge and energy, discharge path and time, bleeder, warnings. */
      safety: SafetySummary;
      warmup?: WarmupResult;
      stats: SolveStats;
      diagnostics: SolverDiagnostic[];
    }
  | { ok: false; reason: string; diagnostics: SolverDiagnostic[]; stats?: Partial<SolveStats> };

function drivePeriod(circuit: Circuit): { ok: true; frequencyHz: number; amplitude: number } | { ok: false; reason: string } {
  const freqs = circuit.sources.map((s) => s.frequencyHz()).filter((f) => f > 0);
  const amplitude = driveAmplitudeV(circuit);
  for (const v of circuit.voltageSources) {
    if (v.sine && v.sine.damping !== 0) return { ok: false, reason: `${v.name}: a damped sine (THETA ≠ 0) has no periodic steady state` };
  }
  if (freqs.length === 0) return { ok: true, frequencyHz: 0, amplitude };
  const f0 = Math.min(...freqs);
  for (const f of freqs) {
    const r = f / f0;
    if (Math.abs(r - Math.round(r)) > 1e-9 * r) return { ok: false, reason: `source frequencies ${f0} Hz and ${f} Hz are not harmonics of one period` };
  }
  return { ok: true, frequencyHz: f0, amplitude };
}

/** Picks output nodes: the largest positive mean, and the most negative one if comparable. */
function pickOutputs(nodes: Record<string, NodeMeasure>): { node: string; polarity: 'positive' | 'negative' }[] {
  let pos: [string, number] | null = null;
  let neg: [string, number] | null = null;
  for (const [name, m] of Object.entries(nodes)) {
    if (m.mean > 0 && (!pos || m.mean > pos[1])) pos = [name, m.mean];
    if (m.mean < 0 && (!neg || m.mean < neg[1])) neg = [name, m.mean];
  }
  const out: { node: string; polarity: 'positive' | 'negative' }[] = [];
  const big = Math.max(pos?.[1] ?? 0, -(neg?.[1] ?? 0));
  if (pos && pos[1] >= 0.5 * big) out.push({ node: pos[0], polarity: 'positive' });
  if (neg && -neg[1] >= 0.5 * big) out.push({ node: neg[0], polarity: 'negative' });
  return out;
}

/**
 * LTE tolerance per step relative to the drive amplitude: 1e-4 of the smallest ripple
 * the outputs will show (from the crest model), between 1e-7 and 1e-5. Drops and ripple are
 * small differences of kilovolt nodes at light load, so a fixed tolerance either wastes steps
 * at heavy load or misses them at light load.
 */
function defaultLteRel(circuit: Circuit, crest: CrestGuess | null, vScale: number): number {
  if (!crest) return 1e-6;
  let biggest = 0;
  for (const name of circuit.nodeNames) biggest = Math.max(biggest, Math.abs(crest.mean[circuit.nodeOffset.get(name)!]));
  let ripple = Infinity;
  for (const name of circuit.nodeNames) {
    const o = circuit.nodeOffset.get(name)!;
    if (Math.abs(crest.mean[o]) >= 0.5 * biggest) ripple = Math.min(ripple, crest.swing[o]);
  }
  if (!Number.isFinite(ripple)) return 1e-6;
  return Math.min(1e-5, Math.max(1e-7, (1e-4 * ripple) / vScale));
}

/** Periodic steady state (and optionally warm-up) of a netlist. */
export function solveNetlist(netlist: Netlist, options: SolveOptions = {}): SolveResult {
  const started = performance.now();
  const deadline = started + (options.budgetMs ?? 20_000);
  const built = buildCircuit(netlist);
  if (!built.ok) return { ok: false, reason: built.reason, diagnostics: built.diagnostics };
  const circuit = built.circuit;
  const diagnostics: SolverDiagnostic[] = [];
  const drive = drivePeriod(circuit);
  if (!drive.ok) return { ok: false, reason: drive.reason, diagnostics: [{ severity: 'error', code: 'not-periodic', message: drive.reason }] };
  if (drive.frequencyHz === 0) {
    const op = solveOperatingPoint(circuit);
    if (!op.ok) return { ok: false, reason: op.reason, diagnostics: [{ severity: 'error', code: 'no-convergence', message: op.reason }] };
    const nodes: Record<string, NodeMeasure> = {};
    for (const name of circuit.nodeNames) {
      const v = op.x[circuit.nodeOffset.get(name)!];
      nodes[name] = { mean: v, min: v, max: v, ripple: 0 };
    }
    diagnostics.push({ severity: 'info', code: 'dc-only', message: `no AC source: DC operating point by ${op.method}` });
    const dcOutputs = options.outputNodes?.map((node) => ({ node, polarity: ((nodes[node]?.mean ?? 0) < 0 ? 'negative' : 'positive') as 'positive' | 'negative' })) ?? pickOutputs(nodes);
    let totalJ = 0;
    for (const c of circuit.capacitors) totalJ += 0.5 * c.capacitanceF * (op.x[c.ia] - op.x[c.ib]) ** 2;
    const dcEnergy = { totalJ, outputs: outputEnergy(circuit, nodes, dcOutputs.map((o) => o.node)) };
    return {
      ok: true,
      periodS: 0,
      frequencyHz: 0,
      outputs: dcOutputs,
      nodes,
      parts: {},
      power: { sourceW: 0, loadW: 0, lossW: 0, efficiency: null },
      energy: dcEnergy,
      checks: { kclResidual: 0, chargeBalance: 0 },
      safety: safetySummary(circuit, nodes, dcEnergy, dcOutputs.map((o) => o.node)),
      stats: { solveMs: performance.now() - started, newtonIterations: op.iterations, shootingIterations: 0, periodsIntegrated: 0, steps: 0, unknowns: circuit.size, bandwidth: circuit.band, residual: 0 },
      diagnostics,
    };
  }
  const periodS = 1 / drive.frequencyHz;
  const vScale = drive.amplitude > 0 ? drive.amplitude : 1;
  // The loaded crest-model state is usually within a few volts of the answer, so shooting starts
  // with full Newton steps; the no-load state is the fallback and needs the continuation.
  const guessStarted = performance.now();
  const crest = crestGuess(circuit, drive.frequencyHz);
  const control: StepControl = {
    hMaxS: periodS * (options.maxStepFraction ?? 0.01),
    hMinS: periodS * 1e-9,
    hInitS: periodS * 1e-4,
    lteRel: options.lteRel ?? defaultLteRel(circuit, crest, vScale),
    lteAbsV: 1e-9 * vScale,
    vScaleV: vScale,
    deadlineMs: deadline,
  };
  const guess = crest ?? noLoadGuess(circuit, drive.frequencyHz);
  const engine = new TransientEngine(circuit);
  const s0 = guess?.branchV ?? new Float64Array(circuit.slots.length);
  if (!guess) diagnostics.push({ severity: 'warning', code: 'no-guess', message: 'no-load initial guess failed; starting from empty capacitors' });
  else if (!crest) diagnostics.push({ severity: 'info', code: 'no-load-guess', message: 'the crest model does not apply; shooting starts from the no-load state' });
  const shootStarted = performance.now();
  const shot = shootPeriodicSteadyState(circuit, engine, s0, guess?.x, {
    periodS,
    tolerance: options.tolerance ?? 1e-6,
    maxIterations: 80,
    control,
    freezeBelow: 1e-4,
    warmupPeriods: crest ? 0 : 1,
    initialPeriods: 1,
    newtonBelow: crest ? 1e-3 : undefined,
  });
  const measureStarted = performance.now();
  const statsBase = {
    newtonIterations: engine.newton.totalIterations,
    periodsIntegrated: shot.periodsIntegrated,
    shootingIterations: shot.iterations,
    unknowns: circuit.size,
    bandwidth: circuit.band,
    residual: shot.residual,
  };
  if (!shot.ok) {
    return {
      ok: false,
      reason: shot.reason,
      diagnostics: [...diagnostics, { severity: 'error', code: 'no-steady-state', message: shot.reason }],
      stats: { ...statsBase, solveMs: performance.now() - started },
    };
  }
  // Currents, charges and powers come from one more period from the converged state with
  // backward Euler: its step current is exactly the step's charge change, so with
  // KCL at every point the diode and source charges per period are exact sums, and the
  // capacitors' ∫v·dq telescopes to zero. Node and part voltages come from the converged BDF2
  // period itself (second order, on the step grid its error control chose).
  // Backward Euler's own periodic state differs from BDF2's by the methods' error; one chord
  // step with the shooting's monodromy moves the start onto it, so that the measuring period is
  // periodic too and its energy balance closes (stored energy returns to where it started).
  // Its own error control resolves the conduction pulses: peak, RMS and mean currents move by
  // < 0.3 % between hMax = T/100 and T/1600 on the 4- and 20-stage benchmark ladders.
  const fine: StepControl = { ...control };
  const measuring = new TransientEngine(circuit, backwardEuler);
  const relChange = (from: Float64Array, to: Float64Array) => relResidual(from, to, 1e-6 * vScale).rel;
  let check = integratePeriod(measuring, shot.state, shot.run.record.solutions[0], periodS, fine, false);
  let measuredFrom = shot.state;
  if (check.ok) {
    const first = check.run;
    const mSlots = shot.state.length;
    const a = new Float64Array(mSlots * mSlots);
    for (let i = 0; i < a.length; i++) a[i] = -shot.monodromy[i];
    for (let j = 0; j < mSlots; j++) a[j * mSlots + j] += 1;
    const lu = DenseLu.factor(a, mSlots);
    if (lu.ok) {
      const r = new Float64Array(mSlots);
      for (let j = 0; j < mSlots; j++) r[j] = first.endV[j] - shot.state[j];
      const d = lu.lu.solve(r);
      const start = Float64Array.from(shot.state, (v, j) => v + d[j]);
      const again = integratePeriod(measuring, start, first.record.solutions[0], periodS, fine, false);
      if (again.ok && relChange(start, again.run.endV) < relChange(shot.state, first.endV)) {
        check = again;
        measuredFrom = start;
      }
    }
    diagnostics.push({ severity: 'info', code: 'period-check', message: `period-to-period change on the backward-Euler measuring grid ${relChange(measuredFrom, check.run.endV).toExponential(2)} (relative)` });
  }
  const record = check.ok ? check.run.record : shot.run.record;
  const points = Math.min(400, Math.max(0, options.waveformPoints ?? 200));
  const v = measureVoltages(circuit, shot.run.record, points);
  const outputs = options.outputNodes?.map((node) => ({ node, polarity: ((v.nodes[node]?.mean ?? 0) < 0 ? 'negative' : 'positive') as 'positive' | 'negative' })) ?? pickOutputs(v.nodes);
  const outputNames = outputs.map((o) => o.node);
  const m = measurePeriod(circuit, record, outputNames, 0);
  m.nodes = v.nodes;
  for (const [name, part] of Object.entries(m.parts)) {
    if (part.kind === 'C' && v.capacitors[name]) Object.assign(part, v.capacitors[name]);
    if (part.kind === 'D' && v.pivV[name] !== undefined) part.pivV = v.pivV[name];
  }
  m.energy = { totalJ: v.totalJ, outputs: outputEnergy(circuit, v.nodes, outputNames) };
  const safety = safetySummary(circuit, m.nodes, m.energy, outputNames);
  const solveMs = performance.now() - started;
  const phaseMs = { guess: shootStarted - guessStarted, shooting: measureStarted - shootStarted, measuring: performance.now() - measureStarted };
  let warmup: WarmupResult | undefined;
  let warmupMs: number | undefined;
  if (options.warmup && outputs.length > 0) {
    const w0 = performance.now();
    const w = warmupFromPowerOn(circuit, {
      periodS,
      outputNode: outputs[0].node,
      finalMeanV: m.nodes[outputs[0].node].mean,
      control: { hMaxS: periodS / 40, hMinS: periodS * 1e-9, hInitS: periodS * 1e-4, lteRel: 2e-5, lteAbsV: 1e-8 * vScale, vScaleV: vScale, deadlineMs: deadline },
      // One cycle per diode before envelope steps: the stages start conducting one by one.
      bruteCycles: Math.max(8, circuit.diodes.length),
    });
    warmupMs = performance.now() - w0;
    if (w.ok) warmup = w.result;
    else diagnostics.push({ severity: 'warning', code: 'warmup-incomplete', message: w.reason });
    if (w.ok && w.result.t99 === null) diagnostics.push({ severity: 'warning', code: 'warmup-incomplete', message: 'warm-up stopped before 99 % of the steady-state output' });
  }
  return {
    ok: true,
    periodS,
    frequencyHz: drive.frequencyHz,
    outputs,
    nodes: m.nodes,
    parts: m.parts,
    power: m.power,
    energy: m.energy,
    checks: m.checks,
    safety,
    warmup,
    stats: { ...statsBase, newtonIterations: engine.newton.totalIterations, solveMs, steps: shot.run.steps, phaseMs, warmupMs },
    diagnostics,
  };
}

/** Periodic steady state only. */
export function solveSteadyState(netlist: Netlist, options: Omit<SolveOptions, 'warmup'> = {}): SolveResult {
  return solveNetlist(netlist, { ...options, warmup: false });
}

/** Steady state plus the warm-up transient from power-on. */
export function solveWarmup(netlist: Netlist, options: Omit<SolveOptions, 'warmup'> = {}): SolveResult {
  return solveNetlist(netlist, { ...options, warmup: true });
}
