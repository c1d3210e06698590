/**
 * What changed between two design documents (two revisions of one design, or a parent and its
 * fork), block by block and field by field: blocks added, removed or changed (each changed value
 * with its before and after, written with engineering prefixes), drive and load changes called
 * out as such, design settings (strays, bleeder, derating, requirement), and the wiring as counts.
 *
 * Blocks are matched by id, as the editor's "a colleague saved first" view does
 * (`lib/editor/compare.ts`, whose classification and wire counting this reuses): ids are stable
 * across saves of a design and a fork keeps its parent's ids. A block that only moved is listed
 * in `moved`, not as a change of the circuit. Pure: no React, no database.
 */
import type { DesignBlock, DesignDocument } from '@/lib/circuit/document/schema';
import { formatEngineering } from '@/lib/circuit/netlist/units';
import { compareDocuments, sameValue } from '@/lib/editor/compare';

/** How one block differs: only in the newer document, only in the older, or in both with other values. */
export type ChangeKind = 'added' | 'removed' | 'changed';

/** What a block is to the comparison: the drive, the load, or a part of the ladder. */
export type ChangeCategory = 'drive' | 'load' | 'part';

/** One value that differs. `before`/`after` are display text (`—` when absent on that side). */
export interface FieldChange {
  /** Dotted path inside the block's data (or the settings), e.g. `pumpC.capacitanceF`. */
  path: string;
  /** Words for the path, e.g. `pumping C · capacitance`. */
  label: string;
  before: string;
  after: string;
  /** The raw values (SI numbers, strings, booleans; undefined when absent). */
  beforeValue: unknown;
  afterValue: unknown;
}

/** One block added, removed or changed. */
export interface BlockChange {
  kind: ChangeKind;
  blockId: string;
  /** The designator drawn on the canvas (the block's label, else its id). */
  designator: string;
  blockKind: DesignBlock['kind'];
  category: ChangeCategory;
  /** Changed values (for `changed`), or every value of the block (for `added` / `removed`). */
  fields: FieldChange[];
  /** For `changed`: the designator before and after, when the block was relabelled. */
  relabelled?: { before: string; after: string };
  /** One line: `pumping C · capacitance 4.7 nF → 10 nF; …`, or `added` / `removed` with the block's main values. */
  summary: string;
}

/** The difference of document `a` (older / parent) to document `b` (newer / fork). */
export interface DesignDiff {
  /** Changed and added blocks in `b`'s order, then the removed ones in `a`'s order. */
  changes: BlockChange[];
  /** Design settings that differ (stray capacitance, bleeder, derating, requirement). */
  settings: FieldChange[];
  /** Wires only in `b` (added) and only in `a` (removed), matched by their two ends. */
  wires: { added: number; removed: number };
  /** Blocks whose values are equal but that were moved on the canvas (ids). */
  moved: string[];
  /** Nothing but positions differs. */
  identical: boolean;
}

const ROLE_WORDS: Record<string, string> = {
  pumpC: 'pumping C',
  pump2C: 'second pumping C',
  smoothC: 'smoothing C',
  diodeA: 'diode A',
  diodeB: 'diode B',
  diodeC: 'diode C',
  diodeD: 'diode D',
  model: 'model',
  requirement: 'requirement',
};

const FIELD_WORDS: Record<string, string> = {
  capacitanceF: 'capacitance',
  esrOhm: 'ESR',
  ratedVoltageV: 'rated voltage',
  tolerance: 'tolerance',
  partId: 'part',
  isA: 'saturation current IS',
  n: 'emission coefficient N',
  rsOhm: 'series resistance RS',
  bvV: 'breakdown BV',
  cjoF: 'junction capacitance CJO',
  ttS: 'transit time TT',
  ratedPivV: 'rated PIV',
  ratedAvgCurrentA: 'rated average current',
  ratedSurgeA: 'rated surge current',
  variant: 'variant',
  polarity: 'polarity',
  amplitudeV: 'amplitude',
  amplitudeMode: 'amplitude is',
  frequencyHz: 'frequency',
  phaseDeg: 'phase',
  sourceResistanceOhm: 'source resistance',
  voltageV: 'voltage',
  mode: 'load type',
  resistanceOhm: 'resistance',
  currentA: 'current',
  ratedPowerW: 'rated power',
  strayCapacitanceF: 'stray capacitance to ground',
  bleederOhm: 'bleeder',
  deratingFraction: 'derating fraction',
  outputV: 'output voltage',
  loadCurrentA: 'load current',
  maxRippleFraction: 'largest ripple fraction',
};

