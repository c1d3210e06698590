import { describe, expect, it } from 'vitest';
import { formatEngineering, parseEngineering } from '@/lib/circuit/netlist/units';

// Scale factors as in the Berkeley SPICE 3 user's guide ("numbers"): f p n u m k meg g t, mil.
describe('parseEngineering', () => {
  it.each([
    ['1', 1],
    ['-5', -5],
    ['.5n', 0.5e-9],
    ['1e-3', 1e-3],
    ['1E+3', 1e3],
    ['10uF', 10e-6],
    ['4.7kOhm', 4.7e3],
    ['4.7KΩ', 4.7e3],
    ['2.5MegV', 2.5e6],
    ['2.5MEG', 2.5e6],
    ['1m', 1e-3],
    ['1M', 1e-3],
    ['3µ', 3e-6],
    ['3μF', 3e-6],
    ['1f', 1e-15],
    ['1p', 1e-12],
    ['2g', 2e9],
    ['1T', 1e12],
    ['1mil', 25.4e-6],
    ['10V', 10],
    ['100Hz', 100],
    ['1.5e3k', 1.5e6],
  ])('%s → %d', (text, expected) => {
    expect(parseEngineering(text)).toBe(expected);
  });

  it.each(['', 'abc', 'NaN', 'Infinity', '-Infinity', '1e999', '1k2', '1..2', '--1', 'k1', '1 2', 'x'.repeat(100)])(
    'rejects %j',
    (text) => {
      expect(parseEngineering(text)).toBeNull();
    },
  );
});

describe('formatEngineering', () => {
  it.each([
    [4.7e-9, 'F', '4.70 nF'],
    [25e3, 'V', '25.0 kV'],
    [1.2e6, 'Ω', '1.20 MΩ'],
    [0, 'V', '0 V'],
    [-3.3e-3, 'A', '-3.30 mA'],
    [10e-6, 'F', '10.0 µF'],
    [999.96, 'V', '1.00 kV'],
    [1, 'V', '1.00 V'],
    [123456, 'Ω', '123 kΩ'],
    [1e-18, 'F', '1.00e-18 F'],
    [2.5e16, 'V', '2.50e+16 V'],
  ])('%d %s → %s', (value, unit, expected) => {
    expect(formatEngineering(value, unit)).toBe(expected);
  });

  it('NaN is a dash, infinity a symbol, digits are honoured', () => {
    expect(formatEngineering(NaN, 'V')).toBe('—');
    expect(formatEngineering(Infinity, 'V')).toBe('∞ V');
    expect(formatEngineering(4.7e-9, 'F', 2)).toBe('4.7 nF');
    expect(formatEngineering(4.7e-9, 'F', 5)).toBe('4.7000 nF');
  });

  it('reads back to within the shown precision', () => {
    for (const v of [1.234e-12, 5.5e-7, 0.0427, 7, 3300, 2.2e6, 8.1e9]) {
      const text = formatEngineering(v, '', 6).replace(' ', '').replace('µ', 'u').replace('M', 'meg');
      expect(parseEngineering(text)).toBeCloseTo(v, 12 - Math.round(Math.log10(v)));
    }
  });
});
