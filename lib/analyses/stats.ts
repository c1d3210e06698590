/**
 * Summary statistics of a spread: mean, sample standard deviation, percentiles and a histogram.
 *
 * Percentiles interpolate linearly between order statistics (Hyndman & Fan 1996, "Sample
 * quantiles in statistical packages", The American Statistician 50(4), definition 7 — the
 * default of R's `quantile`, NumPy's `percentile` and spreadsheets' PERCENTILE.INC; from memory).
 * Histogram bins: equal width from the smallest to the largest value, ⌈√N⌉ of them clamped to
 * 5…30 (the square-root rule, common practice).
 */

/** One histogram bin: values v with from ≤ v < to (the last bin also holds v = to). */
export interface Bin {
  from: number;
  to: number;
  count: number;
}

/** What the spread reports for one figure (output DC or ripple). */
export interface Distribution {
  /** Number of values summarised. */
  n: number;
  mean: number;
  /** Sample standard deviation (divides by n − 1; 0 for one value). */
  std: number;
  min: number;
  max: number;
  p5: number;
  p50: number;
  p95: number;
  histogram: Bin[];
}

export function mean(xs: readonly number[]): number {
  if (xs.length === 0) return NaN;
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

/** Sample standard deviation (n − 1 in the denominator). */
export function std(xs: readonly number[]): number {
  if (xs.length < 2) return 0;
  const m = mean(xs);
  let s = 0;
  for (const x of xs) s += (x - m) * (x - m);
  return Math.sqrt(s / (xs.length - 1));
}

/** The p-th percentile (0 ≤ p ≤ 100) of `xs`, Hyndman–Fan definition 7. */
export function percentile(xs: readonly number[], p: number): number {
  if (xs.length === 0) return NaN;
  if (!(p >= 0 && p <= 100)) throw new RangeError('percentile must be between 0 and 100');
  const s = [...xs].sort((a, b) => a - b);
  const h = (s.length - 1) * (p / 100);
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, s.length - 1);
  return s[lo] + (h - lo) * (s[hi] - s[lo]);
}

/** Number of histogram bins for `n` values: ⌈√n⌉ clamped to 5…30. */
export function binCount(n: number): number {
  return Math.min(30, Math.max(5, Math.ceil(Math.sqrt(n))));
}

/** Equal-width histogram of `xs` over [min, max]; a single bin when every value is the same. */
export function histogram(xs: readonly number[], bins = binCount(xs.length)): Bin[] {
  if (xs.length === 0) return [];
  let min = Infinity;
  let max = -Infinity;
  for (const x of xs) {
    if (x < min) min = x;
    if (x > max) max = x;
  }
  if (!(max > min)) return [{ from: min, to: max, count: xs.length }];
  const width = (max - min) / bins;
  const out: Bin[] = Array.from({ length: bins }, (_, i) => ({ from: min + i * width, to: i === bins - 1 ? max : min + (i + 1) * width, count: 0 }));
  for (const x of xs) out[Math.min(bins - 1, Math.floor((x - min) / width))].count += 1;
  return out;
}

/** Everything {@link Distribution} holds for `xs`; null when there are no values. */
export function distribution(xs: readonly number[]): Distribution | null {
  if (xs.length === 0) return null;
  return {
    n: xs.length,
    mean: mean(xs),
    std: std(xs),
    min: Math.min(...xs),
    max: Math.max(...xs),
    p5: percentile(xs, 5),
    p50: percentile(xs, 50),
    p95: percentile(xs, 95),
    histogram: histogram(xs),
  };
}
