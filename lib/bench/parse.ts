/**
 * Reading bench-data CSV files (pure; runs in the browser and on the server). Two steps:
 * {@link inspectCsv} finds the layout (delimiter, header lines, columns with sample values and a
 * guessed unit and role) so the upload form can pre-fill a mapping; {@link readPoints} reads the
 * mapped columns as SI points and names the 1-based file line of every problem.
 *
 * Layout rules (documented in /work/notes/docs/bench.md):
 * - Lines are split on CRLF, LF or CR. Empty lines and lines starting with `#` or `//` are skipped
 *   (scope exports put their settings there). A quoted cell may not span lines.
 * - Delimiter: tab if every sampled line has one, else `;`, else `,` (the first one found on all
 *   of the first 30 content lines). Cells are split with papaparse (quotes honoured).
 * - With `;` or tab as delimiter a decimal comma is accepted ("1,25" = 1.25).
 * - Header: the leading lines without any number in them (at most 10). The first names the
 *   columns; a later one (e.g. a units row "s;V") is appended to the names.
 * - After the header every content line is a data row: at most {@link MAX_BENCH_ROWS}.
 */
import Papa from 'papaparse';
import { AXES, MAX_BENCH_COLUMNS, MAX_BENCH_ROWS, type BenchKind, type BenchMapping } from './mapping';
import { formatSi, parseUnit, quantityOfName, unitOfHeader, type Quantity } from './units';

/** One problem in a file, by its 1-based line. */
export interface CsvError {
  line: number;
  reason: string;
}

/** Most problems listed for one file (the rest are counted in the last message). */
export const MAX_LISTED_ERRORS = 50;
/** Most header lines before the first number. */
const MAX_HEADER_LINES = 10;
/** Content lines sampled for the delimiter and the column guesses. */
const SAMPLE_LINES = 30;

export type Delimiter = ',' | ';' | '\t';

/** One column as {@link inspectCsv} sees it. */
export interface CsvColumn {
  index: number;
  /** Header text, or "Column N" without a header. */
  name: string;
  /** The first few raw cells. */
  samples: string[];
  /** True when every sampled cell is a number. */
  numeric: boolean;
  /** Unit named in the header (e.g. "mA"), if any. */
  unit: string | null;
  /** Factor to SI implied by the unit (1 when none). */
  scale: number;
  /** What the header suggests the column holds. */
  role: Quantity | null;
}

export interface CsvLayout {
  delimiter: Delimiter;
  decimalComma: boolean;
  /** 1-based lines of the header (empty without one). */
  headerLines: number[];
  /** Data rows (content lines after the header). */
  rowCount: number;
  columns: CsvColumn[];
  /** A mapping made from the guesses (the form's starting point). */
  suggested: BenchMapping;
}

export type InspectResult = ({ ok: true } & CsvLayout) | { ok: false; errors: CsvError[] };

/** One measured point in SI units, with the file line it came from. */
export interface BenchPoint {
  line: number;
  x: number;
  y: number;
}

export type ReadResult = { ok: true; points: BenchPoint[]; layout: CsvLayout } | { ok: false; errors: CsvError[] };

interface Line {
  /** 1-based line number in the file. */
  n: number;
  text: string;
}

const NUMBER_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** Parse one cell as a number (decimal comma allowed when `decimalComma`); null if it is not one. */
export function parseNumber(cell: string, decimalComma: boolean): number | null {
  let s = cell.trim();
  if (decimalComma && s.includes(',') && !s.includes('.')) s = s.replace(',', '.');
  if (!NUMBER_RE.test(s)) return null;
  const v = Number(s);
  return Number.isFinite(v) ? v : null;
}

function contentLines(text: string): Line[] {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const out: Line[] = [];
  body.split(/\r\n|\n|\r/).forEach((t, i) => {
    const s = t.trim();
    if (s === '' || s.startsWith('#') || s.startsWith('//')) return;
    out.push({ n: i + 1, text: t });
  });
  return out;
}

function countOutsideQuotes(text: string, ch: string): number {
  let inQuotes = false;
  let count = 0;
  for (const c of text) {
    if (c === '"') inQuotes = !inQuotes;
    else if (c === ch && !inQuotes) count += 1;
  }
  return count;
}

