/**
 * Safety checks of a ladder design: the voltage class of a node against the usual standards'
 * thresholds, bleeder sizing and discharge time, and stored charge and energy warnings. The
 * thresholds are those collected in REFERENCES §7; several are quoted there from memory of the
 * standards (marked (mem) below) — they are screening values for a design tool, not a
 * certification. Discharge follows REFERENCES §6: a bleeder R_b across an n-stage stack of C sees
 * the smoothing stack C_eq = C/n, τ = R_b·C/n, V(t) = V0·e^(−t/τ), E(t) = E0·e^(−2t/τ).
 */

/** IEC 61010-1:2010 §6.3.1 a), normal condition, dry locations (mem): hazardous live above these. */
export const IEC61010_NORMAL = { dcV: 60, peakV: 42.4, rmsV: 30 } as const;
/** IEC 61010-1 §6.3.1 a), wet locations (mem). */
export const IEC61010_WET = { dcV: 35, peakV: 22.6, rmsV: 16 } as const;
/** IEC 62368-1 Table 4, steady state (mem): ES1 limits. */
export const IEC62368_ES1 = { dcV: 60, peakV: 42.4, rmsV: 30 } as const;
/** IEC 62368-1 Table 4, steady state (mem): ES2 limits; above them is ES3. */
export const IEC62368_ES2 = { dcV: 120, peakV: 70.7, rmsV: 50 } as const;
/** IEC 61010-1 §6.3.1 c): stored charge limit up to 15 kV, 45 µC ("Line A of Figure 3", confirmed by [S13]). */
export const STORED_CHARGE_LIMIT_C = 45e-6;
/** Voltage up to which the charge limit applies (V). */
export const CHARGE_LIMIT_UP_TO_V = 15e3;
/** IEC 61010-1 §6.3.1 c): stored energy limit above 15 kV, 350 mJ (mem; also IEC 60335-1 §8.1.4 [S12]). */
export const STORED_ENERGY_LIMIT_J = 0.35;
/** IEC 60950-1 §1.2.8.10 "hazardous energy level", 20 J stored (mem; superseded by IEC 62368-1). */
export const HAZARDOUS_ENERGY_J = 20;
/** Safe residual voltage (V): discharge to ≤ 60 V within 5 s, IEC 60204-1 §6.2.4 [S14] and IEC 61010-1 §6.10.3 [S13] (common practice target). */
export const SAFE_RESIDUAL_V = 60;
/** Discharge time limit to the safe residual voltage (s). */
export const DISCHARGE_TIME_LIMIT_S = 5;

/** A node voltage to ground as the solver reports it. */
export interface VoltageReading {
  /** DC level (mean) of the node to ground (V). */
  dcV: number;
  /** Largest instantaneous magnitude |v| to ground (V). */
  peakV: number;
  /** RMS of the AC (ripple) component (V), if known. */
  rmsV?: number;
}

/** IEC 62368-1 electrical energy source classes (mem). */
export type Iec62368Class = 'ES1' | 'ES2' | 'ES3';

/** Outcome of {@link classifyVoltage}. */
export interface VoltageClass {
  /** IEC 61010-1 normal condition: would an accessible part at this voltage be hazardous live (mem)? */
  hazardousLive: boolean;
  /** IEC 62368-1 electrical energy source class by voltage alone (mem); touch current and charge limits not applied. */
  iec62368: Iec62368Class;
  /** Output or tap above 60 V DC (the REFERENCES §7 tool warning). */
  above60VDC: boolean;
  /** Which limits were exceeded, in words. */
  reasons: string[];
}

function exceeds(v: VoltageReading, lim: { dcV: number; peakV: number; rmsV: number }): string[] {
  const out: string[] = [];
  const dc = Math.abs(v.dcV);
  const acPeak = Math.max(0, Math.abs(v.peakV) - dc);
  if (dc > lim.dcV || Math.abs(v.peakV) > lim.dcV) out.push(`DC/instantaneous ${Math.max(dc, Math.abs(v.peakV)).toPrecision(3)} V > ${lim.dcV} V`);
  if (acPeak > lim.peakV) out.push(`ripple peak ${acPeak.toPrecision(3)} V > ${lim.peakV} V`);
  if (v.rmsV !== undefined && v.rmsV > lim.rmsV) out.push(`ripple RMS ${v.rmsV.toPrecision(3)} V > ${lim.rmsV} V`);
  return out;
}

