/**
 * The derating in force: the stricter (smaller) of the design's fraction and the team policy,
 * 0.8 of the rating when neither is set (common practice: parts run at no more than 80 % of
 * their rated voltage, current and power).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_DERATING_FRACTION, effectiveDerating, isDeratingFraction, resolveDerating } from '@/lib/parts/derating';

describe('effective derating', () => {
  it('defaults to 0.8 of the rating (common practice)', () => {
    expect(DEFAULT_DERATING_FRACTION).toBe(0.8);
    expect(effectiveDerating(undefined, undefined)).toBe(0.8);
    expect(resolveDerating(null, null)).toEqual({ fraction: 0.8, source: 'default' });
  });

  it('takes the smaller fraction: the team can tighten a design, the design can tighten the team', () => {
    expect(resolveDerating(0.8, 0.5)).toEqual({ fraction: 0.5, source: 'team' });
    expect(resolveDerating(0.6, 0.9)).toEqual({ fraction: 0.6, source: 'design' });
    // Agreeing values are the team's rule.
    expect(resolveDerating(0.7, 0.7)).toEqual({ fraction: 0.7, source: 'team' });
    expect(effectiveDerating(1, 0.75)).toBe(0.75);
  });

  it('uses whichever one is set', () => {
    expect(resolveDerating(0.65, undefined)).toEqual({ fraction: 0.65, source: 'design' });
    expect(resolveDerating(undefined, 0.55)).toEqual({ fraction: 0.55, source: 'team' });
  });

  it('ignores values that are not fractions in (0, 1]', () => {
    for (const bad of [0, -0.2, 1.2, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(isDeratingFraction(bad)).toBe(false);
      expect(resolveDerating(bad, 0.6)).toEqual({ fraction: 0.6, source: 'team' });
      expect(resolveDerating(0.7, bad)).toEqual({ fraction: 0.7, source: 'design' });
    }
    expect(isDeratingFraction(1)).toBe(true);
  });
});
