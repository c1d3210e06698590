// Safety figures of a solved ladder (lib/circuit/measures/safety-summary.ts) against
// REFERENCES §6 (discharge through a bleeder: τ = R_b·C/n, t = τ·ln(V0/60 V); worked example
// n = 10, C = 1 nF, V0 = 200 kV, R_b = 1 GΩ → 0.81 s to 60 V, and R_b ≤ 6.2 GΩ for 5 s) and §7
// (the suggested warnings), on netlists built here.
import { describe, expect, it } from 'vitest';
import { solveNetlist } from '@/lib/circuit/analysis/solve';
import { outputEnergy } from '@/lib/circuit/measures/period-measures';
import { resistanceToGround, safetySummary } from '@/lib/circuit/measures/safety-summary';
import { buildCircuit, type Circuit } from '@/lib/circuit/mna/circuit';
import { generateLadder, GENERIC_RECTIFIER, type LadderOptions } from '@/lib/circuit/netlist/generate';
import type { Netlist } from '@/lib/circuit/netlist/types';

function circuitOf(nl: Netlist): Circuit {
  const b = buildCircuit(nl);
  if (!b.ok) throw new Error(b.reason);
  return b.circuit;
}

const tenStages = (extra: Partial<LadderOptions> = {}): LadderOptions => ({
  kind: 'half-wave',
  stages: 10,
  peakV: 10_000,
  frequencyHz: 10_000,
  capacitanceF: 1e-9,
  diode: GENERIC_RECTIFIER,
  sourceResistanceOhm: 10,
  ...extra,
});

describe('safety summary', () => {
  it('REFERENCES §6 example: 1 GΩ across 10 stages of 1 nF at 200 kV discharges to 60 V in 0.81 s', () => {
    const c = circuitOf(generateLadder(tenStages({ loadResistanceOhm: 1e9 })));
    const nodes = { s10: { mean: 200e3, min: 199e3, max: 200e3, ripple: 1e3 } };
    const energy = { totalJ: 25, outputs: outputEnergy(c, nodes, ['s10']) };
    // The smoothing stack seen from the output: C/n.
    expect(energy.outputs.s10.capacitanceF).toBeCloseTo(1e-10, 13);
    const s = safetySummary(c, nodes, energy, ['s10']);
    const out = s.outputs[0];
    expect(out.dischargeResistanceOhm).toBeCloseTo(1e9, -3);
    expect(out.discharge?.tauS).toBeCloseTo(0.1, 4);
    expect(out.discharge?.toSafeVoltageS).toBeCloseTo(0.81, 2);
    expect(out.bleederFor5s.maxResistanceOhm / 1e9).toBeCloseTo(6.2, 1);
    expect(out.dischargeResistors).toContain('Rload');
    expect(s.nodes.s10.hazardousLive).toBe(true);
    expect(s.nodes.s10.iec62368).toBe('ES3');
    // 25 J total is above the 20 J hazardous-energy line (§7), the stack energy above 350 mJ.
    const codes = out.warnings.map((w) => w.code);
    expect(codes).toEqual(expect.arrayContaining(['hazardous-voltage', 'stored-energy', 'hazardous-energy']));
    expect(codes).not.toContain('no-bleeder');
    expect(s.cautions.length).toBeGreaterThan(2);
  });

  it('without any resistor from the output there is no discharge path and a no-bleeder warning', () => {
    const c = circuitOf(generateLadder(tenStages({ loadCurrentA: 1e-4 })));
    expect(resistanceToGround(c, c.nodeOffset.get('s10')!)).toBeNull();
    const nodes = { s10: { mean: 150e3, min: 149e3, max: 150e3, ripple: 1e3 } };
    const s = safetySummary(c, nodes, { totalJ: 1, outputs: outputEnergy(c, nodes, ['s10']) }, ['s10']);
    expect(s.outputs[0].discharge).toBeNull();
    expect(s.outputs[0].warnings.map((w) => w.code)).toContain('no-bleeder');
  });

  it('counts a path through the switched-off source and its resistance', () => {
    // 1 MΩ from the output to the drive's node: the source (off = 0 V) and Rs close it to ground.
    const nl = generateLadder(tenStages({ loadCurrentA: 1e-4 }));
    nl.elements.push({ kind: 'R', name: 'Rtest', nodes: ['s10', 'in'], resistanceOhm: 1e6 });
    const c = circuitOf(nl);
    expect(resistanceToGround(c, c.nodeOffset.get('s10')!)).toBeCloseTo(1e6 + 10, 3);
  });

  it('a slow bleeder is flagged, and a solve carries the summary', () => {
    // 100 GΩ across 10 × 1 nF: τ = 10 s, far slower than 5 s to 60 V.
    const r = solveNetlist(generateLadder(tenStages({ loadResistanceOhm: 100e9, peakV: 1000, frequencyHz: 10_000 })), { waveformPoints: 0 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const out = r.safety.outputs.find((o) => o.node === 's10');
    expect(out).toBeDefined();
    expect(out!.voltageV).toBeGreaterThan(19_000);
    expect(out!.discharge!.tauS).toBeCloseTo(10, 1);
    expect(out!.warnings.map((w) => w.code)).toContain('slow-discharge');
    // Every node is classified; the grounded-side pumping node p1 swings to ±2 kV, still hazardous.
    expect(Object.keys(r.safety.nodes).sort()).toEqual(Object.keys(r.nodes).sort());
    expect(r.safety.nodes.p1.hazardousLive).toBe(true);
  });
});
