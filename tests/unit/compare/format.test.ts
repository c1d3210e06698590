import { describe, expect, it } from 'vitest';
import { formatMetricDelta, formatMetricValue, formatRelative } from '@/lib/compare';

describe('compare table text', () => {
  it('writes figures with prefixes, margins as per cent', () => {
    expect(formatMetricValue(5987.25, 'V')).toBe('5.987 kV');
    expect(formatMetricValue(0.35, 'J')).toBe('350 mJ');
    expect(formatMetricValue(-1.5, '%')).toBe('-150 %');
    expect(formatMetricValue(null, 'V')).toBe('—');
  });

  it('writes signed differences with a true minus and margins in points', () => {
    expect(formatMetricDelta(1500, 'V')).toBe('+1.5 kV');
    expect(formatMetricDelta(-1.49, 'V')).toBe('−1.49 V');
    expect(formatMetricDelta(0, 'J')).toBe('0 J');
    expect(formatMetricDelta(-0.041, '%')).toBe('−4.1 pts');
    expect(formatMetricDelta(null, 'V')).toBe('—');
    expect(formatRelative(-0.5)).toBe('−50 %');
    expect(formatRelative(0.1234)).toBe('+12.3 %');
    expect(formatRelative(null)).toBe('—');
  });
});
