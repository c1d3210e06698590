/**
 * One entry point for the closed-form estimates of a ladder (REFERENCES §1–§6): it picks the
 * half-wave (§1), full-wave (§2) or bipolar (§3) equations and adds stresses, stored energy,
 * warm-up and the stray-capacitance and diode-drop corrections (§5, §6). All results are plain
 * SI numbers; drops and ripple use the exact crest model for arbitrary (graded) capacitors
 * (§1.3), the textbook drop is reported beside it. Runs in microseconds.
 */
import type { Netlist } from '../netlist/types';
import { bipolarDropMaxCoefficient, bipolarDropMeanCoefficient, bipolarRippleCoefficient } from './bipolar';
import {
  fullWaveDropMaxCoefficient,
  fullWaveDropMeanCoefficient,
  fullWaveOptimumStagesCubic,
  fullWaveOptimumStagesLeading,
  fullWaveRippleCoefficient,
  fullWaveTextbookDropV,
  fullWaveWarmupCycles,
} from './full-wave';
import {
  halfWaveDropMaxCoefficient,
  halfWaveDropMeanCoefficient,
  halfWaveRippleCoefficient,
  halfWaveWarmupCycles,
  maxOutputLeadingV,
  optimumStagesCubic,
  optimumStagesLeading,
  textbookDropV,
  textbookLoadedOutputV,
} from './half-wave';
import { capacitorEnergyJ, capacitorNoLoadV, diodePivV, outputStack, strayEfficiency } from './stresses';

/** Which set of design equations to use (REFERENCES §1 half-wave, §2 full-wave, §3 bipolar). */
export type EstimateTopology = 'half-wave' | 'full-wave' | 'symmetric';

/** Inputs of the closed-form estimate, SI units; capacitor arrays bottom stage first. */
export interface EstimateInput {
  topology: EstimateTopology;
  /** Full stages per ladder (×2n each). */
  stages: number;
  /** Peak of the drive at the ladder input (V); per leg for a centre-tapped drive. */
  drivePeakV: number;
  frequencyHz: number;
  /** Pumping capacitance per stage (F), bottom first. Full-wave: both columns (pass their mean). */
  pumpC: number[];
  /** Smoothing capacitance per stage (F), bottom first. */
  smoothC: number[];
  /** DC load current (A); for `symmetric` the current through the load across both outputs. */
  loadCurrentA: number;
  /** Constant forward drop per diode (V), default 0. */
  diodeForwardDropV?: number;
  /** Stray capacitance from every pumping-column node to ground (F), default 0. */
  strayCapacitanceF?: number;
}

/** No-load voltage stress and stored energy of one stage capacitor. */
export interface CapacitorStress {
  stage: number;
  role: 'pumpC' | 'pump2C' | 'smoothC';
  /** Which ladder of a symmetric pair (`positive` for single ladders). */
  ladder: 'positive' | 'negative';
  /** No-load DC voltage across the part (V, magnitude). */
  voltageV: number;
  capacitanceF: number;
  energyJ: number;
}

/** Closed-form results; units in the names, ripple peak-to-peak, drops below the ideal 2nVp. */
export interface EstimateResult {
  topology: EstimateTopology;
  stages: number;
  /** The drive peak (V) and frequency (Hz) the estimate used. */
  drivePeakV: number;
  frequencyHz: number;
  /** Ideal no-load output 2nVp (4nVp across both outputs for `symmetric`) (V, magnitude). */
  idealNoLoadV: number;
  /** No-load output with the stray-capacitance efficiency and the −2nVf diode correction (V). */
  noLoadV: number;
  /** Stray-capacitance efficiency η = V0/(2nVp) (REFERENCES §5); 1 without strays. */
  strayEfficiency: number;
  /** Diode-drop correction −2n·Vf per ladder, summed (V, ≤ 0). */
  diodeDropCorrectionV: number;
  /** u = I/(fC̄) with C̄ the mean stage capacitance (V). */
  unitDropV: number;
  /** Exact crest-model fall of the output mean (V). */
  dropMeanV: number;
  /** Exact crest-model fall of the output maximum (V). */
  dropMaxV: number;
  /** Textbook drop formula at the mean capacitance (half-wave [S1][S2]; full-wave [S2]; symmetric 2× half-wave) (V). */
  textbookDropV: number;
  /** Ripple peak-to-peak (V). */
  rippleV: number;
  /** Ripple frequency (Hz): f half-wave, 2f full-wave and symmetric (V+ − V−). */
  rippleFrequencyHz: number;
  /** Loaded DC output, noLoadV − dropMeanV (V). */
  outputMeanV: number;
  /** Ripple p-p over the mean output. */
  rippleFraction: number;
  /** Leading-order optimum stages per ladder (∞ at zero load). */
  optimumStages: number;
  /** Optimum from the full cubic (half-wave textbook [S2]; full-wave derived mean drop). */
  optimumStagesCubic: number;
  /** Output at the leading-order optimum, (4/3)·n_opt·Vp per ladder (V; ∞ at zero load). */
  maxOutputV: number;
  /** Output at the full-cubic optimum with the same drop formula the cubic maximises (V; ∞ at zero load). */
  maxOutputCubicV: number;
  /** Incremental output impedance dV/dI of the crest model (Ω). */
  outputImpedanceOhm: number;
  /** No-load voltage and energy of every stage capacitor. */
  capacitorV: CapacitorStress[];
  /** Peak inverse voltage of every diode, 2Vp (V). */
  diodePivV: number;
  /** Average forward current per diode: I half-wave and symmetric, I/2 full-wave (A). */
  diodeAvgCurrentA: number;
  /** Rectified-average source current: ≈ 2nI half-wave, nI per leg full-wave, 4nI symmetric (A) (REFERENCES §5, deriv). */
  sourceAvgCurrentA: number;
  /** Input power ≈ I·(ideal no-load output) (W) (REFERENCES §5 power balance). */
  inputPowerW: number;
  /** Energy in all stage capacitors at no load (J). */
  storedEnergyJ: number;
  /** Energy of the smoothing stack(s) seen from the output(s) (J). */
  outputEnergyJ: number;
  /** Charge of one smoothing stack at the output, C_eq·V (C). */
  outputChargeC: number;
  /** Equivalent capacitance of one smoothing stack (F). */
  outputCapacitanceF: number;
  /** Cycles to 90 % and 99 % of the final output from power-on (REFERENCES §6). */
  warmupCycles90: number;
  warmupCycles99: number;
  /** The same as times (s). */
  warmupTime90S: number;
  warmupTime99S: number;
}

