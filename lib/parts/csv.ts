/**
 * Reading a parts-list CSV into library parts (pure: no I/O, runs in the browser and on the
 * server). The route (POST /api/teams/:teamId/parts/import) stores what this returns.
 *
 * File format (documented in /work/notes/docs/parts.md):
 * - The first non-empty line names the columns; names are case-insensitive, spaces and dashes
 *   count as underscores (`Part Number` = `part_number`). An unknown column refuses the file
 *   (a typo would otherwise drop a value silently). `kind` and `part_number` must be present.
 * - Delimiter: `,`, or `;` / tab when the header line has those and no comma. Cells may be quoted
 *   (papaparse rules); a quoted cell may not span lines. Empty lines and lines starting with `#`
 *   are skipped. At most {@link MAX_IMPORT_ROWS} data rows.
 * - Columns: kind, part_number, description, maker, unit_cost, currency, capacitance, tolerance,
 *   rated_voltage, esr, dielectric, size (capacitors); rated_piv, avg_current, surge_current, trr,
 *   is, n, rs, cjo, tt (diodes); resistance, power, rated_voltage, tolerance (resistors).
 * - Numbers in SPICE engineering notation with an optional unit: `10n`, `4.7nF`, `15kV`, `2.2meg`,
 *   `1e-14`. A bare upper-case `M` is refused as ambiguous (SPICE reads it as milli; write `meg`
 *   for 10⁶ or `m` for 10⁻³). Tolerances as `5 %`, `±5%` or a fraction `0.05`.
 * - A diode row without `rs` gets RS = 0 (no series resistance modelled).
 *
 * Every data row is either a part input (checked by `partInputSchema`) or a rejection that lists
 * every reason found on it, with its 1-based file line (the header is line 1 when it comes
 * first). A part number that appears twice in the file (case-insensitively) is rejected on its
 * second line.
 */
import Papa from 'papaparse';
import { parseEngineering } from '../circuit/netlist/units';
import { DIELECTRICS, PART_KINDS, partInputSchema, type PartImportRejection, type PartInput, type PartKind } from './schema';

/** Most data rows one file may hold. */
export const MAX_IMPORT_ROWS = 5000;

/** Every column the import reads. */
export const PART_CSV_COLUMNS = [
  'kind',
  'part_number',
  'description',
  'maker',
  'unit_cost',
  'currency',
  'capacitance',
  'tolerance',
  'rated_voltage',
  'esr',
  'dielectric',
  'size',
  'rated_piv',
  'avg_current',
  'surge_current',
  'trr',
  'is',
  'n',
  'rs',
  'cjo',
  'tt',
  'resistance',
  'power',
] as const;
export type PartCsvColumn = (typeof PART_CSV_COLUMNS)[number];

const COMMON: readonly PartCsvColumn[] = ['kind', 'part_number', 'description', 'maker', 'unit_cost', 'currency'];
/** Columns each kind reads besides the common ones (anything else must be empty on its rows). */
const KIND_COLUMNS: Record<PartKind, readonly PartCsvColumn[]> = {
  capacitor: ['capacitance', 'tolerance', 'rated_voltage', 'esr', 'dielectric', 'size'],
  diode: ['rated_piv', 'avg_current', 'surge_current', 'trr', 'is', 'n', 'rs', 'cjo', 'tt'],
  resistor: ['resistance', 'power', 'rated_voltage', 'tolerance'],
};
const REQUIRED: Record<PartKind, readonly PartCsvColumn[]> = {
  capacitor: ['capacitance', 'tolerance', 'rated_voltage', 'dielectric'],
  diode: ['rated_piv', 'avg_current', 'is', 'n'],
  resistor: ['resistance', 'power', 'rated_voltage'],
};