/** Unit of a field from its SI name suffix (`capacitanceF` → F); fractions are shown as %. */
function unitOf(key: string): string | '%' | null {
  if (key === 'tolerance' || key === 'deratingFraction' || key === 'maxRippleFraction') return '%';
  if (key === 'n') return '';
  const suffixes: Array<[RegExp, string]> = [
    [/Ohm$/, 'Ω'],
    [/Hz$/, 'Hz'],
    [/Deg$/, '°'],
    [/F$/, 'F'],
    [/V$/, 'V'],
    [/A$/, 'A'],
    [/W$/, 'W'],
    [/S$/, 's'],
  ];
  for (const [re, unit] of suffixes) if (re.test(key)) return unit;
  return null;
}

/** Four significant digits with trailing zeros dropped, so 4.7 nF → 4.72 nF shows as a change. */
function engineering(value: number, unit: string): string {
  return formatEngineering(value, unit, 4).replace(/^(-?\d+)(\.\d*?)0+(?=\s|$)/, (_m, int: string, frac: string) => int + (frac === '.' ? '' : frac));
}

/** Display text of one leaf value of field `key`. */
export function formatFieldValue(key: string, value: unknown): string {
  if (value === undefined || value === null) return '—';
  if (typeof value === 'number') {
    const unit = unitOf(key);
    if (unit === '%') return `${Number((value * 100).toPrecision(4))} %`;
    if (unit === '°') return `${Number(value.toPrecision(4))}°`;
    if (unit === null || unit === '') return String(Number(value.toPrecision(6)));
    return engineering(value, unit);
  }
  if (typeof value === 'string') return value === '' ? '—' : value;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return JSON.stringify(value);
}

/** Flattens a data object to its leaves: `{ pumpC: { capacitanceF: 1e-9 } }` → `pumpC.capacitanceF`. */
function leaves(value: unknown, prefix: string, out: Map<string, unknown>): void {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) leaves(v, prefix ? `${prefix}.${k}` : k, out);
    return;
  }
  if (value !== undefined && prefix !== '') out.set(prefix, value);
}

function labelOf(path: string): string {
  const parts = path.split('.');
  return parts.map((p, i) => (i === parts.length - 1 ? (FIELD_WORDS[p] ?? p) : (ROLE_WORDS[p] ?? p))).join(' · ');
}

/**
 * Field-by-field difference of two plain data objects (block data or settings). `a` or `b` may
 * be undefined (a block only on one side): every leaf of the other side is listed then.
 */
export function diffFields(a: unknown, b: unknown): FieldChange[] {
  const la = new Map<string, unknown>();
  const lb = new Map<string, unknown>();
  leaves(a, '', la);
  leaves(b, '', lb);
  const paths = [...lb.keys(), ...[...la.keys()].filter((k) => !lb.has(k))];
  const out: FieldChange[] = [];
  for (const path of paths) {
    const before = la.get(path);
    const after = lb.get(path);
    if (sameValue(before, after)) continue;
    const key = path.slice(path.lastIndexOf('.') + 1);
    out.push({ path, label: labelOf(path), before: formatFieldValue(key, before), after: formatFieldValue(key, after), beforeValue: before, afterValue: after });
  }
  return out;
}

function categoryOf(kind: DesignBlock['kind']): ChangeCategory {
  if (kind === 'acSource' || kind === 'dcSource') return 'drive';
  if (kind === 'load') return 'load';
  return 'part';
}

/** The designator the canvas draws on a block: its label, else its id. */
export function designatorOf(block: Pick<DesignBlock, 'id' | 'label'>): string {
  return block.label?.trim() || block.id;
}

const KIND_WORDS: Record<DesignBlock['kind'], string> = {
  acSource: 'AC drive',
  dcSource: 'DC source',
  stage: 'stage',
  load: 'load',
  ground: 'ground',
  capacitor: 'capacitor',
  diode: 'diode',
  resistor: 'resistor',
};

