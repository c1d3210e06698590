import { describe, expect, it } from 'vitest';
import { axisUnit, overlaySeries, sameScale, thin, unitChoices } from '@/lib/bench/display';
import { compareLoadCurve } from '@/lib/bench/compare';

describe('bench panel display', () => {
  it('offers the units of each axis, and a guessed scale that is none of them', () => {
    expect(unitChoices('loadCurve', 'x').map((c) => c.label)).toEqual(['A', 'mA', 'µA', 'nA']);
    expect(unitChoices('ripple', 'x').map((c) => c.label)).toEqual(['s', 'ms', 'µs', 'ns']);
    expect(unitChoices('ripple', 'y', 1e3).map((c) => c.label)).toEqual(['MV', 'kV', 'V', 'mV']);
    expect(unitChoices('loadCurve', 'y', 1000.5).at(-1)).toEqual({ label: '× 1000.5', scale: 1000.5 });
    expect(sameScale(1e-6, 0.000001)).toBe(true);
    expect(sameScale(1e-6, 1e-3)).toBe(false);
  });

  it('picks axis units from the largest value', () => {
    expect(axisUnit('current', 3e-4)).toEqual({ factor: 1e6, unit: 'µA' });
    expect(axisUnit('current', 2e-3)).toEqual({ factor: 1e3, unit: 'mA' });
    expect(axisUnit('time', 5e-5)).toEqual({ factor: 1e6, unit: 'µs' });
    expect(axisUnit('voltage', 12_000)).toEqual({ factor: 1e-3, unit: 'kV' });
    expect(axisUnit('voltage', 3)).toEqual({ factor: 1, unit: 'V' });
  });

  it('thins long series keeping both ends', () => {
    const xs = Array.from({ length: 10_001 }, (_, i) => i);
    const t = thin(xs, 1000);
    expect(t.length).toBeLessThanOrEqual(1001);
    expect(t[0]).toBe(0);
    expect(t.at(-1)).toBe(10_000);
    expect(thin([1, 2, 3], 10)).toEqual([1, 2, 3]);
  });

  it('draws a load curve in µA/mA and kV', () => {
    const c = compareLoadCurve([{ line: 2, x: 1e-4, y: 11_900 }, { line: 3, x: 3e-4, y: 11_800 }], [{ x: 1e-4, y: 12_000 }, { x: 3e-4, y: 11_900 }], true);
    const s = overlaySeries(c);
    expect(s.x.unit).toBe('µA');
    expect(s.y.unit).toBe('kV');
    expect(s.measured).toEqual([{ x: 100, y: 11.9, line: 2 }, { x: 300, y: 11.8, line: 3 }]);
    expect(s.model[1]).toEqual({ x: 300, y: 11.9 });
  });
});
