import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { detectDelimiter, inspectCsv, parseNumber, readPoints } from '@/lib/bench/parse';
import { benchMappingSchema, MAX_BENCH_ROWS } from '@/lib/bench/mapping';
import { parseUnit, quantityOfName, unitOfHeader } from '@/lib/bench/units';

const fixture = (name: string) => fs.readFileSync(path.join(__dirname, '../../fixtures/bench', name), 'utf8');

describe('units in headers', () => {
  it('reads bracketed, slashed and trailing units with their SI prefix', () => {
    expect(unitOfHeader('I (mA)')).toEqual({ unit: 'mA', quantity: 'current', scale: 1e-3 });
    expect(unitOfHeader('Vout [kV]')).toEqual({ unit: 'kV', quantity: 'voltage', scale: 1e3 });
    expect(unitOfHeader('t (us)')?.scale).toBeCloseTo(1e-6, 15);
    expect(unitOfHeader('t (µs)')?.quantity).toBe('time');
    expect(unitOfHeader('Time/ms')?.scale).toBeCloseTo(1e-3, 15);
    expect(unitOfHeader('CH1_V')).toEqual({ unit: 'V', quantity: 'voltage', scale: 1 });
    expect(unitOfHeader('Vout')).toBeNull();
    // mV and MV differ only by the prefix's case
    expect(parseUnit('mV')?.scale).toBe(1e-3);
    expect(parseUnit('MV')?.scale).toBe(1e6);
    expect(parseUnit('kg')).toBeNull();
  });

  it('guesses a role from the words when there is no unit', () => {
    expect(quantityOfName('time')).toBe('time');
    expect(quantityOfName('Iload')).toBe('current');
    expect(quantityOfName('Vout')).toBe('voltage');
    expect(quantityOfName('temperature')).toBeNull();
  });
});

describe('numbers and delimiters', () => {
  it('accepts plain and exponent numbers, a decimal comma only when asked', () => {
    expect(parseNumber(' 1.5e-3 ', false)).toBe(0.0015);
    expect(parseNumber('-.5', false)).toBe(-0.5);
    expect(parseNumber('1,25', false)).toBeNull();
    expect(parseNumber('1,25', true)).toBe(1.25);
    expect(parseNumber('NaN', false)).toBeNull();
    expect(parseNumber('Infinity', false)).toBeNull();
    expect(parseNumber('1e999', false)).toBeNull();
    expect(parseNumber('12 V', false)).toBeNull();
  });

  it('prefers tab, then semicolon (decimal commas inside), then comma', () => {
    expect(detectDelimiter(['a\tb', '1,5\t2'])).toBe('\t');
    expect(detectDelimiter(['a;b', '1,5;2,5'])).toBe(';');
    expect(detectDelimiter(['a,b', '1.5,2'])).toBe(',');
  });
});

describe('inspectCsv', () => {
  it('finds columns, units and a load-curve mapping in a comma file', () => {
    const r = inspectCsv(fixture('load-curve-good.csv'));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.delimiter).toBe(',');
    expect(r.headerLines).toEqual([1]);
    expect(r.rowCount).toBe(5);
    expect(r.columns.map((c) => [c.name, c.unit, c.role, c.numeric])).toEqual([
      ['I (mA)', 'mA', 'current', true],
      ['Vout (kV)', 'kV', 'voltage', true],
    ]);
    expect(r.columns[0].samples).toEqual(['0', '0.05', '0.1', '0.2', '0.3']);
    expect(r.suggested).toEqual({ kind: 'loadCurve', xColumn: 0, yColumn: 1, xScale: 1e-3, yScale: 1e3 });
  });

  it('reads a semicolon file with decimal commas, CRLF and a comment line', () => {
    const r = inspectCsv(fixture('load-curve-semicolon.csv'));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.delimiter).toBe(';');
    expect(r.decimalComma).toBe(true);
    expect(r.headerLines).toEqual([2]);
    expect(r.suggested.kind).toBe('loadCurve');
    expect(r.suggested.xScale).toBeCloseTo(1e-6, 15);
    const p = readPoints(fixture('load-curve-semicolon.csv'), r.suggested);
    expect(p.ok).toBe(true);
    if (!p.ok) return;
    expect(p.points[0]).toEqual({ line: 3, x: 0, y: 1501.2 });
    expect(p.points[6].x).toBeCloseTo(200e-6, 15);
    expect(p.points[6].y).toBeCloseTo(1473.3, 9);
  });

  it('takes a units row under the header and guesses a ripple mapping from a time column', () => {
    const text = '# scope\ntime\tCH1\ns\tmV\n0\t12\n1e-6\t15\n2e-6\t11\n';
    const r = inspectCsv(text);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.headerLines).toEqual([2, 3]);
    expect(r.columns.map((c) => c.name)).toEqual(['time (s)', 'CH1 (mV)']);
    expect(r.suggested).toEqual({ kind: 'ripple', xColumn: 0, yColumn: 1, xScale: 1, yScale: 1e-3 });
  });

  it('names columns by number without a header', () => {
    const r = inspectCsv('0,100\n1,99\n');
    expect(r.ok && r.columns.map((c) => c.name)).toEqual(['Column 1', 'Column 2']);
    expect(r.ok && r.headerLines).toEqual([]);
  });

  it('refuses an empty file, a header without data, one column and too many rows, with the line', () => {
    expect(inspectCsv('')).toEqual({ ok: false, errors: [{ line: 1, reason: expect.stringMatching(/no data lines/) }] });
    expect(inspectCsv('# only a comment\n\nI,V\n')).toEqual({ ok: false, errors: [{ line: 3, reason: expect.stringMatching(/header but no data/) }] });
    expect(inspectCsv('V\n1\n2\n')).toEqual({ ok: false, errors: [{ line: 2, reason: expect.stringMatching(/only one column/) }] });
    const rows = Array.from({ length: MAX_BENCH_ROWS + 5 }, (_, i) => `${i},1`).join('\n');
    const big = inspectCsv(`I,V\n${rows}\n`);
    // the header is line 1, data row k is line k + 1: the first row past the limit is line 20 002
    expect(big).toEqual({ ok: false, errors: [{ line: MAX_BENCH_ROWS + 2, reason: expect.stringMatching(/more than 20 000 data rows/) }] });
    expect(inspectCsv(`I,V\n${Array.from({ length: MAX_BENCH_ROWS }, (_, i) => `${i},1`).join('\n')}`).ok).toBe(true);
  });
});

