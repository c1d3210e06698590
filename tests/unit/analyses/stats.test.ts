/**
 * Percentiles, mean, standard deviation and histogram of the spread summary. Check values are
 * NumPy's `percentile` / R's `quantile(type = 7)` results for the same data (Hyndman & Fan 1996,
 * definition 7, from memory) and hand arithmetic.
 */
import { describe, expect, it } from 'vitest';
import { binCount, distribution, histogram, mean, percentile, std } from '@/lib/analyses/stats';

describe('percentile (Hyndman–Fan definition 7)', () => {
  const oneToTen = [10, 1, 9, 2, 8, 3, 7, 4, 6, 5];
  it('matches the interpolated order statistics of 1…10', () => {
    // numpy.percentile(range(1, 11), [5, 50, 95]) → 1.45, 5.5, 9.55
    expect(percentile(oneToTen, 5)).toBeCloseTo(1.45, 12);
    expect(percentile(oneToTen, 50)).toBeCloseTo(5.5, 12);
    expect(percentile(oneToTen, 95)).toBeCloseTo(9.55, 12);
    expect(percentile(oneToTen, 0)).toBe(1);
    expect(percentile(oneToTen, 100)).toBe(10);
  });
  it('gives the median of an odd count exactly, and the one value of a single sample', () => {
    expect(percentile([3, 1, 2], 50)).toBe(2);
    expect(percentile([42], 5)).toBe(42);
    expect(percentile([], 50)).toBeNaN();
  });
  it('refuses a percentile outside 0…100', () => {
    expect(() => percentile([1, 2], 101)).toThrow(RangeError);
  });
  it('does not reorder its input', () => {
    const xs = [3, 1, 2];
    percentile(xs, 50);
    expect(xs).toEqual([3, 1, 2]);
  });
});

describe('mean and sample standard deviation', () => {
  it('give 5 and √(32/7) for 2, 4, 4, 4, 5, 5, 7, 9', () => {
    const xs = [2, 4, 4, 4, 5, 5, 7, 9];
    expect(mean(xs)).toBe(5);
    expect(std(xs)).toBeCloseTo(Math.sqrt(32 / 7), 12);
  });
  it('a single value has no spread', () => {
    expect(std([7])).toBe(0);
  });
});

describe('histogram', () => {
  it('counts every value once, the largest in the last bin', () => {
    const xs = Array.from({ length: 100 }, (_, i) => i);
    const h = histogram(xs);
    expect(h).toHaveLength(10);
    expect(h.reduce((s, b) => s + b.count, 0)).toBe(100);
    expect(h.every((b) => b.count === 10)).toBe(true);
    expect(h[0].from).toBe(0);
    expect(h[9].to).toBe(99);
  });
  it('uses ⌈√n⌉ bins clamped to 5…30', () => {
    expect(binCount(4)).toBe(5);
    expect(binCount(40)).toBe(7);
    expect(binCount(2000)).toBe(30);
  });
  it('puts equal values in one bin', () => {
    expect(histogram([2, 2, 2])).toEqual([{ from: 2, to: 2, count: 3 }]);
  });
});

describe('distribution', () => {
  it('is null without values and summarises with the functions above', () => {
    expect(distribution([])).toBeNull();
    const d = distribution([1, 2, 3, 4, 5, 6, 7, 8, 9, 10])!;
    expect(d).toMatchObject({ n: 10, mean: 5.5, min: 1, max: 10 });
    expect(d.p5).toBeCloseTo(1.45, 12);
    expect(d.p95).toBeCloseTo(9.55, 12);
  });
});