function mean(values: number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

/**
 * Closed-form estimate of a half-wave, full-wave or symmetric ladder. Throws RangeError only on a
 * broken invariant of the input (stage count not a positive integer, capacitor arrays of the wrong
 * length, non-positive frequency or capacitance).
 */
export function estimateLadder(input: EstimateInput): EstimateResult {
  const n = input.stages;
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`stages must be a positive integer, got ${n}`);
  if (input.pumpC.length !== n || input.smoothC.length !== n) throw new RangeError('pumpC and smoothC need one value per stage');
  if (!(input.frequencyHz > 0)) throw new RangeError('frequencyHz must be positive');
  if (![...input.pumpC, ...input.smoothC].every((c) => c > 0 && Number.isFinite(c))) throw new RangeError('capacitances must be positive');
  const { topology, drivePeakV: vp, frequencyHz: f, pumpC, smoothC } = input;
  const current = Math.abs(input.loadCurrentA);
  const vf = input.diodeForwardDropV ?? 0;
  const q = current / f;
  const cMean = mean([...pumpC, ...smoothC]);
  const ladders = topology === 'symmetric' ? 2 : 1;

  let dropMeanK: number;
  let dropMaxK: number;
  let rippleK: number;
  let textbook: number;
  let nOpt: number;
  let nOptCubic: number;
  let warm: { cycles90: number; cycles99: number };
  let cubicOutput: (stages: number) => number;
  if (topology === 'full-wave') {
    dropMeanK = fullWaveDropMeanCoefficient(pumpC, smoothC);
    dropMaxK = fullWaveDropMaxCoefficient(pumpC);
    rippleK = fullWaveRippleCoefficient(smoothC);
    textbook = fullWaveTextbookDropV(n, current, f, cMean);
    nOpt = fullWaveOptimumStagesLeading(vp, f, cMean, current);
    nOptCubic = fullWaveOptimumStagesCubic(vp, f, cMean, current);
    cubicOutput = (m) => 2 * m * vp - (q / cMean) * (m ** 3 / 6 + m ** 2 / 4 + m / 3);
    warm = fullWaveWarmupCycles(n);
  } else {
    const sym = topology === 'symmetric';
    dropMeanK = sym ? bipolarDropMeanCoefficient(pumpC, smoothC) : halfWaveDropMeanCoefficient(pumpC, smoothC);
    dropMaxK = sym ? bipolarDropMaxCoefficient(pumpC, smoothC) : halfWaveDropMaxCoefficient(pumpC, smoothC);
    rippleK = sym ? bipolarRippleCoefficient(smoothC) : halfWaveRippleCoefficient(smoothC);
    textbook = ladders * textbookDropV(n, current, f, cMean);
    nOpt = optimumStagesLeading(vp, f, cMean, current);
    nOptCubic = optimumStagesCubic(vp, f, cMean, current);
    cubicOutput = (m) => ladders * textbookLoadedOutputV(m, vp, current, f, cMean);
    warm = halfWaveWarmupCycles(n);
  }

  const eta = strayEfficiency(n, (input.strayCapacitanceF ?? 0) / mean(pumpC));
  const idealNoLoadV = ladders * 2 * n * vp;
  const diodeCorr = ladders * -2 * n * vf;
  const noLoadV = idealNoLoadV * eta + diodeCorr;
  const dropMeanV = q * dropMeanK;
  const outputMeanV = noLoadV - dropMeanV;
  const rippleV = q * rippleK;

  const capacitorV: CapacitorStress[] = [];
  const pols: Array<'positive' | 'negative'> = ladders === 2 ? ['positive', 'negative'] : ['positive'];
  for (const ladder of pols) {
    for (let k = 1; k <= n; k++) {
      const roles: Array<['pumpC' | 'pump2C' | 'smoothC', number]> = [
        ['pumpC', pumpC[k - 1]],
        ...(topology === 'full-wave' ? [['pump2C', pumpC[k - 1]] as ['pump2C', number]] : []),
        ['smoothC', smoothC[k - 1]],
      ];
      for (const [role, c] of roles) {
        const v = capacitorNoLoadV(role, k, vp, vf);
        capacitorV.push({ stage: k, role, ladder, voltageV: v, capacitanceF: c, energyJ: capacitorEnergyJ(c, v) });
      }
    }
  }
  const stack = outputStack(smoothC, 2 * n * (vp - vf));

  return {
    topology,
    stages: n,
    drivePeakV: vp,
    frequencyHz: f,
    idealNoLoadV,
    noLoadV,
    strayEfficiency: eta,
    diodeDropCorrectionV: diodeCorr,
    unitDropV: q / cMean,
    dropMeanV,
    dropMaxV: q * dropMaxK,
    textbookDropV: textbook,
    rippleV,
    rippleFrequencyHz: topology === 'half-wave' ? f : 2 * f,
    outputMeanV,
    rippleFraction: outputMeanV > 0 ? rippleV / outputMeanV : Infinity,
    optimumStages: nOpt,
    optimumStagesCubic: nOptCubic,
    maxOutputV: ladders * maxOutputLeadingV(nOpt, vp),
    maxOutputCubicV: current > 0 ? cubicOutput(nOptCubic) : Infinity,
    outputImpedanceOhm: dropMeanK / f,
    capacitorV,
    diodePivV: diodePivV(vp),
    diodeAvgCurrentA: topology === 'full-wave' ? current / 2 : current,
    sourceAvgCurrentA: topology === 'full-wave' ? n * current : ladders * 2 * n * current,
    inputPowerW: current * idealNoLoadV,
    storedEnergyJ: capacitorV.reduce((s, c) => s + c.energyJ, 0),
    outputEnergyJ: ladders * stack.energyJ,
    outputChargeC: stack.chargeC,
    outputCapacitanceF: stack.equivalentF,
    warmupCycles90: warm.cycles90,
    warmupCycles99: warm.cycles99,
    warmupTime90S: warm.cycles90 / f,
    warmupTime99S: warm.cycles99 / f,
  };
}