/**
 * Classify a node voltage. The DC limit is applied to the larger of |DC| and the instantaneous
 * peak, the AC peak and RMS limits to the ripple component (peak − |DC|, RMS) — a conservative
 * reading of combined waveforms; the standards themselves govern.
 */
export function classifyVoltage(v: VoltageReading): VoltageClass {
  const iec61010 = exceeds(v, IEC61010_NORMAL);
  const es2 = exceeds(v, IEC62368_ES2);
  const es1 = exceeds(v, IEC62368_ES1);
  return {
    hazardousLive: iec61010.length > 0,
    iec62368: es2.length > 0 ? 'ES3' : es1.length > 0 ? 'ES2' : 'ES1',
    above60VDC: Math.abs(v.dcV) > SAFE_RESIDUAL_V,
    reasons: iec61010.map((r) => `IEC 61010-1 normal condition: ${r}`),
  };
}

/** The capacitance a bleeder across the output discharges: the smoothing stack C_eq, or n equal stages of C (C/n). */
export type StackSpec = { stackCapacitanceF: number } | { stages: number; capacitanceF: number };

function stackF(s: StackSpec): number {
  return 'stackCapacitanceF' in s ? s.stackCapacitanceF : s.capacitanceF / s.stages;
}

/** Discharge time constant τ = R_b·C_eq (s) (REFERENCES §6; C_eq = C/n for equal stages). */
export function dischargeTimeConstantS(bleederOhm: number, stack: StackSpec): number {
  return bleederOhm * stackF(stack);
}

/**
 * Time for the output to fall from V0 to V_safe through a bleeder, t = τ·ln(V0/V_safe) (s),
 * and for the stack energy to fall below E_safe, t = (τ/2)·ln(E0/E_safe) (REFERENCES §6).
 * Zero when already below. Example (§6): n = 10, C = 1 nF, V0 = 200 kV, R_b = 1 GΩ → 0.81 s to 60 V.
 */
export function dischargeTime(input: StackSpec & { bleederOhm: number; initialV: number; safeV?: number; safeEnergyJ?: number }): {
  tauS: number;
  toSafeVoltageS: number;
  toSafeEnergyS: number;
  initialEnergyJ: number;
} {
  const c = stackF(input);
  const tau = input.bleederOhm * c;
  const v0 = Math.abs(input.initialV);
  const vs = input.safeV ?? SAFE_RESIDUAL_V;
  const e0 = 0.5 * c * v0 * v0;
  const es = input.safeEnergyJ ?? STORED_ENERGY_LIMIT_J;
  return {
    tauS: tau,
    toSafeVoltageS: v0 > vs ? tau * Math.log(v0 / vs) : 0,
    toSafeEnergyS: e0 > es ? (tau / 2) * Math.log(e0 / es) : 0,
    initialEnergyJ: e0,
  };
}

/**
 * Largest bleeder that brings the output from V0 to V_safe (default 60 V) within `maxTimeS`
 * (default 5 s): R_b ≤ t / (C_eq·ln(V0/V_safe)) (REFERENCES §6). Also the bleeder's current and
 * dissipation at V0 — it is an extra load, add its current to I in the drop estimate.
 * Example (§6): n = 10, C = 1 nF, V0 = 200 kV → R_b ≤ 6.2 GΩ, about 32 µA.
 */
export function bleederFor(input: StackSpec & { initialV: number; safeV?: number; maxTimeS?: number }): {
  maxResistanceOhm: number;
  tauS: number;
  currentA: number;
  powerW: number;
} {
  const c = stackF(input);
  const v0 = Math.abs(input.initialV);
  const vs = input.safeV ?? SAFE_RESIDUAL_V;
  const t = input.maxTimeS ?? DISCHARGE_TIME_LIMIT_S;
  const tau = v0 > vs ? t / Math.log(v0 / vs) : Infinity;
  const r = tau / c;
  return { maxResistanceOhm: r, tauS: tau, currentA: v0 / r, powerW: (v0 * v0) / r };
}