/** Short names for the dielectrics a parts list may use (trade terms). */
const DIELECTRIC_ALIASES: Record<string, (typeof DIELECTRICS)[number]> = {
  c0g: 'ceramic-class1',
  np0: 'ceramic-class1',
  'class 1 ceramic': 'ceramic-class1',
  x7r: 'ceramic-class2',
  x5r: 'ceramic-class2',
  y5v: 'ceramic-class2',
  z5u: 'ceramic-class2',
  'class 2 ceramic': 'ceramic-class2',
  pp: 'film-polypropylene',
  polypropylene: 'film-polypropylene',
  pet: 'film-polyester',
  polyester: 'film-polyester',
};

/** What a schema path of a part input is called in the file. */
const FIELD_COLUMN: Record<string, PartCsvColumn> = {
  partNumber: 'part_number',
  description: 'description',
  maker: 'maker',
  unitCost: 'unit_cost',
  currency: 'currency',
  'specs.capacitanceF': 'capacitance',
  'specs.tolerance': 'tolerance',
  'specs.ratedVoltageV': 'rated_voltage',
  'specs.esrOhm': 'esr',
  'specs.dielectric': 'dielectric',
  'specs.size': 'size',
  'specs.ratedPivV': 'rated_piv',
  'specs.ratedAvgCurrentA': 'avg_current',
  'specs.ratedSurgeA': 'surge_current',
  'specs.trrS': 'trr',
  'specs.model.isA': 'is',
  'specs.model.n': 'n',
  'specs.model.rsOhm': 'rs',
  'specs.model.cjoF': 'cjo',
  'specs.model.ttS': 'tt',
  'specs.resistanceOhm': 'resistance',
  'specs.ratedPowerW': 'power',
};

/** One row that reads as a part, with its file line. */
export interface PartCsvRow {
  line: number;
  input: PartInput;
}

export type PartsCsvResult =
  | { ok: true; rows: PartCsvRow[]; rejected: PartImportRejection[] }
  /** The file as a whole cannot be read (no header, unknown or missing columns, too many rows). */
  | { ok: false; reason: string };

