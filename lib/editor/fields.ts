/**
 * The editor's value fields: which numbers each block kind and the design settings expose, their
 * units and rules (the same rules `lib/circuit/document/schema.ts` enforces), reading a typed
 * entry against them, and the immutable edits the inspector forms make. A refused entry comes
 * back as a reason and never becomes a block, so nothing invalid reaches the solver.
 */
import type { DesignBlock, DesignSettings } from '@/lib/circuit';
import { parseQuantity, type ParsedQuantity } from './format';

/** What a field's value must satisfy (mirrors the schema's refinements). */
export type FieldRule = 'finite' | 'positive' | 'nonNegative' | 'fraction';

export const REASON_NOT_POSITIVE = 'must be greater than zero';
export const REASON_NEGATIVE = 'must not be negative';
export const REASON_ABOVE_ONE = 'must be at most 100 %';

/** The reason `value` breaks `rule`, or null when it satisfies it. */
export function ruleReason(value: number, rule: FieldRule): string | null {
  if (!Number.isFinite(value)) return 'must be a finite number';
  switch (rule) {
    case 'finite':
      return null;
    case 'positive':
      return value > 0 ? null : REASON_NOT_POSITIVE;
    case 'nonNegative':
      return value >= 0 ? null : REASON_NEGATIVE;
    case 'fraction':
      return !(value > 0) ? REASON_NOT_POSITIVE : value <= 1 ? null : REASON_ABOVE_ONE;
  }
}

/** One numeric field of a form. */
export interface FieldSpec {
  /** Path of the value inside the edited object (e.g. `['model', 'isA']` inside a diode spec). */
  path: readonly string[];
  label: string;
  /** Unit shown beside the field and accepted after the number (`''` = plain number). */
  unit: string;
  rule: FieldRule;
  /** May be left empty (the key is then removed). */
  optional?: boolean;
  /** Shown value = SI value × scale (100 for fields entered in %). */
  scale?: number;
  /** One-line help under the field. */
  hint?: string;
}

/**
 * Read a typed entry for `spec`: parse engineering notation in the field's unit, undo the
 * display scale, check the rule. An empty optional field reads as `undefined` (clear it).
 */
export function readField(text: string, spec: Pick<FieldSpec, 'unit' | 'rule' | 'optional' | 'scale'>): { ok: true; value: number | undefined } | { ok: false; reason: string } {
  if (spec.optional && text.trim() === '') return { ok: true, value: undefined };
  const parsed: ParsedQuantity = parseQuantity(text, spec.unit);
  if (!parsed.ok) return parsed;
  const value = parsed.value / (spec.scale ?? 1);
  const reason = ruleReason(value, spec.rule);
  return reason === null ? { ok: true, value } : { ok: false, reason };
}

/** The fields of a capacitor (stage capacitors and the single part). */
export const CAPACITOR_FIELDS: readonly FieldSpec[] = [
  { path: ['capacitanceF'], label: 'Capacitance', unit: 'F', rule: 'positive' },
  { path: ['ratedVoltageV'], label: 'Rated voltage', unit: 'V', rule: 'positive', optional: true },
  { path: ['esrOhm'], label: 'ESR', unit: 'Ω', rule: 'nonNegative', optional: true },
  { path: ['tolerance'], label: 'Tolerance ±', unit: '%', rule: 'nonNegative', optional: true, scale: 100 },
];

/** The fields of a diode: the Shockley diode equation's parameters, then the ratings. */
export const DIODE_FIELDS: readonly FieldSpec[] = [
  { path: ['model', 'isA'], label: 'Saturation current IS', unit: 'A', rule: 'positive' },
  { path: ['model', 'n'], label: 'Emission coefficient N', unit: '', rule: 'positive' },
  { path: ['model', 'rsOhm'], label: 'Series resistance RS', unit: 'Ω', rule: 'nonNegative' },
  { path: ['model', 'bvV'], label: 'Breakdown BV', unit: 'V', rule: 'positive', optional: true, hint: 'empty: breakdown not modelled' },
  { path: ['model', 'cjoF'], label: 'Junction capacitance CJO', unit: 'F', rule: 'nonNegative', optional: true },
  { path: ['model', 'ttS'], label: 'Transit time TT', unit: 's', rule: 'nonNegative', optional: true },
  { path: ['ratedPivV'], label: 'Rated PIV (VRRM)', unit: 'V', rule: 'positive', optional: true },
  { path: ['ratedAvgCurrentA'], label: 'Rated average current', unit: 'A', rule: 'positive', optional: true },
  { path: ['ratedSurgeA'], label: 'Rated surge current', unit: 'A', rule: 'positive', optional: true },
];

