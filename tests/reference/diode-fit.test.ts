// Fitting IS, N, RS to forward datasheet points (lib/circuit/devices/diode-fit.ts), checked
// against points generated from the Shockley diode equation with a series resistance,
// V = N·Vt·ln(I/IS + 1) + I·RS (Sedra & Smith, Microelectronic Circuits, the diode chapter,
// "from memory"), Vt = kT/q at 300.15 K with the exact SI values of k and q (CODATA 2018).
import { describe, expect, it } from 'vitest';
import { fitDiode, type DiodeFitModel, type DiodeFitPoint } from '@/lib/circuit/devices/diode-fit';

const K = 1.380649e-23;
const Q = 1.602176634e-19;
const VT = (K * 300.15) / Q;

/** The equation itself, written out here (not the module's helper), so the check is independent. */
function shockley(m: DiodeFitModel, i: number): number {
  return m.n * VT * Math.log(i / m.isA + 1) + i * m.rsOhm;
}
function points(m: DiodeFitModel, currents: number[]): DiodeFitPoint[] {
  return currents.map((i) => ({ currentA: i, voltageV: shockley(m, i) }));
}
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('three points recover IS, N and RS', () => {
  const cases: [string, DiodeFitModel, number[]][] = [
    ['a small silicon rectifier', { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 }, [1e-3, 0.1, 1]],
    ['a signal diode', { isA: 4e-9, n: 1.9, rsOhm: 0.6 }, [1e-4, 5e-3, 0.1]],
    ['a 10 kV stack (many junctions in series: large N and RS)', { isA: 1e-12, n: 18, rsOhm: 40 }, [1e-3, 1e-2, 0.2]],
    ['a fast-recovery HV rectifier', { isA: 3e-13, n: 9.5, rsOhm: 6 }, [2e-3, 5e-2, 0.5]],
  ];
  for (const [name, truth, currents] of cases) {
    it(`${name}: to 1e-6 relative, residuals below 1 µV, in any order`, () => {
      const pts = points(truth, currents);
      for (const order of [pts, [pts[2], pts[0], pts[1]]]) {
        const r = fitDiode(order);
        if (!r.ok) throw new Error(r.reason);
        expect(rel(r.model.isA, truth.isA)).toBeLessThan(1e-6);
        expect(rel(r.model.n, truth.n)).toBeLessThan(1e-6);
        expect(rel(r.model.rsOhm, truth.rsOhm)).toBeLessThan(1e-6);
        expect(r.residualsV).toHaveLength(3);
        for (const e of r.residualsV) expect(Math.abs(e)).toBeLessThan(1e-6);
      }
    });
  }

  it('an ideal junction (RS = 0) comes back with RS ≈ 0, not refused', () => {
    const truth = { isA: 1e-14, n: 1, rsOhm: 0 };
    const r = fitDiode(points(truth, [1e-5, 1e-3, 1e-1]));
    if (!r.ok) throw new Error(r.reason);
    expect(rel(r.model.isA, truth.isA)).toBeLessThan(1e-6);
    expect(rel(r.model.n, 1)).toBeLessThan(1e-6);
    expect(Math.abs(r.model.rsOhm)).toBeLessThan(1e-9);
  });
});

describe('two points recover IS and N with RS = 0', () => {
  for (const truth of [
    { isA: 1e-14, n: 1, rsOhm: 0 },
    { isA: 2.5e-9, n: 1.75, rsOhm: 0 },
    { isA: 1e-12, n: 18, rsOhm: 0 },
    // IS close to the currents: the "+1" of the equation matters here
    { isA: 1e-6, n: 2, rsOhm: 0 },
  ]) {
    it(`IS = ${truth.isA}, N = ${truth.n}`, () => {
      const r = fitDiode(points(truth, [5e-6, 2e-3]));
      if (!r.ok) throw new Error(r.reason);
      expect(rel(r.model.isA, truth.isA)).toBeLessThan(1e-6);
      expect(rel(r.model.n, truth.n)).toBeLessThan(1e-6);
      expect(r.model.rsOhm).toBe(0);
    });
  }

  it('the 1 mA / 10 mA rule: a decade of current is N·Vt·ln 10 more volts (≈ 60 mV for N = 1)', () => {
    // The textbook rule of thumb (Sedra & Smith, diode chapter, from memory): 2.3·N·Vt per decade.
    const r = fitDiode([
      { currentA: 1e-3, voltageV: 0.7 },
      { currentA: 1e-2, voltageV: 0.7 + Math.LN10 * VT },
    ]);
    if (!r.ok) throw new Error(r.reason);
    expect(r.model.n).toBeCloseTo(1, 6);
    expect(r.model.isA).toBeCloseTo(1e-3 / Math.expm1(0.7 / VT), 20);
  });
});

describe('refusals say why', () => {
  it('needs 2 or 3 points with positive, distinct currents and rising voltages', () => {
    const reason = (p: DiodeFitPoint[]) => {
      const r = fitDiode(p);
      return r.ok ? 'ok' : r.reason;
    };
    expect(reason([{ currentA: 1e-3, voltageV: 0.6 }])).toMatch(/2 or 3 points/);
    expect(reason([1, 2, 3, 4].map((k) => ({ currentA: k * 1e-3, voltageV: 0.6 + k / 100 })))).toMatch(/2 or 3 points/);
    expect(reason([{ currentA: 1e-3, voltageV: 0.6 }, { currentA: 1e-3, voltageV: 0.7 }])).toMatch(/same current/);
    expect(reason([{ currentA: 1e-3, voltageV: 0.7 }, { currentA: 1e-2, voltageV: 0.6 }])).toMatch(/rise with the current/);
    expect(reason([{ currentA: -1e-3, voltageV: 0.6 }, { currentA: 1e-2, voltageV: 0.7 }])).toMatch(/point 1: the current/);
    expect(reason([{ currentA: 1e-3, voltageV: Number.NaN }, { currentA: 1e-2, voltageV: 0.7 }])).toMatch(/point 1: the voltage/);
  });

  it('refuses a curve that would need a negative series resistance', () => {
    // flattening at high current: the third point sits below the two-point line's extension
    const r = fitDiode([
      { currentA: 1e-3, voltageV: 0.6 },
      { currentA: 0.1, voltageV: 0.8 },
      { currentA: 1, voltageV: 0.85 },
    ]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/negative series resistance/);
  });
});