/** The REFERENCES §7 suggested tool warnings. */
export type SafetyWarningCode =
  | 'hazardous-voltage'
  | 'stored-charge'
  | 'stored-energy'
  | 'hazardous-energy'
  | 'no-bleeder'
  | 'slow-discharge';

/** One safety warning with the standard or source behind its threshold. */
export interface SafetyWarning {
  code: SafetyWarningCode;
  message: string;
  /** The standard or source behind the threshold. */
  basis: string;
}

/**
 * The REFERENCES §7 "suggested tool warnings" (common practice): output above 60 V DC; stack
 * charge above 45 µC (≤ 15 kV) or stack energy above 350 mJ (> 15 kV); total stored energy ≥ 20 J;
 * no bleeder, or discharge to 60 V slower than 5 s.
 */
export function safetyWarnings(input: {
  outputV: number;
  stackChargeC: number;
  stackEnergyJ: number;
  totalEnergyJ: number;
  /** Time to discharge to 60 V (s); undefined = no bleeder fitted. */
  dischargeToSafeS?: number;
}): SafetyWarning[] {
  const out: SafetyWarning[] = [];
  const v = Math.abs(input.outputV);
  if (v > SAFE_RESIDUAL_V) {
    out.push({ code: 'hazardous-voltage', message: `output ${v.toPrecision(3)} V is above 60 V DC: hazardous live if accessible`, basis: 'IEC 61010-1 §6.3.1 a) (mem); IEC 62368-1 ES1 (mem)' });
  }
  if (v <= CHARGE_LIMIT_UP_TO_V && input.stackChargeC > STORED_CHARGE_LIMIT_C) {
    out.push({ code: 'stored-charge', message: `stored charge ${(input.stackChargeC * 1e6).toPrecision(3)} µC is above 45 µC`, basis: 'IEC 61010-1 §6.3.1 c), Line A of Figure 3 [S13]' });
  }
  if (v > CHARGE_LIMIT_UP_TO_V && input.stackEnergyJ > STORED_ENERGY_LIMIT_J) {
    out.push({ code: 'stored-energy', message: `stack energy ${(input.stackEnergyJ * 1e3).toPrecision(3)} mJ is above 350 mJ at more than 15 kV`, basis: 'IEC 61010-1 §6.3.1 c) (mem); IEC 60335-1 §8.1.4 [S12]' });
  }
  if (input.totalEnergyJ >= HAZARDOUS_ENERGY_J) {
    out.push({ code: 'hazardous-energy', message: `total stored energy ${input.totalEnergyJ.toPrecision(3)} J is 20 J or more`, basis: 'IEC 60950-1 §1.2.8.10 (mem)' });
  }
  if (v > SAFE_RESIDUAL_V) {
    if (input.dischargeToSafeS === undefined) {
      out.push({ code: 'no-bleeder', message: 'no bleeder fitted: the stack can hold its charge for a long time after switch-off', basis: 'common practice; IEC 60204-1 §6.2.4 [S14]' });
    } else if (input.dischargeToSafeS > DISCHARGE_TIME_LIMIT_S) {
      out.push({ code: 'slow-discharge', message: `discharge to 60 V takes ${input.dischargeToSafeS.toPrecision(3)} s, more than 5 s`, basis: 'IEC 60204-1 §6.2.4 [S14]; IEC 61010-1 §6.10.3 [S13]' });
    }
  }
  return out;
}

/** The cautions shown with every result and report (our own wording). */
export const SAFETY_CAUTIONS: string[] = [
  'High-voltage multipliers can store a lethal charge. A ladder that is switched off can still be charged, and its capacitors can recover charge after a brief short.',
  'Before touching anything: switch off and isolate the drive, wait for the bleeders to act, then discharge every stage with a grounding stick and leave the stack shorted to ground while you work.',
  'Fit bleeder resistors rated for the full voltage (several in series where needed), across the output or across each capacitor, and check that they actually discharge the stack.',
  'Never rely on the load to discharge the stack: a tube or electrode can go open circuit and leave the ladder charged.',
  'The figures here are engineering estimates and simulations, not a safety approval. Follow your local electrical codes and the applicable product standards, and have the design and build checked by a qualified, licensed practitioner.',
];
