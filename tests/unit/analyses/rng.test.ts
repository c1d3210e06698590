/**
 * The seeded generator behind the tolerance spread: deterministic per seed, per-sample streams
 * independent of the order samples are computed in, and draws with the moments of the uniform
 * and standard normal distributions (mean ½ and variance 1/12; mean 0 and variance 1 — textbook
 * facts) within a few standard errors.
 */
import { describe, expect, it } from 'vitest';
import { mulberry32, normal, sampleSeed } from '@/lib/analyses/rng';
import { mean, std } from '@/lib/analyses/stats';

describe('mulberry32', () => {
  it('repeats the same stream for the same seed and differs for another', () => {
    const a = mulberry32(12345);
    const b = mulberry32(12345);
    const c = mulberry32(12346);
    const xa = Array.from({ length: 5 }, a);
    expect(Array.from({ length: 5 }, b)).toEqual(xa);
    expect(Array.from({ length: 5 }, c)).not.toEqual(xa);
  });
  it('stays in [0, 1) with the uniform distribution’s mean and variance', () => {
    const r = mulberry32(7);
    const xs = Array.from({ length: 20_000 }, r);
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...xs)).toBeLessThan(1);
    // Standard error of the mean: √(1/12 / 20000) ≈ 0.002.
    expect(Math.abs(mean(xs) - 0.5)).toBeLessThan(0.008);
    expect(Math.abs(std(xs) ** 2 - 1 / 12)).toBeLessThan(0.003);
  });
});

describe('sample streams', () => {
  it('give sample k the same draws whatever else was drawn before', () => {
    const first = mulberry32(sampleSeed(99, 7))();
    mulberry32(sampleSeed(99, 3))();
    expect(mulberry32(sampleSeed(99, 7))()).toBe(first);
  });
  it('differ between samples and between seeds', () => {
    const seeds = new Set(Array.from({ length: 1000 }, (_, i) => sampleSeed(1, i)));
    expect(seeds.size).toBe(1000);
    expect(sampleSeed(1, 0)).not.toBe(sampleSeed(2, 0));
  });
});

describe('normal (Box–Muller)', () => {
  it('has mean 0 and standard deviation 1', () => {
    const r = mulberry32(2024);
    const xs = Array.from({ length: 20_000 }, () => normal(r));
    expect(Math.abs(mean(xs))).toBeLessThan(0.03);
    expect(Math.abs(std(xs) - 1)).toBeLessThan(0.03);
  });
});