/** A value of an engineering-notation column, or the reason it does not read. */
export function readCsvNumber(raw: string): { ok: true; value: number } | { ok: false; reason: string } {
  const text = raw.trim().replace(/^\+/, '');
  const compact = text.replace(/(\d|\.)\s+(?=[A-Za-zµμΩ])/g, '$1');
  const m = /^[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?(.*)$/.exec(compact);
  if (m && /^M(?!eg|EG|Eg)/.test(m[1])) return { ok: false, reason: `"${raw.trim()}" is ambiguous: write "meg" for 10^6 or "m" for 10^-3` };
  const v = parseEngineering(compact);
  if (v === null) return { ok: false, reason: `"${raw.trim()}" is not a number` };
  return { ok: true, value: v };
}

/** A tolerance: `5 %`, `±5%`, `5%` → 0.05; a bare number is a fraction (0.05). */
export function readCsvTolerance(raw: string): { ok: true; value: number } | { ok: false; reason: string } {
  const text = raw.trim().replace(/^±\s*/, '').replace(/^\+\/-\s*/, '');
  const pct = /^(.*?)\s*%$/.exec(text);
  if (pct) {
    const n = Number(pct[1]);
    if (pct[1] === '' || !Number.isFinite(n)) return { ok: false, reason: `"${raw.trim()}" is not a percentage` };
    return { ok: true, value: n / 100 };
  }
  const n = Number(text);
  if (text === '' || !Number.isFinite(n)) return { ok: false, reason: `"${raw.trim()}" is not a tolerance (write 5 % or 0.05)` };
  if (n > 1) return { ok: false, reason: `${text} is more than 100 %; write "${text} %" for a percentage` };
  return { ok: true, value: n };
}

function normaliseHeader(h: string): string {
  return h.replace(/^\uFEFF/, '').trim().toLowerCase().replace(/[\s-]+/g, '_');
}

function detectDelimiter(header: string): string {
  if (header.includes(',')) return ',';
  if (header.includes('\t')) return '\t';
  if (header.includes(';')) return ';';
  return ',';
}

function splitLine(line: string, delimiter: string): { cells: string[] } | { error: string } {
  const parsed = Papa.parse<string[]>(line, { delimiter, header: false, skipEmptyLines: false });
  const quoteError = parsed.errors.find((e) => e.type === 'Quotes');
  if (quoteError) return { error: 'a quoted cell is not closed on this line (a cell may not span lines)' };
  return { cells: parsed.data[0] ?? [] };
}

/** Read a whole parts-list CSV. */
export function parsePartsCsv(text: string): PartsCsvResult {
  const lines = text.split(/\r\n|\n|\r/);
  const headerIndex = lines.findIndex((l) => l.trim() !== '' && !l.trimStart().startsWith('#'));
  if (headerIndex < 0) return { ok: false, reason: 'the file is empty: the first line must name the columns (kind, part_number, …)' };
  const delimiter = detectDelimiter(lines[headerIndex]);
  const head = splitLine(lines[headerIndex], delimiter);
  if ('error' in head) return { ok: false, reason: `line ${headerIndex + 1}: ${head.error}` };
  const columns = head.cells.map(normaliseHeader);
  const known = new Set<string>(PART_CSV_COLUMNS);
  const unknown = columns.filter((c) => c !== '' && !known.has(c));
  if (unknown.length > 0) return { ok: false, reason: `unknown column${unknown.length > 1 ? 's' : ''} ${unknown.map((c) => `"${c}"`).join(', ')}; the columns are ${PART_CSV_COLUMNS.join(', ')}` };
  const seen = new Set<string>();
  for (const c of columns) {
    if (c === '') continue;
    if (seen.has(c)) return { ok: false, reason: `column "${c}" appears twice in the header` };
    seen.add(c);
  }
  const missing = (['kind', 'part_number'] as const).filter((c) => !seen.has(c));
  if (missing.length > 0) return { ok: false, reason: `the header has no ${missing.map((c) => `"${c}"`).join(' or ')} column` };

  const dataLines: number[] = [];
  for (let i = headerIndex + 1; i < lines.length; i++) {
    if (lines[i].trim() === '' || lines[i].trimStart().startsWith('#')) continue;
    dataLines.push(i);
  }
  if (dataLines.length === 0) return { ok: false, reason: 'the file has a header but no parts' };
  if (dataLines.length > MAX_IMPORT_ROWS) return { ok: false, reason: `the file has ${dataLines.length} parts; at most ${MAX_IMPORT_ROWS} per import` };

  const rows: PartCsvRow[] = [];
  const rejected: PartImportRejection[] = [];
  const firstLineOf = new Map<string, number>();
  for (const i of dataLines) {
    const line = i + 1;
    const split = splitLine(lines[i], delimiter);
    if ('error' in split) {
      rejected.push({ line, partNumber: null, reasons: [split.error] });
      continue;
    }
    const cell: Partial<Record<PartCsvColumn, string>> = {};
    const reasons: string[] = [];
    if (split.cells.length > columns.length && split.cells.slice(columns.length).some((c) => c.trim() !== '')) reasons.push(`the line has ${split.cells.length} cells but the header names ${columns.length} columns`);
    columns.forEach((c, k) => {
      const v = (split.cells[k] ?? '').trim();
      if (c !== '' && v !== '') cell[c as PartCsvColumn] = v;
    });
    const partNumber = cell.part_number ?? null;
    const r = readRow(cell, reasons);
    if (partNumber) {
      const key = partNumber.toLowerCase();
      const first = firstLineOf.get(key);
      if (first !== undefined) reasons.push(`part number ${partNumber} is also on line ${first}`);
      else firstLineOf.set(key, line);
    }
    if (reasons.length > 0 || !r) rejected.push({ line, partNumber, reasons: reasons.length > 0 ? reasons : ['the row could not be read'] });
    else rows.push({ line, input: r });
  }
  return { ok: true, rows, rejected };
}

/** One row's part input; every problem is pushed onto `reasons` (null when there is any). */
function readRow(cell: Partial<Record<PartCsvColumn, string>>, reasons: string[]): PartInput | null {
  const kindRaw = cell.kind?.toLowerCase();
  let kind: PartKind | null = null;
  if (!kindRaw) reasons.push('kind: required (capacitor, diode or resistor)');
  else if ((PART_KINDS as readonly string[]).includes(kindRaw)) kind = kindRaw as PartKind;
  else reasons.push(`kind: unknown kind "${cell.kind}" (capacitor, diode or resistor)`);
  if (!cell.part_number) reasons.push('part_number: required');

  const num = (c: PartCsvColumn): number | undefined => {
    const raw = cell[c];
    if (raw === undefined) return undefined;
    const r = readCsvNumber(raw);
    if (!r.ok) {
      reasons.push(`${c}: ${r.reason}`);
      return undefined;
    }
    return r.value;
  };
  const tol = (): number | undefined => {
    const raw = cell.tolerance;
    if (raw === undefined) return undefined;
    const r = readCsvTolerance(raw);
    if (!r.ok) {
      reasons.push(`tolerance: ${r.reason}`);
      return undefined;
    }
    return r.value;
  };
  let unitCost: number | undefined;
  if (cell.unit_cost !== undefined) {
    const t = cell.unit_cost.replace(/^[^\d.+-]+/, '').trim();
    const n = Number(t);
    if (t === '' || !Number.isFinite(n)) reasons.push(`unit_cost: "${cell.unit_cost}" is not a price`);
    else unitCost = n;
  }
  if (!kind) return null;

  const allowed = new Set<PartCsvColumn>([...COMMON, ...KIND_COLUMNS[kind]]);
  for (const c of Object.keys(cell) as PartCsvColumn[]) if (!allowed.has(c)) reasons.push(`${c}: does not apply to a ${kind}; leave it empty`);
  for (const c of REQUIRED[kind]) if (cell[c] === undefined) reasons.push(`${c}: required for a ${kind}`);

  let specs: Record<string, unknown>;
  if (kind === 'capacitor') {
    let dielectric: string | undefined;
    if (cell.dielectric !== undefined) {
      const d = cell.dielectric.toLowerCase();
      dielectric = (DIELECTRICS as readonly string[]).includes(d) ? d : DIELECTRIC_ALIASES[d];
      if (!dielectric) reasons.push(`dielectric: unknown dielectric "${cell.dielectric}" (${DIELECTRICS.join(', ')})`);
    }
    specs = { capacitanceF: num('capacitance'), tolerance: tol(), ratedVoltageV: num('rated_voltage'), esrOhm: num('esr'), dielectric, size: cell.size };
  } else if (kind === 'diode') {
    specs = {
      ratedPivV: num('rated_piv'),
      ratedAvgCurrentA: num('avg_current'),
      ratedSurgeA: num('surge_current'),
      trrS: num('trr'),
      model: { isA: num('is'), n: num('n'), rsOhm: cell.rs === undefined ? 0 : num('rs'), cjoF: num('cjo'), ttS: num('tt') },
    };
  } else {
    specs = { resistanceOhm: num('resistance'), tolerance: tol(), ratedPowerW: num('power'), ratedVoltageV: num('rated_voltage') };
  }
  if (reasons.length > 0) return null;

  const parsed = partInputSchema.safeParse({
    kind,
    partNumber: cell.part_number,
    description: cell.description,
    maker: cell.maker,
    unitCost,
    currency: cell.currency?.toUpperCase(),
    specs: dropUndefined(specs),
  });
  if (parsed.success) return parsed.data;
  for (const issue of parsed.error.issues) {
    const path = issue.path.join('.');
    reasons.push(`${FIELD_COLUMN[path] ?? path}: ${issue.message}`);
  }
  return null;
}

function dropUndefined(o: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(o)) {
    if (v === undefined) continue;
    out[k] = v !== null && typeof v === 'object' && !Array.isArray(v) ? dropUndefined(v as Record<string, unknown>) : v;
  }
  return out;
}