/** The block's main values for an added/removed row (capacitances, drive, load), in a few words. */
function mainValues(block: DesignBlock): string {
  const d = block.data as Record<string, unknown>;
  switch (block.kind) {
    case 'stage': {
      const s = block.data;
      const caps = [`pumping ${formatFieldValue('capacitanceF', s.pumpC.capacitanceF)}`, `smoothing ${formatFieldValue('capacitanceF', s.smoothC.capacitanceF)}`];
      if (s.pump2C) caps.splice(1, 0, `second pumping ${formatFieldValue('capacitanceF', s.pump2C.capacitanceF)}`);
      return `${s.variant}-wave ${s.polarity}, ${caps.join(', ')}`;
    }
    case 'acSource':
      return `${formatFieldValue('amplitudeV', block.data.amplitudeV)} ${block.data.amplitudeMode}, ${formatFieldValue('frequencyHz', block.data.frequencyHz)}`;
    case 'load':
      return block.data.mode === 'resistor' ? formatFieldValue('resistanceOhm', block.data.resistanceOhm) : formatFieldValue('currentA', block.data.currentA);
    case 'capacitor':
      return formatFieldValue('capacitanceF', d.capacitanceF);
    case 'resistor':
      return formatFieldValue('resistanceOhm', d.resistanceOhm);
    case 'dcSource':
      return formatFieldValue('voltageV', d.voltageV);
    default:
      return '';
  }
}

function summaryOf(kind: ChangeKind, block: DesignBlock, fields: FieldChange[], relabelled: { before: string; after: string } | null): string {
  if (kind !== 'changed') {
    const values = mainValues(block);
    return `${kind === 'added' ? 'added' : 'removed'} ${KIND_WORDS[block.kind]}${values ? ` (${values})` : ''}`;
  }
  const parts = fields.map((f) => `${f.label} ${f.before} → ${f.after}`);
  if (relabelled) parts.unshift(`label ${relabelled.before} → ${relabelled.after}`);
  return parts.join('; ');
}

/** Settings with their schema defaults filled in, so an omitted default and a stored one compare equal. */
function settingsOf(doc: DesignDocument): Record<string, unknown> {
  const defaults: Record<string, unknown> = { strayCapacitanceF: 0, deratingFraction: 0.8 };
  return { ...defaults, ...(doc.settings ?? {}) };
}

/**
 * The difference from document `a` (the older revision, or the parent) to `b` (the newer
 * revision, or the fork). See {@link DesignDiff}.
 */
export function diffDesigns(a: DesignDocument, b: DesignDocument): DesignDiff {
  const cmp = compareDocuments(b, a);
  const aById = new Map(a.blocks.map((x) => [x.id, x] as const));
  const bById = new Map(b.blocks.map((x) => [x.id, x] as const));
  const changes: BlockChange[] = [];
  const moved: string[] = [];
  const removed: BlockChange[] = [];
  for (const d of cmp.blocks) {
    if (d.change === 'moved') {
      moved.push(d.id);
      continue;
    }
    if (d.change === 'only-mine' || d.change === 'only-theirs') {
      const kind: ChangeKind = d.change === 'only-mine' ? 'added' : 'removed';
      const block = (kind === 'added' ? bById.get(d.id) : aById.get(d.id)) as DesignBlock;
      const fields = kind === 'added' ? diffFields(undefined, block.data) : diffFields(block.data, undefined);
      const change: BlockChange = { kind, blockId: block.id, designator: designatorOf(block), blockKind: block.kind, category: categoryOf(block.kind), fields, summary: summaryOf(kind, block, fields, null) };
      (kind === 'added' ? changes : removed).push(change);
      continue;
    }
    const before = aById.get(d.id) as DesignBlock;
    const after = bById.get(d.id) as DesignBlock;
    const fields = before.kind === after.kind ? diffFields(before.data, after.data) : diffFields({ kind: before.kind, ...before.data }, { kind: after.kind, ...after.data });
    const relabelled = designatorOf(before) !== designatorOf(after) ? { before: designatorOf(before), after: designatorOf(after) } : null;
    if (fields.length === 0 && !relabelled) continue;
    changes.push({
      kind: 'changed',
      blockId: after.id,
      designator: designatorOf(after),
      blockKind: after.kind,
      category: categoryOf(after.kind),
      fields,
      ...(relabelled ? { relabelled } : {}),
      summary: summaryOf('changed', after, fields, relabelled),
    });
  }
  const settings = diffFields(settingsOf(a), settingsOf(b));
  const all = [...changes, ...removed];
  const wires = { added: cmp.wiresOnlyMine, removed: cmp.wiresOnlyTheirs };
  return { changes: all, settings, wires, moved, identical: all.length === 0 && settings.length === 0 && wires.added === 0 && wires.removed === 0 };
}
