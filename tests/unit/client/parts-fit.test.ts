/**
 * The part form's "fit from the datasheet curve": typed points become SI numbers, an empty third
 * row means a two-point fit, bad entries are named by row, and the fitted model reproduces the
 * points it came from (the Shockley equation with series resistance, V = N·Vt·ln(I/IS + 1) + I·RS;
 * Sedra & Smith, the diode chapter, from memory) and fills the form's model fields.
 */
import { describe, expect, it } from 'vitest';
import { diodeForwardVoltage } from '@/lib/circuit/devices/diode-fit';
import { fitFromRows, modelFieldText } from '@/components/parts/diode-fit-model';
import { readPartForm, emptyPartForm } from '@/components/parts/part-form-model';

// An invented rectifier: IS = 2.5 nA, N = 1.75, RS = 50 mΩ.
const TRUE = { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 };
const v = (i: number) => diodeForwardVoltage(TRUE, i).toPrecision(9);

describe('diode fit form', () => {
  it('three points give back IS, N and RS, with residuals near zero', () => {
    const r = fitFromRows([
      { current: '10m', voltage: v(0.01) },
      { current: '100mA', voltage: v(0.1) },
      { current: '1', voltage: `${v(1)}V` },
    ]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.model.isA / TRUE.isA).toBeCloseTo(1, 4);
    expect(r.model.n).toBeCloseTo(TRUE.n, 5);
    expect(r.model.rsOhm).toBeCloseTo(TRUE.rsOhm, 5);
    expect(r.residualsV).toHaveLength(3);
    for (const res of r.residualsV) expect(Math.abs(res)).toBeLessThan(1e-6);
  });

  it('an empty third row is a two-point fit with RS = 0', () => {
    const noRs = { isA: 1e-12, n: 1.9, rsOhm: 0 };
    const r = fitFromRows([
      { current: '1m', voltage: diodeForwardVoltage(noRs, 1e-3).toPrecision(9) },
      { current: '100m', voltage: diodeForwardVoltage(noRs, 0.1).toPrecision(9) },
      { current: '', voltage: '' },
    ]);
    expect(r.ok && r.model.rsOhm).toBe(0);
    expect(r.ok && r.model.n).toBeCloseTo(1.9, 5);
    expect(r.ok && r.points).toHaveLength(2);
  });

  it('names bad entries by row and asks for at least two points', () => {
    const bad = fitFromRows([
      { current: '-1m', voltage: '0.6' },
      { current: '10m', voltage: 'abc' },
      { current: '', voltage: '' },
    ]);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(Object.keys(bad.errors).sort()).toEqual(['current-0', 'voltage-1']);
    const one = fitFromRows([
      { current: '10m', voltage: '0.6' },
      { current: '', voltage: '' },
      { current: '', voltage: '' },
    ]);
    expect(one).toEqual({ ok: false, errors: {}, reason: 'Give two or three points of the forward curve.' });
  });

  it('fills the model fields so the part form reads the fitted numbers', () => {
    const r = fitFromRows([
      { current: '10m', voltage: v(0.01) },
      { current: '100m', voltage: v(0.1) },
      { current: '1', voltage: v(1) },
    ]);
    if (!r.ok) throw new Error('fit failed');
    const s = emptyPartForm('diode');
    const form = { ...s, values: { ...s.values, ...modelFieldText(r.model), partNumber: 'FIT-1', 'specs.ratedPivV': '1k', 'specs.ratedAvgCurrentA': '1' } };
    const read = readPartForm(form);
    expect(read.ok).toBe(true);
    if (read.ok && read.input.kind === 'diode') {
      expect(read.input.specs.model.isA / r.model.isA).toBeCloseTo(1, 5);
      expect(read.input.specs.model.n).toBeCloseTo(r.model.n, 5);
      expect(read.input.specs.model.rsOhm).toBeCloseTo(r.model.rsOhm, 5);
    }
  });
});
