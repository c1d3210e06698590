/**
 * BOM grouping, values, totals and RFC 4180 quoting. The demo-like ladder's rows are counted by
 * hand (3 half-wave stages: 6 capacitors, 6 diodes). CSV rules from RFC 4180 §2 (quotes around
 * fields with a comma, quote or line break; inner quotes doubled; CRLF line ends), read back with
 * papaparse, a parser from outside the project.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { halfWaveStarter, type DesignDocument } from '@/lib/circuit';
import { bomCsv, bomHeader, buildBom, type LibraryPartInfo } from '@/lib/exports/bom';
import { csvField, csvText } from '@/lib/exports/csv';
import type { PartStress } from '@/lib/editor/types';

const O = { amplitudeV: 250, frequencyHz: 50_000, capacitanceF: 10e-9, capacitorRatedV: 630, loadCurrentA: 1e-4 };
const CAP_ID = '11111111-1111-4111-8111-111111111111';
const DIODE_ID = '22222222-2222-4222-8222-222222222222';

function ladder(): DesignDocument {
  const d = halfWaveStarter(3, O);
  for (const b of d.blocks) {
    if (b.kind !== 'stage') continue;
    b.data.diodeA = { ...b.data.diodeA, partId: DIODE_ID };
    b.data.diodeB = { ...b.data.diodeB, partId: DIODE_ID };
  }
  // stage 3's smoothing capacitor is a different, library-bound part
  const s3 = d.blocks.find((b) => b.id === 's3');
  if (s3?.kind === 'stage') s3.data.smoothC = { capacitanceF: 22e-9, ratedVoltageV: 1000, tolerance: 0.1, partId: CAP_ID };
  return d;
}

const LIB = new Map<string, LibraryPartInfo>([
  [CAP_ID, { id: CAP_ID, partNumber: 'TG-C22N-1K', maker: 'Prairie Film, Ltd', unitCost: 1.25, currency: 'EUR' }],
  [DIODE_ID, { id: DIODE_ID, partNumber: 'TG-D1K', maker: 'Quarry "Semi"', unitCost: 0.4, currency: 'EUR' }],
]);

function parse(text: string): string[][] {
  const r = Papa.parse<string[]>(text.replace(/\r\n$/, ''), { newline: '\r\n' });
  expect(r.errors).toEqual([]);
  return r.data;
}

describe('buildBom', () => {
  it('groups by library part when bound and by identical values otherwise', () => {
    const bom = buildBom(ladder(), LIB, null);
    expect(bom.rows.map((r) => [r.designators.join(' '), r.quantity, r.partNumber])).toEqual([
      ['C1 C2 C3 C4 C5', 5, 'unbound'],
      ['C6', 1, 'TG-C22N-1K'],
      ['D1 D2 D3 D4 D5 D6', 6, 'TG-D1K'],
    ]);
    expect(bom.totalQuantity).toBe(12);
    // 1 × 1.25 + 6 × 0.40 = 3.65 EUR
    expect(bom.rows[1].lineCost).toBe(1.25);
    expect(bom.rows[2].lineCost).toBe(2.4);
    expect(bom.totals).toEqual([{ currency: 'EUR', cost: 3.65, pricedLines: 2 }]);
    expect(bom.rows[1].value).toBe('22 nF');
    expect(bom.rows[1].tolerance).toBe('±10 %');
    expect(bom.rows[1].ratings).toBe('1 kV DC');
  });

  it('splits unbound parts whose values differ in anything the solve reads', () => {
    const d = halfWaveStarter(2, O);
    const s2 = d.blocks.find((b) => b.id === 's2');
    if (s2?.kind === 'stage') s2.data.pumpC = { ...s2.data.pumpC, esrOhm: 0.5 };
    const bom = buildBom(d, new Map(), null);
    expect(bom.rows.filter((r) => r.kind === 'capacitor').map((r) => r.designators.join(' '))).toEqual(['C1 C2 C4', 'C3']);
  });

  it('keeps a bound part whose library part is gone, by its id, without a cost', () => {
    const bom = buildBom(ladder(), new Map(), null);
    expect(bom.rows[2].partNumber).toBe(DIODE_ID);
    expect(bom.rows[2].unitCost).toBeNull();
    expect(bom.totals).toEqual([]);
  });

  it('takes the worst stress of a row from the solve, by designator', () => {
    const stress: PartStress[] = [
      { blockId: 's1', role: 'pumpC', element: 'C1', kind: 'C', label: 'Stage 1 · pumping C', checks: [{ quantity: 'voltage', actual: 250, unit: 'V', rating: 630, allowed: 504, margin: (504 - 250) / 504 }], worstMargin: 0.5, status: 'ok' },
      { blockId: 's2', role: 'smoothC', element: 'C2', kind: 'C', label: 'Stage 2 · smoothing C', checks: [{ quantity: 'voltage', actual: 500, unit: 'V', rating: 630, allowed: 504, margin: 4 / 504 }], worstMargin: 4 / 504, status: 'tight' },
    ];
    const bom = buildBom(ladder(), LIB, stress);
    expect(bom.rows[0].stress).toMatchObject({ designator: 'C4', actual: 500, allowed: 504 });
    const rows = parse(bomCsv(bom));
    expect(rows[0]).toEqual(bomHeader(true));
    expect(rows[1][8]).toBe('V 500 V of 504 V allowed (C4)');
    expect(rows[1][9]).toBe('0.008');
    // diodes have no stress entry here: "unrated"
    expect(rows[3][8]).toBe('unrated');
  });

  it('writes several currencies as one total row each', () => {
    const lib = new Map(LIB);
    lib.set(DIODE_ID, { ...LIB.get(DIODE_ID)!, currency: 'USD' });
    const rows = parse(bomCsv(buildBom(ladder(), lib, null)));
    const tail = rows.slice(-3).map((r) => [r[0], r[r.length - 2], r[r.length - 1]]);
    expect(tail).toEqual([
      ['Total', '', ''],
      ['Total EUR', '1.25', 'EUR'],
      ['Total USD', '2.40', 'USD'],
    ]);
  });
});

describe('CSV per RFC 4180', () => {
  it('quotes fields with commas, quotes and line breaks, doubles inner quotes, ends records with CRLF', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvText([['a', 'b'], ['c', 'd']])).toBe('a,b\r\nc,d\r\n');
  });

  it('defuses spreadsheet formulas but keeps negative numbers', () => {
    expect(csvField('=HYPERLINK("x")')).toBe('"\'=HYPERLINK(""x"")"');
    expect(csvField('-0.125')).toBe('-0.125');
    expect(csvField(-0.125)).toBe('-0.125');
  });

  it('a BOM with makers holding commas and quotes reads back field for field', () => {
    const rows = parse(bomCsv(buildBom(ladder(), LIB, null)));
    expect(rows[2][4]).toBe('Prairie Film, Ltd');
    expect(rows[3][4]).toBe('Quarry "Semi"');
    expect(rows.every((r) => r.length === rows[0].length)).toBe(true);
  });
});
