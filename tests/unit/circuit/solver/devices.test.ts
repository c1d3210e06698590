// Device equations against their textbook forms: the Shockley diode equation
// Id = IS·(exp(Vd/(N·Vt)) − 1) (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., §2.3),
// Vt = kT/q at SPICE's TNOM 27 °C, and SPICE 3's pnjlim junction limiting.
import { describe, expect, it } from 'vitest';
import { diodeStatic, pnjlim, THERMAL_VOLTAGE_V } from '@/lib/circuit/devices/diode';
import { sourceValue } from '@/lib/circuit/devices/sources';

describe('diode static model', () => {
  it('thermal voltage at 300.15 K is 25.865 mV (k, q exact SI values)', () => {
    expect(THERMAL_VOLTAGE_V).toBeCloseTo(0.0258646, 6);
  });

  it('matches the Shockley equation at a known forward bias', () => {
    const isA = 1e-14;
    const n = 1.5;
    const vte = n * THERMAL_VOLTAGE_V;
    const { currentA, conductanceS } = diodeStatic(0.65, isA, vte, undefined);
    const expected = isA * (Math.exp(0.65 / vte) - 1);
    expect(currentA / expected).toBeCloseTo(1, 12);
    // Small-signal conductance dId/dVd = IS·exp(Vd/NVt)/(NVt).
    expect(conductanceS).toBeCloseTo((isA * Math.exp(0.65 / vte)) / vte, 15);
  });

  it('saturates at −IS in reverse and breaks down below −BV', () => {
    const isA = 1e-12;
    const vte = THERMAL_VOLTAGE_V;
    expect(diodeStatic(-5, isA, vte, undefined).currentA / -isA).toBeCloseTo(1, 6);
    const bd = diodeStatic(-101, isA, vte, 100);
    expect(bd.currentA).toBeLessThan(-1e3 * isA);
  });

  it('pnjlim limits a large forward jump to a logarithmic step', () => {
    const vte = THERMAL_VOLTAGE_V;
    const r = pnjlim(5, 0.6, vte, 0.7);
    expect(r.limited).toBe(true);
    expect(r.v).toBeCloseTo(0.6 + vte * Math.log(1 + (5 - 0.6) / vte), 12);
    expect(pnjlim(0.61, 0.6, vte, 0.7).limited).toBe(false);
  });
});

describe('SIN source (ngspice vsrcload.c form)', () => {
  it('holds VO + VA·sin(PHASE) before TD and is a delayed sine after', () => {
    const s = { offsetV: 1, amplitude: 2, frequencyHz: 50, delayS: 0.01, damping: 0, phaseDeg: 30 };
    expect(sourceValue(0, s, 0.005)).toBeCloseTo(1 + 2 * Math.sin(Math.PI / 6), 12);
    expect(sourceValue(0, s, 0.015)).toBeCloseTo(1 + 2 * Math.sin(2 * Math.PI * 50 * 0.005 + Math.PI / 6), 12);
  });
});
