/**
 * Seeded hostile-input generators shared by the fuzz tests (tests/unit/fuzz, tests/routes/fuzz).
 * Everything is deterministic for a seed (mulberry32), so a failure names the seed and case and
 * reproduces exactly: `FUZZ_SEED=1234 npx vitest run tests/unit/fuzz`.
 */

/** The seed of this run: FUZZ_SEED or a fixed default (so CI runs are repeatable). */
export const FUZZ_SEED = Number(process.env.FUZZ_SEED ?? 20261202);

/** mulberry32: a small, well-known 32-bit PRNG; returns floats in [0, 1). */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type Rand = ReturnType<typeof rng>;
export const pick = <T>(r: Rand, xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
export const int = (r: Rand, lo: number, hi: number): number => lo + Math.floor(r() * (hi - lo + 1));

/** Numbers that break naive code: huge, tiny, negative zero, non-finite, integer edges. */
export const NASTY_NUMBERS: readonly number[] = [
  0, -0, 1, -1, 1e308, -1e308, 5e-324, -5e-324, Number.MAX_SAFE_INTEGER, Number.MAX_SAFE_INTEGER + 2, Number.MIN_SAFE_INTEGER,
  Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 2 ** 31, -(2 ** 31), 2 ** 53, 1e-300, 0.1 + 0.2,
];

/** Strings that break naive code: number-looking text, control characters, unicode, paths, markup. */
export const NASTY_STRINGS: readonly string[] = [
  '', ' ', '1e999', '-1e999', 'NaN', 'Infinity', '-Infinity', '-0', '0x1F', '1_000', '１２３', '1e-400', '١٢٣',
  '\u0000', '\u0000\u0001\u0002\u001f\u007f', '\r\n\r\n', '\t\v\f', '\u2028\u2029', '\ufeff', '\ud800', '\udfff\ud800',
  'Ω µ ° ±', '🔥⚡️💀', 'ǅ̸̢̛̘̗͚̥̰͇̈́͌̓ͅ', 'ﷺ', 'e\u0301', '\u202e gnp.exe',
  '../../etc/passwd', '..\\..\\windows\\win.ini', '%2e%2e%2f%2e%2e%2fetc%2fpasswd', '/dev/zero', 'C:\\con\\aux', 'nul',
  '<script>alert(1)</script>', '"; DROP TABLE designs; --', "' OR '1'='1", '${process.env.NEXTAUTH_SECRET}', '{{7*7}}',
  '__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty',
];

/** A JSON text nesting `depth` arrays (or objects) — built as text, never recursively. */
export function deepJsonText(depth: number, kind: 'array' | 'object' = 'array'): string {
  return kind === 'array' ? '['.repeat(depth) + ']'.repeat(depth) : '{"a":'.repeat(depth) + '0' + '}'.repeat(depth);
}

/** `bytes` random bytes. */
export function randomBytes(r: Rand, bytes: number): Uint8Array {
  const out = new Uint8Array(bytes);
  for (let i = 0; i < bytes; i++) out[i] = Math.floor(r() * 256);
  return out;
}

/** A random string of `length` characters drawn from all of Unicode's BMP, controls included. */
export function randomText(r: Rand, length: number): string {
  let s = '';
  for (let i = 0; i < length; i++) s += String.fromCharCode(Math.floor(r() * 0x10000));
  return s;
}

/** A random JSON-ish value (bounded depth), mixing nasty numbers and strings, arrays and objects. */
export function randomValue(r: Rand, depth = 0): unknown {
  const k = r();
  if (depth > 4 || k < 0.25) return pick(r, NASTY_NUMBERS);
  if (k < 0.5) return pick(r, NASTY_STRINGS);
  if (k < 0.58) return pick(r, [null, true, false, undefined]);
  if (k < 0.78) return Array.from({ length: int(r, 0, 4) }, () => randomValue(r, depth + 1));
  const o: Record<string, unknown> = {};
  for (let i = int(r, 0, 5); i > 0; i--) o[pick(r, [...NASTY_STRINGS, 'id', 'kind', 'data', 'blocks', 'wires', 'title', 'document', 'baseRevision'])] = randomValue(r, depth + 1);
  return o;
}

/**
 * Replace one randomly chosen leaf of a (JSON-cloned) value by something hostile: a mutation
 * of a valid document keeps most of its shape, which reaches deeper into a validator than noise.
 */
export function mutate<T>(r: Rand, value: T): unknown {
  const copy = JSON.parse(JSON.stringify(value)) as unknown;
  const paths: (string | number)[][] = [];
  const walk = (v: unknown, p: (string | number)[]) => {
    paths.push(p);
    if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...p, i]));
    else if (v && typeof v === 'object') for (const [key, x] of Object.entries(v)) walk(x, [...p, key]);
  };
  walk(copy, []);
  const path = pick(r, paths.slice(1));
  if (!path) return randomValue(r);
  let parent = copy as Record<string | number, unknown>;
  for (const key of path.slice(0, -1)) parent = parent[key] as Record<string | number, unknown>;
  const last = path[path.length - 1];
  const choice = r();
  if (choice < 0.15) delete parent[last];
  else parent[last] = choice < 0.55 ? pick(r, NASTY_NUMBERS) : choice < 0.85 ? pick(r, NASTY_STRINGS) : randomValue(r);
  return copy;
}

/**
 * Run `fn` and return its value, or rethrow with the case name; fail when it takes more than
 * `budgetMs` of wall-clock time (the calls here are synchronous, so a hang shows as a long call
 * that the test then reports rather than a stuck run: the budgets are generous bounds).
 */
export function timed<T>(name: string, budgetMs: number, fn: () => T): { value: T; ms: number } {
  const t0 = performance.now();
  let value: T;
  try {
    value = fn();
  } catch (e) {
    throw new Error(`[fuzz seed ${FUZZ_SEED}] ${name} threw ${(e as Error)?.name}: ${(e as Error)?.message}`, { cause: e });
  }
  const ms = performance.now() - t0;
  if (ms > budgetMs) throw new Error(`[fuzz seed ${FUZZ_SEED}] ${name} took ${ms.toFixed(0)} ms (budget ${budgetMs} ms)`);
  return { value, ms };
}