/** The fields of a single resistor. */
export const RESISTOR_FIELDS: readonly FieldSpec[] = [
  { path: ['resistanceOhm'], label: 'Resistance', unit: 'Ω', rule: 'positive' },
  { path: ['ratedPowerW'], label: 'Rated power', unit: 'W', rule: 'positive', optional: true },
  { path: ['ratedVoltageV'], label: 'Rated voltage', unit: 'V', rule: 'positive', optional: true },
];

/** The numeric fields of an AC source (amplitude mode and variant are choices, not numbers). */
export const AC_SOURCE_FIELDS: readonly FieldSpec[] = [
  { path: ['amplitudeV'], label: 'Amplitude', unit: 'V', rule: 'positive' },
  { path: ['frequencyHz'], label: 'Frequency', unit: 'Hz', rule: 'positive' },
  { path: ['phaseDeg'], label: 'Phase', unit: '°', rule: 'finite' },
  { path: ['sourceResistanceOhm'], label: 'Source resistance (each leg)', unit: 'Ω', rule: 'nonNegative' },
];

/** The fields of a DC source. */
export const DC_SOURCE_FIELDS: readonly FieldSpec[] = [
  { path: ['voltageV'], label: 'Voltage', unit: 'V', rule: 'finite' },
  { path: ['sourceResistanceOhm'], label: 'Source resistance', unit: 'Ω', rule: 'nonNegative' },
];

/** The load's value field for each mode. */
export const LOAD_FIELDS: { resistor: FieldSpec; current: FieldSpec } = {
  resistor: { path: ['resistanceOhm'], label: 'Load resistance', unit: 'Ω', rule: 'positive' },
  current: { path: ['currentA'], label: 'Load current', unit: 'A', rule: 'nonNegative' },
};

/** The design settings' fields. */
export const SETTINGS_FIELDS: readonly FieldSpec[] = [
  { path: ['strayCapacitanceF'], label: 'Stray C, each node to ground', unit: 'F', rule: 'nonNegative' },
  { path: ['bleederOhm'], label: 'Bleeder across the output', unit: 'Ω', rule: 'positive', optional: true, hint: 'empty: no bleeder fitted' },
  { path: ['deratingFraction'], label: 'Derating (share of rating allowed)', unit: '%', rule: 'fraction', scale: 100, hint: 'common practice 80 %' },
  { path: ['requirement', 'outputV'], label: 'Required output', unit: 'V', rule: 'finite', optional: true },
  { path: ['requirement', 'loadCurrentA'], label: 'Required load current', unit: 'A', rule: 'nonNegative', optional: true },
  { path: ['requirement', 'maxRippleFraction'], label: 'Largest ripple allowed', unit: '%', rule: 'positive', optional: true, scale: 100, hint: 'p-p over the output' },
];

/** The value at `path` inside `obj` when it is a number. */
export function getNumberAt(obj: unknown, path: readonly string[]): number | undefined {
  let cur: unknown = obj;
  for (const key of path) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[key];
  }
  return typeof cur === 'number' ? cur : undefined;
}

/**
 * A copy of `obj` with the value at `path` set (or removed when `value` is undefined); the
 * objects along the path are copied, everything else is shared. Missing objects on the path are
 * created (a first requirement value creates `requirement`); an object emptied by a removal is
 * dropped, so an empty `requirement` does not linger.
 */
export function setAt<T extends object>(obj: T, path: readonly string[], value: unknown): T {
  if (path.length === 0) return obj;
  const [key, ...rest] = path;
  const record = obj as Record<string, unknown>;
  const copy: Record<string, unknown> = { ...record };
  if (rest.length === 0) {
    if (value === undefined) delete copy[key];
    else copy[key] = value;
    return copy as T;
  }
  const child = record[key];
  const base = child !== null && typeof child === 'object' ? (child as object) : {};
  if (value === undefined && !(child !== null && typeof child === 'object')) return obj;
  const next = setAt(base, rest, value);
  if (value === undefined && Object.keys(next).length === 0) delete copy[key];
  else copy[key] = next;
  return copy as T;
}

type StageBlock = Extract<DesignBlock, { kind: 'stage' }>;
type LoadBlock = Extract<DesignBlock, { kind: 'load' }>;
type AcSourceBlock = Extract<DesignBlock, { kind: 'acSource' }>;

/**
 * Switch a stage between half-wave and full-wave. Going full-wave gives the second driven column
 * copies of the first column's parts (pumping C and diodes A/B), so the new stage is balanced;
 * going half-wave drops them.
 */
