// Newton–Raphson on a resistor–diode circuit against the closed form (the load-line equation
// (V − Vd)/R = IS·(exp(Vd/(N·Vt)) − 1), solved here by bisection), and backward-difference
// integration of an RC discharge against v(t) = V0·exp(−t/RC).
import { describe, expect, it } from 'vitest';
import { solveOperatingPoint } from '@/lib/circuit/analysis/operating-point';
import { TransientEngine } from '@/lib/circuit/analysis/transient';
import { THERMAL_VOLTAGE_V } from '@/lib/circuit/devices/diode';
import { buildCircuit } from '@/lib/circuit/mna/circuit';
import { GENERIC_RECTIFIER } from '@/lib/circuit/netlist/generate';
import type { Netlist } from '@/lib/circuit/netlist/types';

describe('Newton–Raphson operating point', () => {
  it('resistor–diode circuit matches the load-line solution', () => {
    const model = { ...GENERIC_RECTIFIER, rsOhm: 0, name: 'DX', isA: 1e-14, n: 1 };
    const nl: Netlist = {
      title: 'r-d',
      elements: [
        { kind: 'V', name: 'V1', nodes: ['a', '0'], dcV: 5 },
        { kind: 'R', name: 'R1', nodes: ['a', 'k'], resistanceOhm: 1000 },
        { kind: 'D', name: 'D1', nodes: ['k', '0'], model: 'DX' },
      ],
      models: { DX: model },
      ignored: [],
    };
    const b = buildCircuit(nl);
    expect(b.ok).toBe(true);
    if (!b.ok) return;
    const op = solveOperatingPoint(b.circuit);
    expect(op.ok).toBe(true);
    if (!op.ok) return;
    let lo = 0;
    let hi = 1;
    const f = (vd: number) => (5 - vd) / 1000 - 1e-14 * (Math.exp(vd / THERMAL_VOLTAGE_V) - 1) - 1e-12 * vd;
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (f(mid) > 0) lo = mid;
      else hi = mid;
    }
    expect(op.x[b.circuit.nodeOffset.get('k')!]).toBeCloseTo(lo, 9);
  });

  it('a floating node is reported, not thrown', () => {
    const nl: Netlist = {
      title: 'float',
      elements: [
        { kind: 'V', name: 'V1', nodes: ['a', '0'], dcV: 1 },
        { kind: 'C', name: 'C1', nodes: ['a', 'b'], capacitanceF: 1e-6 },
      ],
      models: {},
      ignored: [],
    };
    const b = buildCircuit(nl);
    expect(b.ok).toBe(true);
    if (!b.ok) return;
    const op = solveOperatingPoint(b.circuit, { reltol: 1e-6, deviceReltol: 1e-3, vntolV: 1e-9, abstolA: 1e-12, gmin: 0, maxIterations: 20 });
    expect(op.ok).toBe(false);
  });
});

describe('transient integration', () => {
  it('RC discharge follows exp(−t/RC) (BDF2 with LTE control)', () => {
    const nl: Netlist = {
      title: 'rc',
      elements: [
        { kind: 'R', name: 'R1', nodes: ['a', '0'], resistanceOhm: 1000 },
        { kind: 'C', name: 'C1', nodes: ['a', '0'], capacitanceF: 1e-6 },
      ],
      models: {},
      ignored: [],
    };
    const b = buildCircuit(nl);
    expect(b.ok).toBe(true);
    if (!b.ok) return;
    const eng = new TransientEngine(b.circuit);
    const guess = new Float64Array(b.circuit.size + 1);
    guess[b.circuit.nodeOffset.get('a')!] = 1;
    eng.start(0, [1], guess);
    let worst = 0;
    const r = eng.run(5e-3, { hMaxS: 1e-4, hMinS: 1e-15, hInitS: 1e-7, lteRel: 1e-7, lteAbsV: 1e-9, vScaleV: 1 }, (t, _h, x) => {
      worst = Math.max(worst, Math.abs(x[b.circuit.nodeOffset.get('a')!] - Math.exp(-t / 1e-3)));
    });
    expect(r.ok).toBe(true);
    expect(worst).toBeLessThan(2e-4);
    expect(eng.steps).toBeGreaterThan(20);
  });
});
