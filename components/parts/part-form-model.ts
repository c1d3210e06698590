/**
 * Pure model of the part create/edit form and the library table, kept apart from React so it is
 * unit-tested without a DOM. Numbers are typed in engineering notation (`4.7n`, `10k`, `1.2meg`)
 * and read with the editor's field rules (lib/editor/fields.ts `readField`); the whole part is
 * then checked with the schema the server uses (`partInputSchema`), so the form refuses what the
 * server would, and names each problem by the same dot path the server's `field` uses
 * (`specs.capacitanceF`, `specs.model.isA`, `partNumber`).
 */
import { readField, type FieldSpec } from '@/lib/editor/fields';
import { formatSi } from '@/lib/client/format';
import { formatInputValue, formatPercent } from '@/lib/editor/format';
import { DIELECTRICS, partInputSchema, type PartDto, type PartInput, type PartKind } from '@/lib/parts/schema';

/** One numeric field of the form; `key` is its dot path in the part (the server's `field`). */
export interface PartNumberField extends FieldSpec {
  key: string;
}

const f = (key: string, label: string, unit: string, rule: FieldSpec['rule'], extra: Partial<FieldSpec> = {}): PartNumberField => ({ key, path: key.split('.'), label, unit, rule, ...extra });

/** The numeric fields of each kind, in the order the form shows them. */
export const PART_NUMBER_FIELDS: Record<PartKind, readonly PartNumberField[]> = {
  capacitor: [
    f('specs.capacitanceF', 'Capacitance', 'F', 'positive'),
    f('specs.ratedVoltageV', 'Rated DC voltage', 'V', 'positive'),
    f('specs.tolerance', 'Tolerance ±', '%', 'nonNegative', { scale: 100 }),
    f('specs.esrOhm', 'ESR', 'Ω', 'nonNegative', { optional: true }),
  ],
  diode: [
    f('specs.ratedPivV', 'Rated PIV (VRRM)', 'V', 'positive'),
    f('specs.ratedAvgCurrentA', 'Rated average current IF(AV)', 'A', 'positive'),
    f('specs.ratedSurgeA', 'Surge current IFSM', 'A', 'positive', { optional: true }),
    f('specs.trrS', 'Reverse recovery trr', 's', 'nonNegative', { optional: true }),
    f('specs.model.isA', 'Saturation current IS', 'A', 'positive'),
    f('specs.model.n', 'Emission coefficient N', '', 'positive'),
    f('specs.model.rsOhm', 'Series resistance RS', 'Ω', 'nonNegative'),
    f('specs.model.bvV', 'Breakdown BV', 'V', 'positive', { optional: true, hint: 'empty: not modelled' }),
    f('specs.model.cjoF', 'Junction capacitance CJO', 'F', 'nonNegative', { optional: true }),
    f('specs.model.ttS', 'Transit time TT', 's', 'nonNegative', { optional: true }),
  ],
  resistor: [
    f('specs.resistanceOhm', 'Resistance', 'Ω', 'positive'),
    f('specs.ratedPowerW', 'Rated power', 'W', 'positive'),
    f('specs.ratedVoltageV', 'Maximum working voltage', 'V', 'positive'),
    f('specs.tolerance', 'Tolerance ±', '%', 'nonNegative', { optional: true, scale: 100 }),
  ],
};

/** The unit cost field (plain number in the part's currency). */
export const UNIT_COST_FIELD: PartNumberField = f('unitCost', 'Unit cost', '', 'nonNegative', { optional: true });

/** Words for each dielectric (trade terms). */
export const DIELECTRIC_LABEL: Record<(typeof DIELECTRICS)[number], string> = {
  'ceramic-class1': 'Ceramic, class 1',
  'ceramic-class2': 'Ceramic, class 2',
  'film-polypropylene': 'Film, polypropylene',
  'film-polyester': 'Film, polyester',
  mica: 'Mica',
  'paper-oil': 'Paper / oil',
  other: 'Other',
};

export const KIND_LABEL: Record<PartKind, string> = { capacitor: 'Capacitor', diode: 'Diode', resistor: 'Resistor' };

/** What the form holds: the kind and every field's text as typed, keyed by dot path. */
export interface PartFormState {
  kind: PartKind;
  values: Record<string, string>;
}

/** A fresh form for a new part of `kind`. */
export function emptyPartForm(kind: PartKind): PartFormState {
  const values: Record<string, string> = { partNumber: '', maker: '', description: '', currency: 'EUR', unitCost: '' };
  for (const field of PART_NUMBER_FIELDS[kind]) values[field.key] = '';
  if (kind === 'capacitor') {
    values['specs.dielectric'] = 'ceramic-class1';
    values['specs.size'] = '';
  }
  return { kind, values };
}

function at(obj: unknown, path: readonly string[]): unknown {
  let cur = obj;
  for (const k of path) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[k];
  }
  return cur;
}

/** The text a field shows for a stored value (engineering notation, scaled for %). */
export function fieldText(value: unknown, field: Pick<FieldSpec, 'scale'>): string {
  return typeof value === 'number' ? formatInputValue(value * (field.scale ?? 1)) : '';
}

