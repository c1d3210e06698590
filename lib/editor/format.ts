/**
 * Engineering notation at the editor's edge: reading what a designer types into a value field
 * (`4.7n`, `25k`, `1.2meg`, `4.7nF`, `40 kHz`) and writing SI numbers back for fields, readings,
 * tables and plot axes. The scale letters are the SPICE 3 convention the engine's
 * `parseEngineering` implements (Berkeley SPICE 3 user's guide, "numbers", from memory):
 * f p n u m k meg g t, case-insensitive. Two spellings that SPICE reads silently but that a
 * designer almost never means are refused with a reason instead: a bare upper-case `M` (SPICE
 * reads milli, people mean mega) and a lone `F` in a capacitance field (SPICE reads femto).
 * The letter-as-decimal-point code printed on parts (IEC 60062 "RKM" code, from memory:
 * `4k7` = 4.7 k, `2n2` = 2.2 n, `1meg5` = 1.5 meg) is read too.
 * Nothing here is used for computation.
 */
import { formatEngineering, parseEngineering } from '@/lib/circuit';

/** Outcome of reading a typed value: the SI number, or the reason it was refused. */
export type ParsedQuantity = { ok: true; value: number } | { ok: false; reason: string };

/** Refusal reasons the fields show (kept as constants so tests and UI agree on the wording). */
export const REASON_EMPTY = 'enter a value';
export const REASON_NOT_A_NUMBER = 'not a number';
export const REASON_SUFFIX = 'use k, meg, m, u, n, p… after the number';
export const REASON_UPPER_M = 'M reads as milli in SPICE notation: write meg for mega, m for milli';
export const REASON_LONE_F = 'a lone F reads as femto: write the prefix, e.g. 4.7nF, or 10fF for femtofarads';
export const REASON_COMMA = 'use a point for decimals (4.7n, not 4,7n)';

const NUMBER_HEAD_RE = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/;
/** IEC 60062 letter-as-decimal-point: integer part, scale letter(s), fraction digits, optional unit. */
const RKM_RE = /^([+-]?\d+)(meg|[fpnuµμmkgt])(\d+)(.*)$/i;
const SCALE_LETTERS = new Set(['f', 'p', 'n', 'u', 'µ', 'μ', 'm', 'k', 'g', 't']);

/** Spellings accepted after the scale for each unit the editor's fields use (lower case). */
const UNIT_SPELLINGS: Record<string, string[]> = {
  F: ['f'],
  V: ['v'],
  A: ['a'],
  W: ['w'],
  Hz: ['hz'],
  s: ['s', 'sec'],
  'Ω': ['ω', 'ohm', 'ohms', 'r'],
  '°': ['°', 'deg'],
  '%': ['%'],
  J: ['j'],
  C: ['c'],
};

function isUnitTail(tail: string, unit: string): boolean {
  if (tail === '') return true;
  const spellings = UNIT_SPELLINGS[unit] ?? [unit.toLowerCase()];
  return unit !== '' && spellings.includes(tail.toLowerCase());
}

/**
 * Read a value typed into a field whose unit is `unit` (`'F'`, `'Ω'`, `'V'`, `'A'`, `'Hz'`,
 * `'s'`, `'W'`, `'°'`, `'%'` or `''` for a plain number). Accepts an optional scale letter and
 * the unit, with or without a space: `4.7n`, `4.7nF`, `4.7 nF`, `25k`, `25kΩ`, `25kohm`,
 * `1.2meg`, `40 kHz`, `1e-3`, `4k7`. Returns the SI value, or a reason: {@link REASON_EMPTY},
 * {@link REASON_NOT_A_NUMBER}, {@link REASON_SUFFIX} (with the unit), {@link REASON_UPPER_M},
 * {@link REASON_LONE_F}, {@link REASON_COMMA}.
 */
