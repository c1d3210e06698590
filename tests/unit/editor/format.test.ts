/**
 * The editor's engineering notation. Scale letters per the SPICE 3 convention (Berkeley SPICE 3
 * user's guide, "numbers", from memory): f 1e-15, p 1e-12, n 1e-9, u 1e-6, m 1e-3, k 1e3,
 * meg 1e6, g 1e9, t 1e12, case-insensitive, letters after the scale ignored as the unit.
 */
import { describe, expect, it } from 'vitest';
import {
  REASON_COMMA,
  REASON_EMPTY,
  REASON_LONE_F,
  REASON_NOT_A_NUMBER,
  REASON_SUFFIX,
  REASON_UPPER_M,
  formatInputValue,
  formatPercent,
  formatReading,
  formatSignedPercent,
  parseQuantity,
  timeScale,
  voltScale,
} from '@/lib/editor/format';

function value(text: string, unit: string): number {
  const r = parseQuantity(text, unit);
  if (!r.ok) throw new Error(`${text} refused: ${r.reason}`);
  return r.value;
}

function reason(text: string, unit: string): string {
  const r = parseQuantity(text, unit);
  if (r.ok) throw new Error(`${text} accepted as ${r.value}`);
  return r.reason;
}

describe('parseQuantity', () => {
  it('reads the SPICE scale letters with or without the unit', () => {
    expect(value('4.7n', 'F')).toBe(4.7e-9);
    expect(value('4.7nF', 'F')).toBe(4.7e-9);
    expect(value('4.7 nF', 'F')).toBe(4.7e-9);
    expect(value('25k', 'Ω')).toBe(25e3);
    expect(value('25kΩ', 'Ω')).toBe(25e3);
    expect(value('25kohm', 'Ω')).toBe(25e3);
    expect(value('1.2meg', 'Ω')).toBe(1.2e6);
    expect(value('1.2MEG', 'Ω')).toBe(1.2e6);
    expect(value('1.2megohm', 'Ω')).toBe(1.2e6);
    expect(value('10u', 'F')).toBe(10e-6);
    expect(value('10µF', 'F')).toBe(10e-6);
    expect(value('100p', 'F')).toBe(100e-12);
    expect(value('3g', 'Ω')).toBe(3e9);
    expect(value('1t', 'Ω')).toBe(1e12);
    expect(value('10fF', 'F')).toBeCloseTo(10e-15, 30);
    expect(value('40k', 'Hz')).toBe(40e3);
    expect(value('40 kHz', 'Hz')).toBe(40e3);
    expect(value('50Hz', 'Hz')).toBe(50);
    expect(value('25kV', 'V')).toBe(25e3);
    expect(value('2.5mA', 'A')).toBe(2.5e-3);
    expect(value('1A', 'A')).toBe(1);
    expect(value('5ms', 's')).toBe(5e-3);
    expect(value('5s', 's')).toBe(5);
    expect(value('90deg', '°')).toBe(90);
    expect(value('-30°', '°')).toBe(-30);
    expect(value('80%', '%')).toBe(80);
    expect(value('1.75', '')).toBe(1.75);
    expect(value('1e-3', 'A')).toBe(1e-3);
    expect(value('.5k', 'V')).toBe(500);
    expect(value('  12 ', 'V')).toBe(12);
  });

  it('refuses text that is not a number', () => {
    expect(reason('', 'F')).toBe(REASON_EMPTY);
    expect(reason('   ', 'F')).toBe(REASON_EMPTY);
    expect(reason('abc', 'F')).toBe(REASON_NOT_A_NUMBER);
    expect(reason('k25', 'Ω')).toBe(REASON_NOT_A_NUMBER);
    expect(reason('NaN', 'V')).toBe(REASON_NOT_A_NUMBER);
    expect(reason('Infinity', 'V')).toBe(REASON_NOT_A_NUMBER);
    expect(reason('1e999', 'V')).toBe(REASON_NOT_A_NUMBER);
  });

  it('refuses unknown suffixes and units that belong to another field, naming the letters', () => {
    expect(reason('4.7x', 'F')).toContain(REASON_SUFFIX);
    expect(reason('4.7x', 'F')).toContain('F is optional');
    expect(reason('25kV', 'Ω')).toContain(REASON_SUFFIX);
    expect(reason('4.7nH', 'F')).toContain(REASON_SUFFIX);
    expect(reason('1.2.3', 'V')).toContain(REASON_SUFFIX);
    expect(reason('4.7 n F', 'F')).toContain(REASON_SUFFIX);
    expect(reason('2x', '')).toBe(REASON_SUFFIX);
    expect(value('2k', '')).toBe(2000);
  });

  it('refuses the two readings SPICE makes silently that a designer rarely means', () => {
    // SPICE reads M as milli; "1M" for a resistor is almost always meant as mega.
    expect(reason('1M', 'Ω')).toBe(REASON_UPPER_M);
    expect(reason('1MΩ', 'Ω')).toBe(REASON_UPPER_M);
    expect(reason('2MHz', 'Hz')).toBe(REASON_UPPER_M);
    expect(value('1m', 'Ω')).toBe(1e-3);
    // SPICE reads a lone F as femto; "2.2F" in a capacitance field is ambiguous.
    expect(reason('2.2F', 'F')).toBe(REASON_LONE_F);
    expect(reason('2.2f', 'F')).toBe(REASON_LONE_F);
  });
});

