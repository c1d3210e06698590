/**
 * Units in bench-data column headers: "I (mA)", "Vout [kV]", "t (us)", "Time/ms", "CH1_V".
 * A header names at most one unit; the unit's SI prefix gives the scale factor that turns the
 * column's numbers into SI (A, V, s), and its base unit says what the column measures. Pure.
 */

/** What a column measures. */
export type Quantity = 'current' | 'voltage' | 'time';

/** A unit read from a header. */
export interface HeaderUnit {
  /** The unit as written, e.g. "mA", "kV", "µs". */
  unit: string;
  quantity: Quantity;
  /** Multiply the column's numbers by this to get SI (A, V, s). */
  scale: number;
}

/** SI prefixes accepted in headers (u and both micro signs mean micro). */
export const PREFIXES: Record<string, number> = {
  '': 1,
  p: 1e-12,
  n: 1e-9,
  u: 1e-6,
  'µ': 1e-6,
  'μ': 1e-6,
  m: 1e-3,
  k: 1e3,
  M: 1e6,
};

const BASES: Record<string, Quantity> = { A: 'current', V: 'voltage', s: 'time', sec: 'time' };

/** Read a unit token such as "mA", "kV", "us", "µs", "ms", "sec" (case of the base matters: "mV" ≠ "MV"). */
export function parseUnit(token: string): HeaderUnit | null {
  const t = token.trim();
  for (const [base, quantity] of Object.entries(BASES)) {
    if (!t.endsWith(base)) continue;
    const prefix = t.slice(0, t.length - base.length);
    if (prefix in PREFIXES) return { unit: t, quantity, scale: PREFIXES[prefix] };
  }
  return null;
}

/**
 * The unit a header names, if any: in brackets "(mA)" or "[kV]", after a slash "I/mA" (the ISO
 * 80000 "quantity/unit" style), or as the last word or `_`-part "Vout kV", "CH1_V".
 */
export function unitOfHeader(header: string): HeaderUnit | null {
  const h = header.trim();
  const bracket = /[([]\s*([^)\]]+?)\s*[)\]]\s*$/.exec(h) ?? /[([]\s*([^)\]]+?)\s*[)\]]/.exec(h);
  if (bracket) return parseUnit(bracket[1]);
  const slash = /\/\s*([^/\s]+)\s*$/.exec(h);
  if (slash) return parseUnit(slash[1]);
  const parts = h.split(/[\s_]+/).filter(Boolean);
  if (parts.length > 1) return parseUnit(parts[parts.length - 1]);
  return null;
}

/** The quantity a header's words suggest when it names no unit ("time", "Iload", "Vout", "current"). */
export function quantityOfName(header: string): Quantity | null {
  const h = header.trim().toLowerCase().replace(/[([].*$/, '').trim();
  if (h === '') return null;
  if (/\b(time|zeit|temps|sec|seconds?)\b/.test(h) || /^t(\b|_|\d|$)/.test(h)) return 'time';
  if (/current|amps?\b|\bload\b|^i(\b|_|\d|[a-z]*$)/.test(h)) return 'current';
  if (/volt|\bout|\bch\d|^v(\b|_|\d|[a-z]*$)|^u(\b|_|\d|out)/.test(h)) return 'voltage';
  return null;
}

/** A value in engineering notation for messages: 1.2 mA, 30 kV, 2.5 µs (3 significant figures). */
export function formatSi(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const steps: [number, string][] = [
    [1e6, 'M'],
    [1e3, 'k'],
    [1, ''],
    [1e-3, 'm'],
    [1e-6, 'µ'],
    [1e-9, 'n'],
    [1e-12, 'p'],
  ];
  const a = Math.abs(value);
  const [f, p] = steps.find(([f]) => a >= f * 0.9995) ?? steps[steps.length - 1];
  return `${Number((value / f).toPrecision(3))} ${p}${unit}`;
}
