/**
 * Binding a design's part to a team library part. Binding copies the library part's values into
 * the document and records the part's id (`partId`), so the engine solves with those values and a
 * stored revision solves the same way even after the library part is edited or deleted. Nothing
 * here reads the library later: a changed library part shows up only as a difference between the
 * copied values and the part's current ones ({@link bindingDrift}), which the designer may refresh.
 *
 * What is copied, per kind:
 * - capacitor → capacitanceF, tolerance, ratedVoltageV, esrOhm;
 * - diode → the whole Shockley model (IS, N, RS, BV, CJO, TT), ratedPivV, ratedAvgCurrentA, ratedSurgeA;
 * - resistor → resistanceOhm, ratedPowerW, ratedVoltageV.
 * A value the library part leaves out is removed from the design's part too (the copy is exact).
 * Editing one of those values by hand makes the part no longer that library part: the binding is
 * dropped ({@link keepBindingAfterEdit}).
 *
 * Pure and immutable: every function returns new objects and shares the rest.
 */
import type { CapacitorSpec, DesignBlock, DiodeModelParams, DiodeSpec } from '../circuit/document/schema';
import type { PartInput, PartKind } from './schema';
import { formatSi } from '../client/format';

/**
 * The label a single diode shows on the canvas: the bound library part's number when the library
 * knows the part, else its rated PIV, else nothing — never the raw part id.
 */
export function diodeLabel(d: { ratedPivV?: number; partId?: string | null }, partNumberOf: (partId: string) => string | undefined): string | undefined {
  const number = d.partId ? partNumberOf(d.partId) : undefined;
  return number ?? (d.ratedPivV ? `${formatSi(d.ratedPivV, 'V')} PIV` : undefined);
}

export type ResistorSpec = Extract<DesignBlock, { kind: 'resistor' }>['data'];
type StageBlock = Extract<DesignBlock, { kind: 'stage' }>;

/** A library part of one kind (the DTO the API returns, or anything with its id, kind and specs). */
export type PartOf<K extends PartKind> = { id: string; partNumber: string; kind: K; specs: Extract<PartInput, { kind: K }>['specs'] };
export type AnyPart = PartOf<'capacitor'> | PartOf<'diode'> | PartOf<'resistor'>;

/** A place a library part can be bound: a stage's capacitor or diode, or a single part block. */
export type PartRole = 'pumpC' | 'smoothC' | 'pump2C' | 'diodeA' | 'diodeB' | 'diodeC' | 'diodeD' | 'capacitor' | 'diode' | 'resistor';

/** The kind of library part each role takes. */
export const ROLE_KIND: Record<PartRole, PartKind> = {
  pumpC: 'capacitor',
  smoothC: 'capacitor',
  pump2C: 'capacitor',
  diodeA: 'diode',
  diodeB: 'diode',
  diodeC: 'diode',
  diodeD: 'diode',
  capacitor: 'capacitor',
  diode: 'diode',
  resistor: 'resistor',
};

const STAGE_ROLES = ['pumpC', 'smoothC', 'pump2C', 'diodeA', 'diodeB', 'diodeC', 'diodeD'] as const;
type StageRole = (typeof STAGE_ROLES)[number];

function without<T extends object, K extends keyof T>(obj: T, keys: readonly K[]): Omit<T, K> {
  const copy = { ...obj };
  for (const k of keys) delete copy[k];
  return copy;
}

/** Sets optional keys only when defined (so an absent library value removes the key). */
function defined<T extends Record<string, unknown>>(obj: T): Partial<T> {
  const out: Partial<T> = {};
  for (const [k, v] of Object.entries(obj)) if (v !== undefined) (out as Record<string, unknown>)[k] = v;
  return out;
}

const CAP_KEYS = ['capacitanceF', 'tolerance', 'ratedVoltageV', 'esrOhm', 'partId'] as const;
const DIODE_KEYS = ['model', 'ratedPivV', 'ratedAvgCurrentA', 'ratedSurgeA', 'partId'] as const;
const RES_KEYS = ['resistanceOhm', 'ratedPowerW', 'ratedVoltageV', 'partId'] as const;
const MODEL_KEYS = ['isA', 'n', 'rsOhm', 'bvV', 'cjoF', 'ttS'] as const;