/** Minimal view of a topology report that `estimateFromNetlist` needs (see `compile/topology.ts`). */
export interface EstimateTopologyView {
  kind: 'half-wave' | 'full-wave' | 'symmetric' | 'custom';
  ladders: Array<{
    variant: 'half-wave' | 'full-wave';
    stages: number;
    drivePeakV: number;
    frequencyHz: number;
    loadCurrentA: number;
    stageElements: Array<{ pumpC?: string; smoothC?: string; pump2C?: string; diodes: string[] }>;
  }>;
  strayCapacitors?: string[];
}

/**
 * Extract the estimate inputs from a recognised netlist and run {@link estimateLadder}. Returns
 * null for custom topologies, missing capacitors or a missing drive. Symmetric pairs use the
 * positive ladder's parts and the larger of the two ladders' load currents.
 */
export function estimateFromNetlist(netlist: Netlist, topology: EstimateTopologyView): EstimateResult | null {
  if (topology.kind === 'custom' || topology.ladders.length === 0) return null;
  const caps = new Map<string, number>();
  for (const el of netlist.elements) if (el.kind === 'C') caps.set(el.name, el.capacitanceF);
  const ladder = topology.ladders[0];
  if (topology.kind === 'symmetric' && topology.ladders[1]?.stages !== ladder.stages) return null;
  const pumpC: number[] = [];
  const smoothC: number[] = [];
  for (const s of ladder.stageElements) {
    const p = s.pumpC !== undefined ? caps.get(s.pumpC) : undefined;
    const p2 = s.pump2C !== undefined ? caps.get(s.pump2C) : undefined;
    const c = s.smoothC !== undefined ? caps.get(s.smoothC) : undefined;
    if (p === undefined || c === undefined || !(p > 0) || !(c > 0)) return null;
    if (topology.kind === 'full-wave' && (p2 === undefined || !(p2 > 0))) return null;
    pumpC.push(p2 !== undefined ? (p + p2) / 2 : p);
    smoothC.push(c);
  }
  if (!(ladder.drivePeakV > 0) || !(ladder.frequencyHz > 0)) return null;
  const strays = (topology.strayCapacitors ?? []).map((name) => caps.get(name) ?? 0);
  const loadCurrentA = Math.max(...topology.ladders.map((l) => l.loadCurrentA));
  return estimateLadder({
    topology: topology.kind,
    stages: ladder.stages,
    drivePeakV: ladder.drivePeakV,
    frequencyHz: ladder.frequencyHz,
    pumpC,
    smoothC,
    loadCurrentA,
    ...(strays.length > 0 ? { strayCapacitanceF: strays.reduce((s, v) => s + v, 0) / strays.length } : {}),
  });
}