/** The form filled from a stored part (for editing). */
export function partForm(part: PartInput | PartDto): PartFormState {
  const state = emptyPartForm(part.kind);
  const v = state.values;
  v.partNumber = part.partNumber;
  v.maker = part.maker ?? '';
  v.description = part.description ?? '';
  v.currency = part.currency ?? 'EUR';
  v.unitCost = typeof part.unitCost === 'number' ? String(part.unitCost) : '';
  for (const field of PART_NUMBER_FIELDS[part.kind]) v[field.key] = fieldText(at(part, field.path), field);
  if (part.kind === 'capacitor') {
    v['specs.dielectric'] = part.specs.dielectric;
    v['specs.size'] = part.specs.size ?? '';
  }
  return state;
}

/** The form switched to another kind: common fields kept, kind fields fresh. */
export function withKind(state: PartFormState, kind: PartKind): PartFormState {
  if (state.kind === kind) return state;
  const next = emptyPartForm(kind);
  for (const k of ['partNumber', 'maker', 'description', 'currency', 'unitCost']) next.values[k] = state.values[k] ?? '';
  return next;
}

function setPath(obj: Record<string, unknown>, path: readonly string[], value: unknown): void {
  let cur = obj;
  for (let i = 0; i < path.length - 1; i++) {
    const k = path[i];
    if (typeof cur[k] !== 'object' || cur[k] === null) cur[k] = {};
    cur = cur[k] as Record<string, unknown>;
  }
  cur[path[path.length - 1]] = value;
}

export type PartFormResult = { ok: true; input: PartInput } | { ok: false; errors: Record<string, string> };

/**
 * Read the form: every number in engineering notation by its field's rule (an empty optional
 * field is left out), then the whole part by `partInputSchema`. Errors are keyed by dot path.
 */
export function readPartForm(state: PartFormState): PartFormResult {
  const errors: Record<string, string> = {};
  const v = state.values;
  const raw: Record<string, unknown> = {
    kind: state.kind,
    partNumber: v.partNumber ?? '',
    maker: v.maker ?? '',
    description: v.description ?? '',
    currency: (v.currency ?? '').trim().toUpperCase(),
    specs: {},
  };
  for (const field of [...PART_NUMBER_FIELDS[state.kind], UNIT_COST_FIELD]) {
    const text = v[field.key] ?? '';
    if (!field.optional && text.trim() === '') {
      errors[field.key] = 'required';
      continue;
    }
    const read = readField(text, field);
    if (!read.ok) errors[field.key] = read.reason;
    else if (read.value !== undefined) setPath(raw, field.path, read.value);
  }
  if (state.kind === 'capacitor') {
    setPath(raw, ['specs', 'dielectric'], v['specs.dielectric']);
    const size = (v['specs.size'] ?? '').trim();
    if (size) setPath(raw, ['specs', 'size'], size);
  }
  const parsed = partInputSchema.safeParse(raw);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = issue.path.map(String).join('.');
      if (errors[key] === undefined) errors[key] = issue.message;
    }
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  if (!parsed.success) return { ok: false, errors: { form: 'the part is not valid' } };
  return { ok: true, input: parsed.data };
}

/** The field an error message from the server belongs to (as the form names its fields), or null for the form. */
export function serverFieldKey(field: string | undefined, state: PartFormState): string | null {
  if (!field) return null;
  return field in state.values ? field : null;
}

/** The value the table's "value" column shows: capacitance, PIV or resistance. */
export function keyValue(part: PartDto | PartInput): string {
  if (part.kind === 'capacitor') return formatSi(part.specs.capacitanceF, 'F');
  if (part.kind === 'diode') return `${formatSi(part.specs.ratedPivV, 'V')} PIV`;
  return formatSi(part.specs.resistanceOhm, 'Ω');
}

/** The ratings column: what the part may carry. */
export function ratingsText(part: PartDto | PartInput): string {
  if (part.kind === 'capacitor') return `${formatSi(part.specs.ratedVoltageV, 'V')} DC`;
  if (part.kind === 'diode') {
    const surge = part.specs.ratedSurgeA !== undefined ? ` · ${formatSi(part.specs.ratedSurgeA, 'A')} surge` : '';
    return `${formatSi(part.specs.ratedAvgCurrentA, 'A')} avg${surge}`;
  }
  return `${formatSi(part.specs.ratedPowerW, 'W')} · ${formatSi(part.specs.ratedVoltageV, 'V')}`;
}

/** The tolerance column (diodes have none). */
export function toleranceText(part: PartDto | PartInput): string {
  if (part.kind === 'diode') return '—';
  return part.specs.tolerance === undefined ? '—' : `±${formatPercent(part.specs.tolerance, 3)}`;
}

/** The cost column, e.g. "EUR 1.25". */
export function costText(part: PartDto | PartInput): string {
  return part.unitCost === undefined ? '—' : `${part.currency} ${part.unitCost.toFixed(part.unitCost < 1 ? 3 : 2)}`;
}

/** One line that says what a part is, for pickers: "TG-D-1K2 · 1.2 kV PIV · 0.5 A avg · Maker". */
export function partSummary(part: PartDto | PartInput): string {
  return [part.partNumber, keyValue(part), ratingsText(part), part.maker].filter(Boolean).join(' · ');
}

/** Parts matching a picker's search text (part number, maker, description; case-insensitive). */
export function filterParts<T extends PartDto | PartInput>(parts: readonly T[], kind: PartKind, text: string): T[] {
  const q = text.trim().toLowerCase();
  return parts.filter((p) => p.kind === kind && (!q || `${p.partNumber} ${p.maker ?? ''} ${p.description ?? ''}`.toLowerCase().includes(q)));
}
