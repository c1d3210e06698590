/**
 * Display text for the compare tables (the UI edge): SI values with engineering prefixes, signed
 * differences with a true minus sign, relative differences as per cent. Nothing here computes.
 */
import { formatEngineering } from '@/lib/circuit/netlist/units';
import type { MetricRow } from './results';

function trimmed(text: string): string {
  return text.replace(/^(-?\d+)(\.\d*?)0+(?=\s|$)/, (_m, int: string, frac: string) => int + (frac === '.' ? '' : frac));
}

/** One figure of a metric row: `12.41 kV`, `350 mJ`, `23.5 %`; null → `—`. */
export function formatMetricValue(value: number | null, unit: MetricRow['unit']): string {
  if (value === null || !Number.isFinite(value)) return '—';
  if (unit === '%') return `${Number((value * 100).toPrecision(3))} %`;
  return trimmed(formatEngineering(value, unit, 4));
}

/** A signed difference: `+1.2 kV`, `−35 V`, `0 V`; for the margin in percentage points (`−4.1 pts`). */
export function formatMetricDelta(delta: number | null, unit: MetricRow['unit']): string {
  if (delta === null || !Number.isFinite(delta)) return '—';
  if (delta === 0) return unit === '%' ? '0 pts' : `0 ${unit}`;
  const sign = delta > 0 ? '+' : '−';
  if (unit === '%') return `${sign}${Number((Math.abs(delta) * 100).toPrecision(3))} pts`;
  return `${sign}${trimmed(formatEngineering(Math.abs(delta), unit, 3))}`;
}

/** A relative difference: `+12 %`, `−50 %`, `0 %`; null → `—`. */
export function formatRelative(rel: number | null): string {
  if (rel === null || !Number.isFinite(rel)) return '—';
  const pct = Number((rel * 100).toPrecision(3));
  if (pct === 0) return '0 %';
  return `${pct > 0 ? '+' : '−'}${Math.abs(pct)} %`;
}
