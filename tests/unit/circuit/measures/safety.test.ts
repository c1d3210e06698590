import { describe, expect, it } from 'vitest';
import { bleederFor, classifyVoltage, dischargeTime, dischargeTimeConstantS, SAFETY_CAUTIONS, safetyWarnings } from '@/lib/circuit/measures/safety';

// Thresholds from REFERENCES §7: IEC 61010-1 §6.3.1 a) 60 V DC / 42.4 V peak / 30 V rms (from memory);
// IEC 62368-1 Table 4 ES1 ≤ 60 V DC, ES2 ≤ 120 V DC / 70.7 V peak (from memory).
describe('classifyVoltage', () => {
  it.each([
    [{ dcV: 50, peakV: 50 }, false, 'ES1'],
    [{ dcV: 60, peakV: 60 }, false, 'ES1'],
    [{ dcV: 61, peakV: 61 }, true, 'ES2'],
    [{ dcV: -100, peakV: 100 }, true, 'ES2'],
    [{ dcV: 121, peakV: 121 }, true, 'ES3'],
    [{ dcV: -30e3, peakV: 30.2e3 }, true, 'ES3'],
    [{ dcV: 0, peakV: 40 }, false, 'ES1'],
    [{ dcV: 0, peakV: 45 }, true, 'ES2'],
    [{ dcV: 0, peakV: 71 }, true, 'ES3'],
    [{ dcV: 10, peakV: 11, rmsV: 31 }, true, 'ES2'],
  ] as const)('%j → hazardous %s, %s', (v, hazardous, es) => {
    const c = classifyVoltage(v);
    expect(c.hazardousLive).toBe(hazardous);
    expect(c.iec62368).toBe(es);
    expect(c.reasons.length > 0).toBe(hazardous);
  });

  it('above60VDC follows the DC level', () => {
    expect(classifyVoltage({ dcV: -61, peakV: 61 }).above60VDC).toBe(true);
    expect(classifyVoltage({ dcV: 59, peakV: 59 }).above60VDC).toBe(false);
  });
});

describe('discharge and bleeders (REFERENCES §6: τ = R_b·C/n, t = τ·ln(V0/V_safe))', () => {
  it('time constant uses the smoothing stack', () => {
    expect(dischargeTimeConstantS(1e9, { stages: 10, capacitanceF: 1e-9 })).toBeCloseTo(0.1, 12);
    expect(dischargeTimeConstantS(1e9, { stackCapacitanceF: 1e-10 })).toBeCloseTo(0.1, 12);
  });

  it('bleeder sized for the limit discharges in exactly that time', () => {
    const b = bleederFor({ stackCapacitanceF: 2e-9, initialV: 30e3, maxTimeS: 2 });
    const t = dischargeTime({ stackCapacitanceF: 2e-9, bleederOhm: b.maxResistanceOhm, initialV: 30e3 });
    expect(t.toSafeVoltageS).toBeCloseTo(2, 9);
    expect(b.powerW).toBeCloseTo(30e3 * b.currentA, 9);
  });

  it('already safe: zero time, no bleeder needed', () => {
    expect(dischargeTime({ stackCapacitanceF: 1e-6, bleederOhm: 1e6, initialV: 50 }).toSafeVoltageS).toBe(0);
    expect(bleederFor({ stackCapacitanceF: 1e-6, initialV: 50 }).maxResistanceOhm).toBe(Infinity);
  });
});

describe('safetyWarnings (REFERENCES §7 suggested tool warnings, common practice)', () => {
  it('charge above 45 µC at ≤ 15 kV, energy above 350 mJ above 15 kV, 20 J total, bleeder checks', () => {
    const low = safetyWarnings({ outputV: 10e3, stackChargeC: 50e-6, stackEnergyJ: 0.25, totalEnergyJ: 1, dischargeToSafeS: 1 }).map((w) => w.code);
    expect(low).toEqual(['hazardous-voltage', 'stored-charge']);
    const high = safetyWarnings({ outputV: 200e3, stackChargeC: 20e-6, stackEnergyJ: 2, totalEnergyJ: 25 }).map((w) => w.code);
    expect(high).toEqual(['hazardous-voltage', 'stored-energy', 'hazardous-energy', 'no-bleeder']);
    const slow = safetyWarnings({ outputV: -2e3, stackChargeC: 1e-6, stackEnergyJ: 1e-3, totalEnergyJ: 1e-3, dischargeToSafeS: 12 }).map((w) => w.code);
    expect(slow).toEqual(['hazardous-voltage', 'slow-discharge']);
    expect(safetyWarnings({ outputV: 24, stackChargeC: 1e-6, stackEnergyJ: 1e-6, totalEnergyJ: 1e-6 })).toEqual([]);
  });

  it('every warning names its basis', () => {
    const all = safetyWarnings({ outputV: 200e3, stackChargeC: 1, stackEnergyJ: 50, totalEnergyJ: 50 });
    expect(all.every((w) => w.basis.length > 0 && w.message.length > 0)).toBe(true);
  });
});

describe('SAFETY_CAUTIONS', () => {
  it('covers lethal charge, discharge and ground, bleeders, the load, local codes and licensed practice', () => {
    const text = SAFETY_CAUTIONS.join(' ').toLowerCase();
    for (const word of ['lethal', 'discharge', 'ground', 'bleeder', 'never rely on the load', 'local electrical codes', 'licensed']) {
      expect(text).toContain(word);
    }
  });
});
