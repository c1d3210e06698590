/**
 * The safety figures of a solved ladder, from its steady state and the netlist itself: the
 * voltage class of every node (REFERENCES §7 thresholds, see `safety.ts`), and per output the
 * smoothing stack it sees, the stack's charge and energy, the resistance that discharges it after
 * switch-off, the discharge time to 60 V (REFERENCES §6: τ = R·C_eq, t = τ·ln(V0/60 V)), the
 * largest bleeder that would discharge it within 5 s, and the §7 warnings. Screening values for
 * a design, not a certification: local codes and licensed practice govern.
 *
 * Discharge path: the DC resistance from the output to ground through resistors only, with every
 * voltage source switched off (0 V, a short), current sources and diodes open and capacitors
 * open — the bleeder, or a resistive load, or both. A load is not a bleeder (it can go open), so
 * the path's resistors are listed and the warnings say so when the load is the only path.
 */
import { solveDense } from '../linalg/dense-lu';
import type { Circuit } from '../mna/circuit';
import type { NodeMeasure, PeriodMeasures } from './period-measures';
import { bleederFor, classifyVoltage, dischargeTime, safetyWarnings, SAFETY_CAUTIONS, type SafetyWarning, type VoltageClass } from './safety';

export interface OutputSafety {
  node: string;
  /** Output mean to ground (V). */
  voltageV: number;
  /** Capacitance seen from the output with diodes open (the smoothing stack, F). */
  stackCapacitanceF: number;
  stackChargeC: number;
  stackEnergyJ: number;
  /** DC resistance from the output to ground through resistors (Ω); null when there is none. */
  dischargeResistanceOhm: number | null;
  /** Resistors that touch the output (the bleeder or load the path starts with). */
  dischargeResistors: string[];
  /** Time constant and times to 60 V and to 350 mJ through that path; null without a path. */
  discharge: { tauS: number; toSafeVoltageS: number; toSafeEnergyS: number } | null;
  /** Largest bleeder across this output that reaches 60 V within 5 s, its current and dissipation at V0. */
  bleederFor5s: { maxResistanceOhm: number; currentA: number; powerW: number };
  warnings: SafetyWarning[];
}

export interface SafetySummary {
  /** Voltage class of every node to ground. */
  nodes: Record<string, VoltageClass>;
  outputs: OutputSafety[];
  /** Energy in all capacitors at their mean voltages (J). */
  totalEnergyJ: number;
  /** The cautions to show beside any result. */
  cautions: string[];
}

/** DC resistance from `node` to ground through the resistors, sources shorted; null if open. */
export function resistanceToGround(circuit: Circuit, node: number): number | null {
  const n = circuit.size;
  const ground = n;
  if (node >= n) return null;
  // Switched-off voltage sources are shorts: merge their terminals.
  const parent = Int32Array.from({ length: n + 1 }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) i = parent[i] = parent[parent[i]];
    return i;
  };
  for (const v of circuit.voltageSources) parent[find(v.ip)] = find(v.in);
  const edges: [number, number, number][] = [];
  for (const r of circuit.resistors) edges.push([r.ia, r.ib, r.conductanceS]);
  for (const d of circuit.diodes) if (d.ij !== d.ia) edges.push([d.ia, d.ij, 1 / d.rsOhm]);
  const start = find(node);
  const gnd = find(ground);
  if (start === gnd) return 0;
  // Classes reachable from the output through resistors.
  const adj = new Map<number, number[]>();
  for (const [a, b] of edges) {
    const ra = find(a);
    const rb = find(b);
    if (ra === rb) continue;
    (adj.get(ra) ?? adj.set(ra, []).get(ra)!).push(rb);
    (adj.get(rb) ?? adj.set(rb, []).get(rb)!).push(ra);
  }
  const index = new Map<number, number>();
  const queue = [start];
  const seen = new Set([start]);
  while (queue.length) {
    const c = queue.pop()!;
    if (c !== gnd) index.set(c, index.size);
    for (const d of adj.get(c) ?? []) {
      if (seen.has(d)) continue;
      seen.add(d);
      queue.push(d);
    }
  }
  if (!seen.has(gnd)) return null;
  const m = index.size;
  const a = new Float64Array(m * m);
  for (const [p, q, g] of edges) {
    const rp = find(p);
    const rq = find(q);
    if (rp === rq || !seen.has(rp)) continue;
    const ip = index.get(rp);
    const iq = index.get(rq);
    if (ip !== undefined) a[ip * m + ip] += g;
    if (iq !== undefined) a[iq * m + iq] += g;
    if (ip !== undefined && iq !== undefined) {
      a[ip * m + iq] -= g;
      a[iq * m + ip] -= g;
    }
  }
  const e = new Float64Array(m);
  e[index.get(start)!] = 1;
  const r = solveDense(a, m, e);
  if (!r.ok) return null;
  const ohm = r.x[index.get(start)!];
  return Number.isFinite(ohm) && ohm > 0 ? ohm : null;
}

export function safetySummary(circuit: Circuit, nodes: Record<string, NodeMeasure>, energy: PeriodMeasures['energy'], outputs: string[]): SafetySummary {
  const classes: Record<string, VoltageClass> = {};
  for (const [name, m] of Object.entries(nodes)) {
    classes[name] = classifyVoltage({ dcV: m.mean, peakV: Math.max(Math.abs(m.min), Math.abs(m.max)) });
  }
  const out: OutputSafety[] = [];
  for (const node of outputs) {
    const m = nodes[node];
    const seen = energy.outputs[node];
    const offset = circuit.nodeOffset.get(node);
    if (!m || !seen || offset === undefined) continue;
    const stack = { stackCapacitanceF: seen.capacitanceF };
    const ohm = resistanceToGround(circuit, offset);
    const discharge = ohm === null ? null : dischargeTime({ ...stack, bleederOhm: ohm, initialV: m.mean });
    const bleeder = bleederFor({ ...stack, initialV: m.mean });
    const touching = circuit.resistors.filter((r) => r.ia === offset || r.ib === offset).map((r) => r.name);
    out.push({
      node,
      voltageV: m.mean,
      stackCapacitanceF: seen.capacitanceF,
      stackChargeC: seen.chargeC,
      stackEnergyJ: seen.energyJ,
      dischargeResistanceOhm: ohm,
      dischargeResistors: touching,
      discharge: discharge && { tauS: discharge.tauS, toSafeVoltageS: discharge.toSafeVoltageS, toSafeEnergyS: discharge.toSafeEnergyS },
      bleederFor5s: { maxResistanceOhm: bleeder.maxResistanceOhm, currentA: bleeder.currentA, powerW: bleeder.powerW },
      warnings: safetyWarnings({
        outputV: m.mean,
        stackChargeC: seen.chargeC,
        stackEnergyJ: seen.energyJ,
        totalEnergyJ: energy.totalJ,
        dischargeToSafeS: discharge?.toSafeVoltageS,
      }),
    });
  }
  return { nodes: classes, outputs: out, totalEnergyJ: energy.totalJ, cautions: SAFETY_CAUTIONS };
}
