/**
 * The bill of materials of one design revision: one row per distinct part, with the parts'
 * designators (lib/circuit/document/designators.ts), how many, the part number, maker, value,
 * tolerance and ratings, the worst stress and its margin in this design (from the solve, judged
 * at the derating in force), and cost.
 *
 * Grouping: a part bound to a team library part (`partId`) is grouped with every other part
 * bound to the same library part; the number, maker, unit cost and currency come from the
 * library. An unbound part is grouped with the unbound parts of the same kind whose values
 * (value, tolerance, ESR, ratings, diode model) are identical, and its part number reads
 * "unbound". A bound part whose library part is gone keeps its id as the part number and has no
 * cost.
 *
 * Costs: line cost = quantity × unit cost. The total row sums quantities, and line costs when
 * every priced line is in one currency; with several currencies the total cost is left empty and
 * each currency gets its own total row.
 *
 * Pure; the CSV follows RFC 4180 (lib/exports/csv.ts). A CSV has no comment lines, so the safety
 * caution travels in the report, not here.
 */
import { compareDesignators, designateParts, designatorKey, type DesignatedKind, type DesignatedPart } from '../circuit/document/designators';
import type { DesignDocument } from '../circuit/document/schema';
import type { PartStress, StressCheck } from '../editor/types';
import { formatSi } from '../client/format';
import { csvText } from './csv';

/** What the BOM reads from the team parts library for a bound part. */
export interface LibraryPartInfo {
  id: string;
  partNumber: string;
  maker: string;
  /** Price of one piece; null when the library has none. */
  unitCost: number | null;
  currency: string;
}

/** The worst stress of a row's parts against the derated limit. */
export interface RowStress {
  /** Which check: `voltage`, `piv`, `averageCurrent`, `peakCurrent` or `power`. */
  quantity: StressCheck['quantity'];
  actual: number;
  unit: StressCheck['unit'];
  /** derating × rating. */
  allowed: number;
  /** (allowed − actual) / allowed. */
  margin: number;
  /** The part that has it. */
  designator: string;
}

export interface BomRow {
  designators: string[];
  quantity: number;
  kind: DesignatedKind;
  /** Library part id when bound (the grouping key's part), else null. */
  partId: string | null;
  partNumber: string;
  maker: string;
  /** Value in engineering units, e.g. "10 nF", "1 GΩ", or a diode's model summary. */
  value: string;
  tolerance: string;
  ratings: string;
  /** Worst rated check over the row's parts; null when none is rated or there is no solve. */
  stress: RowStress | null;
  unitCost: number | null;
  lineCost: number | null;
  currency: string;
}

export interface Bom {
  rows: BomRow[];
  totalQuantity: number;
  /** Sum of line costs per currency (only priced lines). */
  totals: Array<{ currency: string; cost: number; pricedLines: number }>;
  /** Whether the stress columns are filled (a solve was given). */
  withStress: boolean;
}

const CHECK_WORDS: Record<StressCheck['quantity'], string> = {
  voltage: 'V',
  piv: 'PIV',
  averageCurrent: 'IF(AV)',
  peakCurrent: 'IF peak',
  power: 'P',
};

function pct(fraction: number | undefined): string {
  return fraction === undefined ? '' : `±${Number((fraction * 100).toPrecision(3))} %`;
}

function valueOf(p: DesignatedPart): string {
  if (p.kind === 'capacitor') return formatSi(p.spec.capacitanceF, 'F');
  if (p.kind === 'resistor') return formatSi(p.spec.resistanceOhm, 'Ω');
  const m = p.spec.model;
  return `IS ${m.isA.toExponential(2)} A, N ${Number(m.n.toPrecision(3))}, RS ${formatSi(m.rsOhm, 'Ω')}`;
}

function toleranceOf(p: DesignatedPart): string {
  if (p.kind === 'diode') return '';
  return pct((p.spec as { tolerance?: number }).tolerance);
}