describe('letter-as-decimal-point code (IEC 60062 RKM code, from memory)', () => {
  it('reads 4k7, 2n2, 1meg5 as printed on parts', () => {
    expect(value('4k7', 'Ω')).toBe(4.7e3);
    expect(value('4k7Ω', 'Ω')).toBe(4.7e3);
    expect(value('2n2', 'F')).toBe(2.2e-9);
    expect(value('2n2F', 'F')).toBe(2.2e-9);
    expect(value('1meg5', 'Ω')).toBe(1.5e6);
    expect(value('4u7', 'F')).toBe(4.7e-6);
    // An upper-case M in the middle is as ambiguous as at the end.
    expect(reason('4M7', 'Ω')).toBe(REASON_UPPER_M);
    expect(reason('4k7x', 'Ω')).toContain(REASON_SUFFIX);
  });
  it('asks for a decimal point instead of a comma', () => {
    expect(reason('4,7n', 'F')).toBe(REASON_COMMA);
    expect(reason(',5', 'F')).toBe(REASON_COMMA);
  });
});

describe('formatInputValue', () => {
  it('writes SPICE-readable text with the prefix letters', () => {
    expect(formatInputValue(4.7e-9)).toBe('4.7n');
    expect(formatInputValue(25e3)).toBe('25k');
    expect(formatInputValue(1.2e6)).toBe('1.2meg');
    expect(formatInputValue(10e-6)).toBe('10u');
    expect(formatInputValue(2.5e-9)).toBe('2.5n');
    expect(formatInputValue(1.75)).toBe('1.75');
    expect(formatInputValue(0)).toBe('0');
    expect(formatInputValue(-30)).toBe('-30');
    expect(formatInputValue(0.8)).toBe('800m');
    expect(formatInputValue(999.9999999e3)).toBe('1meg');
    expect(formatInputValue(3e-18)).toBe('3e-18');
    expect(formatInputValue(2e16)).toBe('2e+16');
    expect(formatInputValue(Number.NaN)).toBe('');
  });

  // Six significant digits: the relative rounding error is at most 0.5 · 10^(1−6) = 5e-6.
  it('round-trips through parseQuantity to six significant digits', () => {
    const samples = [1e-15, 3.3e-13, 4.7e-9, 2.2e-8, 1e-6, 0.05, 1, 1.75, 60, 999.5, 1000, 25e3, 1.2e6, 6.2e9, 4.4e12, 123456.7, -7.5e-4];
    for (const v of samples) {
      const back = value(formatInputValue(v), '');
      expect(Math.abs(back - v) / Math.abs(v)).toBeLessThanOrEqual(5e-6);
    }
  });
});

describe('display formatting', () => {
  it('writes readings with four significant digits and the unit', () => {
    expect(formatReading(12410, 'V')).toBe('12.41 kV');
    expect(formatReading(-12410, 'V')).toBe('-12.41 kV');
    expect(formatReading(3.2e-6, 'A')).toBe('3.200 µA');
    expect(formatReading(null, 'V')).toBe('—');
    expect(formatReading(undefined, 'V')).toBe('—');
  });

  it('writes percentages and signed differences', () => {
    expect(formatPercent(0.0123)).toBe('1.23 %');
    expect(formatPercent(0)).toBe('0 %');
    expect(formatPercent(Infinity)).toBe('—');
    expect(formatSignedPercent(0.012)).toBe('+1.2 %');
    expect(formatSignedPercent(-0.5)).toBe('−50 %');
    expect(formatSignedPercent(0)).toBe('0 %');
    expect(formatSignedPercent(null)).toBe('—');
  });

  it('picks µs for a 40 kHz period, ms for a 50 Hz period, and kV above 1 kV', () => {
    expect(timeScale(1 / 40e3)).toEqual({ factor: 1e6, unit: 'µs' });
    expect(timeScale(1 / 50)).toEqual({ factor: 1e3, unit: 'ms' });
    expect(timeScale(6)).toEqual({ factor: 1, unit: 's' });
    expect(voltScale(999)).toEqual({ factor: 1, unit: 'V' });
    expect(voltScale(-12e3)).toEqual({ factor: 1e-3, unit: 'kV' });
    expect(voltScale(1.5e6)).toEqual({ factor: 1e-6, unit: 'MV' });
  });
});