export function parseQuantity(text: string, unit: string): ParsedQuantity {
  const trimmed = text.trim();
  if (trimmed === '') return { ok: false, reason: REASON_EMPTY };
  if (/^[+-]?\d*,\d/.test(trimmed)) return { ok: false, reason: REASON_COMMA };
  const rkm = RKM_RE.exec(trimmed);
  if (rkm) {
    const [, whole, scale, fraction, unitTail] = rkm;
    return parseQuantity(`${whole}.${fraction}${scale}${unitTail}`, unit);
  }
  const m = NUMBER_HEAD_RE.exec(trimmed);
  if (!m) return { ok: false, reason: REASON_NOT_A_NUMBER };
  const [, number, suffix] = m;
  const suffixReason = unit === '' ? REASON_SUFFIX : `${REASON_SUFFIX} (the unit ${unit} is optional)`;
  let tail = suffix;
  if (suffix.toLowerCase().startsWith('meg')) {
    tail = suffix.slice(3);
  } else if (suffix.startsWith('M')) {
    return { ok: false, reason: REASON_UPPER_M };
  } else if (unit === 'F' && (suffix === 'F' || suffix === 'f')) {
    return { ok: false, reason: REASON_LONE_F };
  } else if (suffix.length > 0 && SCALE_LETTERS.has(suffix[0].toLowerCase()) && !isUnitTail(suffix, unit)) {
    tail = suffix.slice(1);
  }
  if (!isUnitTail(tail, unit)) return { ok: false, reason: suffixReason };
  // The engine's reader does the arithmetic, so a field and a netlist read `4.7n` identically.
  const scale = suffix.slice(0, suffix.length - tail.length);
  const value = parseEngineering(`${number}${scale}`);
  if (value === null) return { ok: false, reason: REASON_NOT_A_NUMBER };
  return { ok: true, value };
}

const INPUT_PREFIXES: Array<[number, string]> = [
  [1e12, 't'],
  [1e9, 'g'],
  [1e6, 'meg'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'u'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

/**
 * Write an SI value as a field's editable text in SPICE notation, up to `digits` significant
 * digits with trailing zeros dropped, so that {@link parseQuantity} reads it back:
 * 4.7e-9 → `4.7n`, 25e3 → `25k`, 1.2e6 → `1.2meg`, 0.8 → `800m`, 0 → `0`. Micro is written `u`
 * (the ASCII SPICE letter). Values below 1 f or from 1000 T on use exponent notation.
 */
export function formatInputValue(value: number, digits = 6): string {
  if (!Number.isFinite(value)) return '';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  const sign = value < 0 ? '-' : '';
  for (let i = 0; i < INPUT_PREFIXES.length; i++) {
    const [scale, prefix] = INPUT_PREFIXES[i];
    let mantissa = Number((abs / scale).toPrecision(digits));
    if (mantissa >= 1 || i === INPUT_PREFIXES.length - 1) {
      let p = prefix;
      if (mantissa >= 1000 && i > 0) {
        mantissa = Number((abs / INPUT_PREFIXES[i - 1][0]).toPrecision(digits));
        p = INPUT_PREFIXES[i - 1][1];
      }
      if (mantissa < 1 || mantissa >= 1000) return `${sign}${Number(abs.toPrecision(digits)).toExponential()}`;
      return `${sign}${mantissa}${p}`;
    }
  }
  return `${sign}${abs}`;
}

/**
 * A reading for display: engineering prefix, `digits` significant digits, the unit —
 * `formatReading(12410, 'V')` → `12.41 kV`. NaN/±∞ as the engine formats them; null → `—`.
 */
export function formatReading(value: number | null | undefined, unit: string, digits = 4): string {
  if (value === null || value === undefined) return '—';
  return formatEngineering(value, unit, digits);
}

/** A fraction as a percentage, e.g. 0.0123 → `1.23 %`; null/non-finite → `—`. */
export function formatPercent(fraction: number | null | undefined, digits = 3): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
  const pct = fraction * 100;
  if (pct === 0) return '0 %';
  return `${Number(pct.toPrecision(digits))} %`;
}

/** A signed percentage difference, e.g. 0.012 → `+1.2 %`, −0.5 → `−50 %` (true minus sign). */
export function formatSignedPercent(fraction: number | null | undefined, digits = 2): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
  const pct = Number((fraction * 100).toPrecision(digits));
  if (pct === 0) return '0 %';
  return `${pct > 0 ? '+' : '−'}${Math.abs(pct)} %`;
}

/** A display unit for a plot axis: the factor to multiply SI values by and its label. */
export interface AxisScale {
  factor: number;
  unit: string;
}

/**
 * Time axis of a plot spanning `spanS` seconds: µs below 1 ms, ms below 1 s, s above — one
 * period at 40 kHz (25 µs) is drawn in µs, at 50 Hz (20 ms) in ms.
 */
export function timeScale(spanS: number): AxisScale {
  const s = Math.abs(spanS);
  if (s < 1e-3) return { factor: 1e6, unit: 'µs' };
  if (s < 1) return { factor: 1e3, unit: 'ms' };
  return { factor: 1, unit: 's' };
}

/** Voltage axis for values up to `maxAbsV` volts: V below 1 kV, kV below 1 MV, MV above. */
export function voltScale(maxAbsV: number): AxisScale {
  const v = Math.abs(maxAbsV);
  if (v >= 1e6) return { factor: 1e-6, unit: 'MV' };
  if (v >= 1e3) return { factor: 1e-3, unit: 'kV' };
  return { factor: 1, unit: 'V' };
}