/** The ratings a part carries, in the trade's words: V rating; PIV / IF(AV) / IFSM; power / voltage. */
export function ratingsText(p: DesignatedPart): string {
  const parts: string[] = [];
  if (p.kind === 'capacitor') {
    if (p.spec.ratedVoltageV) parts.push(`${formatSi(p.spec.ratedVoltageV, 'V')} DC`);
  } else if (p.kind === 'diode') {
    if (p.spec.ratedPivV) parts.push(`PIV ${formatSi(p.spec.ratedPivV, 'V')}`);
    if (p.spec.ratedAvgCurrentA) parts.push(`IF(AV) ${formatSi(p.spec.ratedAvgCurrentA, 'A')}`);
    if (p.spec.ratedSurgeA) parts.push(`IFSM ${formatSi(p.spec.ratedSurgeA, 'A')}`);
  } else {
    if (p.spec.ratedPowerW) parts.push(formatSi(p.spec.ratedPowerW, 'W'));
    if (p.spec.ratedVoltageV) parts.push(formatSi(p.spec.ratedVoltageV, 'V'));
  }
  return parts.length > 0 ? parts.join(' / ') : 'unrated';
}

/** The values that make two unbound parts the same part (everything the BOM and the solve read). */
function valueKey(p: DesignatedPart): string {
  const s = p.spec as Record<string, unknown>;
  const { partId: _id, ...rest } = s;
  const sorted = (o: Record<string, unknown>): unknown =>
    Object.fromEntries(
      Object.keys(o)
        .sort()
        .filter((k) => o[k] !== undefined)
        .map((k) => [k, o[k] !== null && typeof o[k] === 'object' ? sorted(o[k] as Record<string, unknown>) : o[k]]),
    );
  return `${p.kind}|${JSON.stringify(sorted(rest))}`;
}

/** The worst (smallest-margin) rated check of each part, by designator key. */
function worstByPart(stress: PartStress[]): Map<string, Omit<RowStress, 'designator'>> {
  const out = new Map<string, Omit<RowStress, 'designator'>>();
  for (const p of stress) {
    for (const c of p.checks) {
      if (c.margin === undefined || c.allowed === undefined) continue;
      const key = designatorKey(p.blockId, p.role);
      const cur = out.get(key);
      if (!cur || c.margin < cur.margin) out.set(key, { quantity: c.quantity, actual: c.actual, unit: c.unit, allowed: c.allowed, margin: c.margin });
    }
  }
  return out;
}

/**
 * The BOM of `doc`. `library` answers bound parts' numbers, makers and costs; `stress` is the
 * solve's part stress (lib/editor/engine/view-model.ts `partStress`), or null when the design
 * was not solved (the stress columns are then left out).
 */