/** The delimiter found on every one of the first content lines (tab, then `;`, then `,`). */
export function detectDelimiter(lines: readonly string[]): Delimiter {
  const sample = lines.slice(0, SAMPLE_LINES);
  for (const d of ['\t', ';', ','] as const) {
    if (sample.length > 0 && sample.every((l) => countOutsideQuotes(l, d) > 0)) return d;
  }
  // Header lines of some exports carry no delimiter; judge by the data lines alone.
  for (const d of ['\t', ';', ','] as const) {
    const hits = sample.filter((l) => countOutsideQuotes(l, d) > 0).length;
    if (hits >= Math.max(1, Math.ceil(sample.length * 0.8))) return d;
  }
  return ',';
}

function splitCells(text: string, delimiter: Delimiter): string[] {
  if (!text.includes('"')) return text.split(delimiter).map((c) => c.trim());
  const parsed = Papa.parse<string[]>(text, { delimiter, header: false, skipEmptyLines: false });
  return (parsed.data[0] ?? []).map((c) => String(c).trim());
}

/** Drop empty cells at the end of a row (trailing delimiters). */
function trimRow(cells: string[]): string[] {
  let end = cells.length;
  while (end > 0 && cells[end - 1] === '') end -= 1;
  return cells.slice(0, end);
}

interface Structure {
  delimiter: Delimiter;
  decimalComma: boolean;
  header: Line[];
  names: string[] | null;
  data: Line[];
  rows: (lines: Line[]) => string[][];
}

function structureOf(text: string): { ok: true; s: Structure } | { ok: false; errors: CsvError[] } {
  const lines = contentLines(text);
  if (lines.length === 0) return { ok: false, errors: [{ line: 1, reason: 'the file has no data lines (empty, or only comments)' }] };
  const delimiter = detectDelimiter(lines.map((l) => l.text));
  const decimalComma = delimiter !== ',';
  const cells = (l: Line) => trimRow(splitCells(l.text, delimiter));
  const hasNumber = (row: string[]) => row.some((c) => parseNumber(c, decimalComma) !== null);
  const header: Line[] = [];
  let first = 0;
  while (first < lines.length && !hasNumber(cells(lines[first]))) {
    header.push(lines[first]);
    first += 1;
    if (header.length > MAX_HEADER_LINES) {
      return { ok: false, errors: [{ line: lines[first - 1].n, reason: `no number in the first ${MAX_HEADER_LINES} lines: this does not look like a measurement log` }] };
    }
  }
  const data = lines.slice(first);
  if (data.length === 0) return { ok: false, errors: [{ line: header[header.length - 1].n, reason: 'the file has a header but no data rows' }] };
  if (data.length > MAX_BENCH_ROWS) {
    return { ok: false, errors: [{ line: data[MAX_BENCH_ROWS].n, reason: `more than ${MAX_BENCH_ROWS.toLocaleString('en-GB').replace(/,/g, ' ')} data rows (the limit); split the file or decimate the capture` }] };
  }
  let names: string[] | null = null;
  if (header.length > 0) {
    const rows = header.map(cells);
    names = rows[0].map((name, i) => {
      let out = name;
      for (const extra of rows.slice(1)) {
        const e = (extra[i] ?? '').trim();
        if (e === '') continue;
        out = parseUnit(e) ? `${out} (${e})` : `${out} ${e}`;
      }
      return out;
    });
  }
  return { ok: true, s: { delimiter, decimalComma, header, names, data, rows: (ls) => ls.map(cells) } };
}

function guessColumns(s: Structure): CsvColumn[] {
  const sample = s.rows(s.data.slice(0, SAMPLE_LINES));
  const width = Math.min(MAX_BENCH_COLUMNS, Math.max(s.names?.length ?? 0, ...sample.map((r) => r.length)));
  const columns: CsvColumn[] = [];
  for (let i = 0; i < width; i += 1) {
    const name = s.names?.[i]?.trim() || `Column ${i + 1}`;
    const unit = s.names ? unitOfHeader(name) : null;
    const cells = sample.map((r) => r[i] ?? '');
    columns.push({
      index: i,
      name,
      samples: cells.slice(0, 5),
      numeric: cells.every((c) => parseNumber(c, s.decimalComma) !== null),
      unit: unit?.unit ?? null,
      scale: unit?.scale ?? 1,
      role: unit?.quantity ?? (s.names ? quantityOfName(name) : null),
    });
  }
  return columns;
}

function suggest(columns: CsvColumn[]): BenchMapping {
  const numeric = columns.filter((c) => c.numeric);
  const pool = numeric.length >= 2 ? numeric : columns;
  const find = (role: Quantity, not?: number) => pool.find((c) => c.role === role && c.index !== not);
  const time = find('time');
  const kind: BenchKind = time ? 'ripple' : 'loadCurve';
  const x = time ?? find('current') ?? pool[0];
  const y = find('voltage', x.index) ?? pool.find((c) => c.index !== x.index) ?? columns[1];
  return { kind, xColumn: x.index, yColumn: y.index, xScale: x.scale, yScale: y.scale };
}

