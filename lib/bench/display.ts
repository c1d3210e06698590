/**
 * What the bench panel shows, decided without React (unit-tested): the unit choices of the
 * mapping form, the axis units of the overlay plot and the thinned series it draws.
 */
import type { Comparison } from './compare';
import type { BenchKind } from './mapping';
import type { Quantity } from './units';

export interface UnitChoice {
  label: string;
  /** Factor to SI. */
  scale: number;
}

const CHOICES: Record<Quantity, UnitChoice[]> = {
  current: [
    { label: 'A', scale: 1 },
    { label: 'mA', scale: 1e-3 },
    { label: 'µA', scale: 1e-6 },
    { label: 'nA', scale: 1e-9 },
  ],
  voltage: [
    { label: 'MV', scale: 1e6 },
    { label: 'kV', scale: 1e3 },
    { label: 'V', scale: 1 },
    { label: 'mV', scale: 1e-3 },
  ],
  time: [
    { label: 's', scale: 1 },
    { label: 'ms', scale: 1e-3 },
    { label: 'µs', scale: 1e-6 },
    { label: 'ns', scale: 1e-9 },
  ],
};

/** The unit choices for x or y of `kind`; a scale that is none of them is offered as "× scale". */
export function unitChoices(kind: BenchKind, axis: 'x' | 'y', current?: number): UnitChoice[] {
  const q: Quantity = axis === 'y' ? 'voltage' : kind === 'ripple' ? 'time' : 'current';
  const list = CHOICES[q];
  if (current === undefined || list.some((c) => sameScale(c.scale, current))) return list;
  return [...list, { label: `× ${current}`, scale: current }];
}

/** Scales equal to 9 significant figures (1e-6 written as 0.000001 or 1e-6). */
export function sameScale(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
}

export interface AxisUnit {
  factor: number;
  unit: string;
}

/** Axis unit for values up to `maxAbs` of a quantity (SI in, display factor out). */
export function axisUnit(q: Quantity, maxAbs: number): AxisUnit {
  const a = Math.abs(maxAbs);
  if (q === 'voltage') return a >= 1e6 ? { factor: 1e-6, unit: 'MV' } : a >= 1e3 ? { factor: 1e-3, unit: 'kV' } : { factor: 1, unit: 'V' };
  const base = q === 'time' ? 's' : 'A';
  if (a >= 1) return { factor: 1, unit: base };
  if (a >= 1e-3) return { factor: 1e3, unit: `m${base}` };
  if (a >= 1e-6) return { factor: 1e6, unit: `µ${base}` };
  return { factor: 1e9, unit: `n${base}` };
}

/** Most points of one series the plot draws (the table still lists every point). */
export const MAX_PLOT_POINTS = 1500;

/** Every k-th point so at most `max` remain (first and last kept). */
export function thin<T>(points: readonly T[], max = MAX_PLOT_POINTS): T[] {
  if (points.length <= max) return [...points];
  const stride = Math.ceil(points.length / max);
  const out = points.filter((_, i) => i % stride === 0);
  if (out[out.length - 1] !== points[points.length - 1]) out.push(points[points.length - 1]);
  return out;
}

export interface OverlaySeries {
  x: AxisUnit;
  y: AxisUnit;
  model: { x: number; y: number }[];
  measured: { x: number; y: number; line: number }[];
}

/** The model curve and the measured points in display units, thinned for drawing. */
export function overlaySeries(c: Comparison): OverlaySeries {
  const xs = c.points.map((p) => Math.abs(p.x));
  const ys = [...c.points.map((p) => Math.abs(p.measured)), ...c.model.map((p) => Math.abs(p.y))];
  const x = axisUnit(c.kind === 'ripple' ? 'time' : 'current', Math.max(0, ...xs));
  const y = axisUnit('voltage', c.kind === 'ripple' ? Math.max(0, ...ys) : Math.max(0, ...ys));
  return {
    x,
    y,
    model: thin(c.model).map((p) => ({ x: p.x * x.factor, y: p.y * y.factor })),
    measured: thin(c.points).map((p) => ({ x: p.x * x.factor, y: p.measured * y.factor, line: p.line })),
  };
}