/** The design capacitor with the library capacitor's values and its id. */
export function bindCapacitor(spec: CapacitorSpec, part: PartOf<'capacitor'>): CapacitorSpec {
  const s = part.specs;
  return { ...without(spec, CAP_KEYS), capacitanceF: s.capacitanceF, ...defined({ tolerance: s.tolerance, ratedVoltageV: s.ratedVoltageV, esrOhm: s.esrOhm }), partId: part.id };
}

function copyModel(m: DiodeModelParams): DiodeModelParams {
  return { isA: m.isA, n: m.n, rsOhm: m.rsOhm, ...defined({ bvV: m.bvV, cjoF: m.cjoF, ttS: m.ttS }) };
}

/** The design diode with the library diode's model, ratings and id. */
export function bindDiode(spec: DiodeSpec, part: PartOf<'diode'>): DiodeSpec {
  const s = part.specs;
  return {
    ...without(spec, DIODE_KEYS),
    model: copyModel(s.model),
    ratedPivV: s.ratedPivV,
    ratedAvgCurrentA: s.ratedAvgCurrentA,
    ...defined({ ratedSurgeA: s.ratedSurgeA }),
    partId: part.id,
  };
}

/** The design resistor with the library resistor's value, ratings and id. */
export function bindResistor(spec: ResistorSpec, part: PartOf<'resistor'>): ResistorSpec {
  const s = part.specs;
  return { ...without(spec, RES_KEYS), resistanceOhm: s.resistanceOhm, ratedPowerW: s.ratedPowerW, ratedVoltageV: s.ratedVoltageV, partId: part.id };
}

/** The part with its binding dropped (values kept as they are). */
export function unbind<T extends { partId?: string | null }>(spec: T): T {
  if (!('partId' in spec)) return spec;
  const { partId: _drop, ...rest } = spec;
  return rest as T;
}

function same(a: number | undefined, b: number | undefined): boolean {
  if (a === undefined || b === undefined) return a === b;
  if (a === b) return true;
  return Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));
}

/** One value that differs between a bound part in the design and its library part now. */
export interface Drift {
  /** Key path in the design's spec, e.g. `capacitanceF` or `model.isA`. */
  path: string;
  label: string;
  design: number | undefined;
  library: number | undefined;
}

const LABEL: Record<string, string> = {
  capacitanceF: 'capacitance',
  tolerance: 'tolerance',
  ratedVoltageV: 'rated voltage',
  esrOhm: 'ESR',
  'model.isA': 'IS',
  'model.n': 'N',
  'model.rsOhm': 'RS',
  'model.bvV': 'BV',
  'model.cjoF': 'CJO',
  'model.ttS': 'TT',
  ratedPivV: 'rated PIV',
  ratedAvgCurrentA: 'rated average current',
  ratedSurgeA: 'rated surge current',
  resistanceOhm: 'resistance',
  ratedPowerW: 'rated power',
};

function flatValues(kind: PartKind, spec: Record<string, unknown>): Record<string, number | undefined> {
  const num = (v: unknown) => (typeof v === 'number' ? v : undefined);
  if (kind === 'diode') {
    const model = (spec.model ?? {}) as Record<string, unknown>;
    const out: Record<string, number | undefined> = {};
    for (const k of MODEL_KEYS) out[`model.${k}`] = num(model[k]);
    for (const k of ['ratedPivV', 'ratedAvgCurrentA', 'ratedSurgeA']) out[k] = num(spec[k]);
    return out;
  }
  const keys = kind === 'capacitor' ? CAP_KEYS : RES_KEYS;
  const out: Record<string, number | undefined> = {};
  for (const k of keys) if (k !== 'partId') out[k] = num(spec[k]);
  return out;
}

/** The values binding copies, as they stand in the design's spec (flattened, `model.isA` …). */
export function boundValues(kind: PartKind, spec: CapacitorSpec | DiodeSpec | ResistorSpec): Record<string, number | undefined> {
  return flatValues(kind, spec as Record<string, unknown>);
}

