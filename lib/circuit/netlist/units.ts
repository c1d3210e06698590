/**
 * SPICE engineering notation: reading values such as `4.7k`, `10uF`, `2.5MegV`, `1e-3`, and
 * writing SI values with a prefix for the UI (`4.70 nF`). The scale letters follow the SPICE 3
 * convention (Berkeley SPICE 3 user's guide, "numbers"): f p n u m k meg g t, case-insensitive,
 * `meg` before `m`, letters after the scale factor (the unit) ignored. We also accept `µ`/`μ`
 * for micro, and `mil` (25.4e-6) as SPICE does.
 */

const NUMBER_RE = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))(?:[eE]([+-]?\d+))?(.*)$/;
/** Unit letters that may follow the number or the scale factor (`F`, `Ohm`, `Ω`, `Hz`, `V`, `A`…). */
const UNIT_TAIL_RE = /^[A-Za-zΩ°]*$/;

/** Scale letters as powers of ten, so `10u` is read as exactly `10e-6`. */
const SCALE_EXP: Record<string, number> = { f: -15, p: -12, n: -9, u: -6, µ: -6, μ: -6, m: -3, k: 3, g: 9, t: 12 };

/**
 * Parse a SPICE number with an optional engineering suffix. Returns `null` for anything that is
 * not a finite number (including `NaN`, `Infinity`, overflowing exponents and stray characters).
 */
export function parseEngineering(text: string): number | null {
  const trimmed = text.trim();
  if (trimmed.length === 0 || trimmed.length > 64) return null;
  const m = NUMBER_RE.exec(trimmed);
  if (!m) return null;
  const mantissa = m[1];
  const exp = m[2] === undefined ? 0 : Number(m[2]);
  const rest = m[3];
  let scaleExp = 0;
  let factor = 1;
  let tail = rest;
  const lower = rest.toLowerCase();
  if (lower.startsWith('meg')) {
    scaleExp = 6;
    tail = rest.slice(3);
  } else if (lower.startsWith('mil')) {
    factor = 25.4e-6;
    tail = rest.slice(3);
  } else if (lower.length > 0 && SCALE_EXP[lower[0]] !== undefined) {
    scaleExp = SCALE_EXP[lower[0]];
    tail = rest.slice(1);
  }
  if (!UNIT_TAIL_RE.test(tail) || !Number.isFinite(exp)) return null;
  const value = Number(`${mantissa}e${exp + scaleExp}`) * factor;
  return Number.isFinite(value) ? value : null;
}

const PREFIXES: Array<[number, string]> = [
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

/**
 * Format an SI value with an engineering prefix and `digits` significant digits for display:
 * `formatEngineering(4.7e-9, 'F')` → `4.70 nF`, `(25e3, 'V')` → `25.0 kV`, `(1.2e6, 'Ω')` →
 * `1.20 MΩ`. `0` → `0 V`; NaN → `—`; ±Infinity → `∞ V` / `-∞ V`. Negative values use `-`.
 */
export function formatEngineering(value: number, unit: string, digits = 3): string {
  if (Number.isNaN(value)) return '—';
  const sign = value < 0 ? '-' : '';
  const abs = Math.abs(value);
  if (!Number.isFinite(abs)) return `${sign}∞ ${unit}`.trimEnd();
  if (abs === 0) return `0 ${unit}`.trimEnd();
  const d = Math.max(1, Math.min(15, Math.round(digits)));
  for (let i = 0; i < PREFIXES.length; i++) {
    const [scale, prefix] = PREFIXES[i];
    const last = i === PREFIXES.length - 1;
    if (abs >= scale * (1 - 0.5 * 10 ** -d) || last) {
      let mantissa = Number((abs / scale).toPrecision(d));
      let p = prefix;
      // Rounding may carry into the next prefix (999.6 → 1000 → 1.00 k).
      if (mantissa >= 1000 && i > 0) {
        mantissa = Number((abs / PREFIXES[i - 1][0]).toPrecision(d));
        p = PREFIXES[i - 1][1];
      }
      // Below the smallest prefix (or above the largest) fall back to plain exponent notation.
      if (mantissa < 1 || mantissa >= 1e4) return `${sign}${abs.toExponential(d - 1)} ${unit}`.trimEnd();
      return `${sign}${mantissa.toPrecision(d)} ${p}${unit}`.trimEnd();
    }
  }
  return `${sign}${abs.toPrecision(d)} ${unit}`.trimEnd();
}