describe('readPoints', () => {
  const loadMap = { kind: 'loadCurve' as const, xColumn: 0, yColumn: 1, xScale: 1e-3, yScale: 1e3 };

  it('reads a good file into SI points with their lines', () => {
    const r = readPoints(fixture('load-curve-good.csv'), loadMap);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.points.map((p) => p.line)).toEqual([2, 3, 4, 5, 6]);
    expect(r.points[4].x).toBeCloseTo(3e-4, 15);
    expect(r.points[4].y).toBeCloseTo(11840, 9);
  });

  it('lists a non-numeric and a missing cell with their lines', () => {
    const r = readPoints(fixture('load-curve-broken.csv'), loadMap);
    expect(r).toEqual({
      ok: false,
      errors: [
        { line: 4, reason: '"eleven" in column "Vout (kV)" is not a number' },
        { line: 6, reason: 'missing cell in column "Vout (kV)" (the line has 1 cell)' },
      ],
    });
  });

  it('refuses a ripple capture whose time goes backwards, naming both lines', () => {
    const text = fixture('ripple-time-backwards.csv');
    const i = inspectCsv(text);
    expect(i.ok && i.suggested.kind).toBe('ripple');
    const r = readPoints(text, { kind: 'ripple', xColumn: 0, yColumn: 1, xScale: 1, yScale: 1 });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0].line).toBe(7);
    expect(r.errors[0].reason).toMatch(/time 15 µs is not after the previous row's 20 µs \(line 6\)/);
  });

  it('needs two points, existing columns and non-negative load currents', () => {
    const one = readPoints(fixture('one-point.csv'), { ...loadMap, xColumn: 1, yColumn: 0 });
    expect(one).toEqual({ ok: false, errors: [{ line: 2, reason: expect.stringMatching(/only 1 usable data row: a load current vs output voltage curve needs at least 2/) }] });
    const wide = readPoints(fixture('load-curve-good.csv'), { ...loadMap, yColumn: 4 });
    expect(wide).toEqual({ ok: false, errors: [{ line: 1, reason: 'the y column (number 5) does not exist: the file has 2 columns' }] });
    const neg = readPoints('I,V\n0,10\n-1,9\n', { ...loadMap, xScale: 1, yScale: 1 });
    expect(neg).toEqual({ ok: false, errors: [{ line: 3, reason: expect.stringMatching(/negative/) }] });
  });

  it('lists at most 50 problems and counts the rest', () => {
    const text = `I,V\n${Array.from({ length: 80 }, (_, i) => `${i},x`).join('\n')}\n`;
    const r = readPoints(text, { ...loadMap, xScale: 1, yScale: 1 });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(51);
    expect(r.errors[0].line).toBe(2);
    expect(r.errors[50].reason).toBe('and 30 more problems after this line');
  });

  it('keeps quoted cells whole (papaparse) and skips trailing delimiters', () => {
    const r = readPoints('"I, mA","V"\n"0",5,\n1,"4.5",\n', { kind: 'loadCurve', xColumn: 0, yColumn: 1, xScale: 1, yScale: 1 });
    expect(r.ok && r.points).toEqual([
      { line: 2, x: 0, y: 5 },
      { line: 3, x: 1, y: 4.5 },
    ]);
  });
});

describe('the mapping schema', () => {
  it('refuses equal columns and non-positive scales', () => {
    expect(benchMappingSchema.safeParse({ kind: 'ripple', xColumn: 1, yColumn: 1, xScale: 1, yScale: 1 }).success).toBe(false);
    expect(benchMappingSchema.safeParse({ kind: 'ripple', xColumn: 0, yColumn: 1, xScale: 0, yScale: 1 }).success).toBe(false);
    expect(benchMappingSchema.safeParse({ kind: 'bode', xColumn: 0, yColumn: 1, xScale: 1, yScale: 1 }).success).toBe(false);
    expect(benchMappingSchema.safeParse({ kind: 'loadCurve', xColumn: 0, yColumn: 1, xScale: 1e-3, yScale: 1e3 }).success).toBe(true);
  });
});