/**
 * Where the design's copied values differ from the library part's current values (empty: in
 * step). Only the values binding copies are compared.
 */
export function bindingDrift(spec: CapacitorSpec | DiodeSpec | ResistorSpec, part: AnyPart): Drift[] {
  const mine = flatValues(part.kind, spec as Record<string, unknown>);
  const theirs = flatValues(part.kind, part.specs as unknown as Record<string, unknown>);
  const out: Drift[] = [];
  for (const path of Object.keys(mine)) {
    if (!same(mine[path], theirs[path])) out.push({ path, label: LABEL[path] ?? path, design: mine[path], library: theirs[path] });
  }
  return out;
}

/**
 * After a hand edit of a bound part (`prev` → `next`): when one of the copied values changed,
 * the binding is dropped (`partId` removed), because the part is no longer the library part; a
 * change of anything else keeps it. An unbound part is returned as it is.
 */
export function keepBindingAfterEdit<T extends CapacitorSpec | DiodeSpec | ResistorSpec>(kind: PartKind, prev: T, next: T): T {
  if (!prev.partId) return next;
  const a = boundValues(kind, prev);
  const b = boundValues(kind, next);
  const changed = Object.keys(a).some((k) => !same(a[k], b[k]));
  return changed ? unbind(next) : next;
}

/** Binds any spec to a part of the matching kind. */
export function bindSpec(kind: PartKind, spec: CapacitorSpec | DiodeSpec | ResistorSpec, part: AnyPart): CapacitorSpec | DiodeSpec | ResistorSpec {
  if (part.kind !== kind) throw new Error(`a ${part.kind} cannot be bound where a ${kind} goes`);
  if (part.kind === 'capacitor') return bindCapacitor(spec as CapacitorSpec, part);
  if (part.kind === 'diode') return bindDiode(spec as DiodeSpec, part);
  return bindResistor(spec as ResistorSpec, part);
}

/** The roles of a block that take a library part, in the order the inspector shows them. */
export function partRolesOf(block: DesignBlock): PartRole[] {
  if (block.kind === 'stage') return STAGE_ROLES.filter((r) => block.data[r] !== undefined);
  if (block.kind === 'capacitor' || block.kind === 'diode' || block.kind === 'resistor') return [block.kind];
  return [];
}

/** The spec behind `role` in `block`, or undefined when the block has no such part. */
export function specAt(block: DesignBlock, role: PartRole): CapacitorSpec | DiodeSpec | ResistorSpec | undefined {
  if (block.kind === 'stage') return (STAGE_ROLES as readonly string[]).includes(role) ? block.data[role as StageRole] : undefined;
  if (block.kind === role) return block.data as CapacitorSpec | DiodeSpec | ResistorSpec;
  return undefined;
}

/** The block with the spec behind `role` replaced. */
export function withSpecAt(block: DesignBlock, role: PartRole, spec: CapacitorSpec | DiodeSpec | ResistorSpec): DesignBlock {
  if (block.kind === 'stage') return { ...block, data: { ...block.data, [role]: spec } } as StageBlock;
  if (block.kind === 'capacitor' || block.kind === 'diode' || block.kind === 'resistor') return { ...block, data: spec } as DesignBlock;
  return block;
}

export type BindOutcome = { ok: true; block: DesignBlock } | { ok: false; reason: string };

/** The block with the part behind `role` bound to `part` (refused when the kinds differ or the role is absent). */
export function bindRole(block: DesignBlock, role: PartRole, part: AnyPart): BindOutcome {
  const spec = specAt(block, role);
  if (!spec) return { ok: false, reason: `${block.id} has no ${role}` };
  const kind = ROLE_KIND[role];
  if (part.kind !== kind) return { ok: false, reason: `${part.partNumber} is a ${part.kind}; this place takes a ${kind}` };
  return { ok: true, block: withSpecAt(block, role, bindSpec(kind, spec, part)) };
}

/** The block with the binding behind `role` dropped (values kept). */
export function unbindRole(block: DesignBlock, role: PartRole): DesignBlock {
  const spec = specAt(block, role);
  return spec && spec.partId ? withSpecAt(block, role, unbind(spec)) : block;
}