/** Find the layout of a CSV file and guess a mapping (stores and changes nothing). */
export function inspectCsv(text: string): InspectResult {
  const st = structureOf(text);
  if (!st.ok) return st;
  const columns = guessColumns(st.s);
  if (columns.length < 2) {
    return { ok: false, errors: [{ line: st.s.data[0].n, reason: 'only one column found: a measurement needs two (separate them with a comma, semicolon or tab)' }] };
  }
  return {
    ok: true,
    delimiter: st.s.delimiter,
    decimalComma: st.s.decimalComma,
    headerLines: st.s.header.map((l) => l.n),
    rowCount: st.s.data.length,
    columns,
    suggested: suggest(columns),
  };
}

/**
 * Read the points `mapping` names. Every problem is listed with its 1-based file line (up to
 * {@link MAX_LISTED_ERRORS}): a column that does not exist, a missing or non-numeric cell, a
 * negative load current, a time that does not increase (ripple), fewer than 2 points, more than
 * {@link MAX_BENCH_ROWS} rows.
 */
export function readPoints(text: string, mapping: BenchMapping): ReadResult {
  const inspected = inspectCsv(text);
  if (!inspected.ok) return inspected;
  const st = structureOf(text);
  if (!st.ok) return st;
  const s = st.s;
  const { ok: _ok, ...layout } = inspected;
  void _ok;
  const { columns } = layout;
  const errors: CsvError[] = [];
  let dropped = 0;
  const fail = (line: number, reason: string) => {
    if (errors.length < MAX_LISTED_ERRORS) errors.push({ line, reason });
    else dropped += 1;
  };
  const headerLine = s.header[0]?.n ?? s.data[0].n;
  for (const [axis, index] of [['x', mapping.xColumn], ['y', mapping.yColumn]] as const) {
    if (index >= columns.length) fail(headerLine, `the ${axis} column (number ${index + 1}) does not exist: the file has ${columns.length} columns`);
  }
  if (errors.length > 0) return { ok: false, errors };
  const axes = AXES[mapping.kind];
  const colName = (i: number) => `"${columns[i].name}"`;
  const points: BenchPoint[] = [];
  const rows = s.rows(s.data);
  let previous: BenchPoint | null = null;
  for (const [k, line] of s.data.entries()) {
    const row = rows[k];
    const read = (index: number): number | null => {
      const cell = row[index];
      if (cell === undefined || cell === '') {
        fail(line.n, `missing cell in column ${colName(index)} (the line has ${row.length} cell${row.length === 1 ? '' : 's'})`);
        return null;
      }
      const v = parseNumber(cell, s.decimalComma);
      if (v === null) {
        fail(line.n, `"${cell.slice(0, 40)}" in column ${colName(index)} is not a number`);
        return null;
      }
      return v;
    };
    const xr = read(mapping.xColumn);
    const yr = read(mapping.yColumn);
    if (xr === null || yr === null) continue;
    const p: BenchPoint = { line: line.n, x: xr * mapping.xScale, y: yr * mapping.yScale };
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) {
      fail(line.n, 'the scaled value is out of range');
      continue;
    }
    if (mapping.kind === 'loadCurve' && p.x < 0) {
      fail(line.n, `load current ${formatSi(p.x, 'A')} is negative (give the magnitude of the current drawn)`);
      continue;
    }
    if (mapping.kind === 'ripple' && previous && !(p.x > previous.x)) {
      fail(line.n, `time ${formatSi(p.x, 's')} is not after the previous row's ${formatSi(previous.x, 's')} (line ${previous.line}): times must increase`);
    }
    previous = p;
    points.push(p);
  }
  if (dropped > 0) errors.push({ line: errors[errors.length - 1].line, reason: `and ${dropped} more problem${dropped === 1 ? '' : 's'} after this line` });
  if (errors.length > 0) return { ok: false, errors };
  if (points.length < 2) {
    return { ok: false, errors: [{ line: s.data[s.data.length - 1].n, reason: `only ${points.length} usable data row${points.length === 1 ? '' : 's'}: a ${axes.x.toLowerCase()} vs ${axes.y.toLowerCase()} curve needs at least 2 points` }] };
  }
  return { ok: true, points, layout };
}
