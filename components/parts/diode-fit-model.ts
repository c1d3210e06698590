/**
 * The "fit from the datasheet curve" form's model: two or three forward points (I, V) typed in
 * engineering notation, fitted by the engine's `fitDiode` (lib/circuit/devices/diode-fit.ts:
 * IS and N from two points with RS = 0; IS, N and RS from three), with the residual at each point
 * and the text the part form's model fields receive.
 */
import { fitDiode, type DiodeFitModel, type DiodeFitPoint } from '@/lib/circuit/devices/diode-fit';
import { readField } from '@/lib/editor/fields';
import { formatInputValue } from '@/lib/editor/format';

/** One row of the form as typed. */
export interface FitRow {
  current: string;
  voltage: string;
}

export type FitOutcome =
  | { ok: true; model: DiodeFitModel; points: DiodeFitPoint[]; residualsV: number[] }
  | { ok: false; errors: Record<string, string>; reason?: string };

/**
 * Read the rows (a row left wholly empty is skipped; `current-<i>` / `voltage-<i>` name a bad
 * entry) and fit. Two or three points are needed.
 */
export function fitFromRows(rows: readonly FitRow[]): FitOutcome {
  const errors: Record<string, string> = {};
  const points: DiodeFitPoint[] = [];
  rows.forEach((r, i) => {
    if (r.current.trim() === '' && r.voltage.trim() === '') return;
    const c = readField(r.current, { unit: 'A', rule: 'positive' });
    const v = readField(r.voltage, { unit: 'V', rule: 'positive' });
    if (!c.ok) errors[`current-${i}`] = c.reason;
    else if (c.value === undefined) errors[`current-${i}`] = 'required';
    if (!v.ok) errors[`voltage-${i}`] = v.reason;
    else if (v.value === undefined) errors[`voltage-${i}`] = 'required';
    if (c.ok && v.ok && c.value !== undefined && v.value !== undefined) points.push({ currentA: c.value, voltageV: v.value });
  });
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  if (points.length < 2) return { ok: false, errors: {}, reason: 'Give two or three points of the forward curve.' };
  const fit = fitDiode(points);
  if (!fit.ok) return { ok: false, errors: {}, reason: fit.reason };
  return { ok: true, model: fit.model, points, residualsV: fit.residualsV };
}

/** The part form's model fields as text, from a fit. */
export function modelFieldText(model: DiodeFitModel): Record<string, string> {
  return {
    'specs.model.isA': formatInputValue(model.isA, 6),
    'specs.model.n': formatInputValue(model.n, 6),
    'specs.model.rsOhm': formatInputValue(model.rsOhm, 6),
  };
}