export function setStageVariant(block: StageBlock, variant: 'half' | 'full'): StageBlock {
  if (block.data.variant === variant) return block;
  if (variant === 'full') {
    return {
      ...block,
      data: {
        ...block.data,
        variant,
        pump2C: block.data.pump2C ?? { ...block.data.pumpC },
        diodeC: block.data.diodeC ?? { ...block.data.diodeA, model: { ...block.data.diodeA.model } },
        diodeD: block.data.diodeD ?? { ...block.data.diodeB, model: { ...block.data.diodeB.model } },
      },
    };
  }
  const { pump2C: _p, diodeC: _c, diodeD: _d, ...half } = block.data;
  return { ...block, data: { ...half, variant } };
}

/**
 * Starting values when the load changes mode. They are deliberately (almost) no load — 1 GΩ or
 * 0 A — so a mode switch never loads the output down by surprise; the designer then types the
 * real value.
 */
export const LOAD_MODE_START = { resistanceOhm: 1e9, currentA: 0 } as const;

/** Switch a load between a resistor and a constant current (see {@link LOAD_MODE_START}). */
export function setLoadMode(block: LoadBlock, mode: 'resistor' | 'current'): LoadBlock {
  if (block.data.mode === mode) return block;
  return {
    ...block,
    data: mode === 'resistor' ? { mode, resistanceOhm: LOAD_MODE_START.resistanceOhm } : { mode, currentA: LOAD_MODE_START.currentA },
  };
}

/**
 * Switch how a sine source's amplitude is entered. The number is converted (peak = √2 · RMS) so
 * the drive, and therefore every result, stays the same; only the reading of the field changes.
 */
export function setAmplitudeMode(block: AcSourceBlock, mode: 'peak' | 'rms'): AcSourceBlock {
  if (block.data.amplitudeMode === mode) return block;
  const amplitudeV = mode === 'rms' ? block.data.amplitudeV / Math.SQRT2 : block.data.amplitudeV * Math.SQRT2;
  return { ...block, data: { ...block.data, amplitudeMode: mode, amplitudeV } };
}

/** The drive's peak (V) whichever way the amplitude is entered. */
export function drivePeakV(data: AcSourceBlock['data']): number {
  return data.amplitudeMode === 'rms' ? data.amplitudeV * Math.SQRT2 : data.amplitudeV;
}

/** Longest block label the schema accepts. */
export const MAX_LABEL_LENGTH = 80;
/** Longest part id the schema accepts. */
export const MAX_PART_ID_LENGTH = 64;

/** A block's label from a text field: trimmed, empty = no label, refused past the schema's limit. */
export function readLabel(text: string, max = MAX_LABEL_LENGTH): { ok: true; value: string | undefined } | { ok: false; reason: string } {
  const t = text.trim();
  if (t.length > max) return { ok: false, reason: `at most ${max} characters` };
  return { ok: true, value: t === '' ? undefined : t };
}

/** Settings with one field changed (used by the settings form; returns the same object when unchanged). */
export function updateSettings(settings: DesignSettings, path: readonly string[], value: number | undefined): DesignSettings {
  if (getNumberAt(settings, path) === value) return settings;
  return setAt(settings, path, value);
}

/** What a value field does when its entry is committed (blur or Enter). */
export type CommitDecision =
  /** Nothing to pass on: the text is what the field showed, or reads as the same value. */
  | { kind: 'unchanged' }
  /** The entry is refused; the field keeps the text and shows the reason. */
  | { kind: 'refuse'; reason: string }
  /** Pass this value (undefined = clear an optional field) to the form. */
  | { kind: 'commit'; value: number | undefined };

/**
 * Decide a field's commit: `text` as typed, `shownText` what the field displayed for the current
 * `value` (so tabbing through a field never rounds its value to the shown digits), the field's
 * spec and an optional extra check. A refused entry is never committed.
 */
export function decideCommit(
  text: string,
  shownText: string,
  value: number | undefined,
  spec: Pick<FieldSpec, 'unit' | 'rule' | 'optional' | 'scale'>,
  validate?: (v: number) => string | null,
): CommitDecision {
  if (text === shownText) return { kind: 'unchanged' };
  const read = readField(text, spec);
  if (!read.ok) return { kind: 'refuse', reason: read.reason };
  if (read.value !== undefined && validate) {
    const reason = validate(read.value);
    if (reason) return { kind: 'refuse', reason };
  }
  if (Object.is(read.value, value)) return { kind: 'unchanged' };
  return { kind: 'commit', value: read.value };
}

/** A block with its label set, or removed when `label` is undefined. */
export function withLabel(block: DesignBlock, label: string | undefined): DesignBlock {
  const { label: _old, ...rest } = block;
  return (label === undefined ? rest : { ...rest, label }) as DesignBlock;
}

/** A part spec with its part reference set, or removed when `partId` is undefined. */
export function withPartId<T extends { partId?: string | null }>(spec: T, partId: string | undefined): T {
  const { partId: _old, ...rest } = spec;
  return (partId === undefined ? rest : { ...rest, partId }) as T;
}