export function buildBom(doc: Pick<DesignDocument, 'blocks' | 'wires'>, library: ReadonlyMap<string, LibraryPartInfo>, stress: PartStress[] | null): Bom {
  const parts = designateParts(doc);
  const worst = stress ? worstByPart(stress) : new Map<string, Omit<RowStress, 'designator'>>();
  const groups = new Map<string, DesignatedPart[]>();
  for (const p of parts) {
    const key = p.spec.partId ? `${p.kind}|part:${p.spec.partId}` : valueKey(p);
    const list = groups.get(key) ?? [];
    list.push(p);
    groups.set(key, list);
  }
  const rows: BomRow[] = [];
  for (const list of groups.values()) {
    const first = list[0];
    const partId = first.spec.partId ?? null;
    const lib = partId ? library.get(partId) : undefined;
    const designators = list.map((p) => p.designator).sort(compareDesignators);
    let rowStress: RowStress | null = null;
    for (const p of list) {
      const w = worst.get(designatorKey(p.blockId, p.role));
      if (w && (!rowStress || w.margin < rowStress.margin)) rowStress = { ...w, designator: p.designator };
    }
    const unitCost = lib?.unitCost ?? null;
    rows.push({
      designators,
      quantity: list.length,
      kind: first.kind,
      partId,
      partNumber: lib ? lib.partNumber : partId ?? 'unbound',
      maker: lib?.maker ?? '',
      value: valueOf(first),
      tolerance: toleranceOf(first),
      ratings: ratingsText(first),
      stress: rowStress,
      unitCost,
      lineCost: unitCost === null ? null : round2(unitCost * list.length),
      currency: lib && unitCost !== null ? lib.currency : '',
    });
  }
  const kindOrder: Record<DesignatedKind, number> = { capacitor: 0, diode: 1, resistor: 2 };
  rows.sort((a, b) => kindOrder[a.kind] - kindOrder[b.kind] || compareDesignators(a.designators[0], b.designators[0]));
  const totals = new Map<string, { cost: number; pricedLines: number }>();
  for (const r of rows) {
    if (r.lineCost === null) continue;
    const t = totals.get(r.currency) ?? { cost: 0, pricedLines: 0 };
    t.cost = round2(t.cost + r.lineCost);
    t.pricedLines += 1;
    totals.set(r.currency, t);
  }
  return {
    rows,
    totalQuantity: rows.reduce((s, r) => s + r.quantity, 0),
    totals: [...totals.entries()].sort(([a], [b]) => (a < b ? -1 : 1)).map(([currency, t]) => ({ currency, ...t })),
    withStress: stress !== null,
  };
}

function round2(v: number): number {
  return Math.round(v * 100) / 100;
}

function money(v: number | null): string {
  return v === null ? '' : v.toFixed(2);
}

/** Text of a row's worst stress, e.g. "PIV 1.21 kV of 800 V allowed (D3)". */
export function stressText(s: RowStress): string {
  return `${CHECK_WORDS[s.quantity]} ${formatSi(s.actual, s.unit)} of ${formatSi(s.allowed, s.unit)} allowed (${s.designator})`;
}

/** The CSV header of a BOM (stress columns only when the BOM has a solve). */
export function bomHeader(withStress: boolean): string[] {
  return [
    'Designators',
    'Quantity',
    'Kind',
    'Part number',
    'Maker',
    'Value',
    'Tolerance',
    'Ratings',
    ...(withStress ? ['Worst stress', 'Margin'] : []),
    'Unit cost',
    'Line cost',
    'Currency',
  ];
}

/**
 * The BOM as RFC 4180 CSV: a header row, one row per part, then a total row ("Total", the
 * quantity, the cost when one currency) and, with several currencies, one "Total <currency>"
 * row each. Margins are fractions with three decimals (0.250 = 25 % below the derated limit).
 */
export function bomCsv(bom: Bom): string {
  const width = bomHeader(bom.withStress).length;
  const records: Array<Array<string | number | null>> = [bomHeader(bom.withStress)];
  for (const r of bom.rows) {
    records.push([
      r.designators.join(' '),
      r.quantity,
      r.kind,
      r.partNumber,
      r.maker,
      r.value,
      r.tolerance,
      r.ratings,
      ...(bom.withStress ? [r.stress ? stressText(r.stress) : 'unrated', r.stress ? r.stress.margin.toFixed(3) : ''] : []),
      money(r.unitCost),
      money(r.lineCost),
      r.currency,
    ]);
  }
  const blank = (n: number) => Array.from({ length: n }, () => '');
  const single = bom.totals.length === 1 ? bom.totals[0] : null;
  const total = ['Total', bom.totalQuantity, ...blank(width - 4), single ? money(single.cost) : '', single ? single.currency : ''];
  records.push(total);
  if (bom.totals.length > 1) for (const t of bom.totals) records.push([`Total ${t.currency}`, '', ...blank(width - 4), money(t.cost), t.currency]);
  return csvText(records);
}
