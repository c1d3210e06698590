/**
 * Exports of a stored revision against the real database: the BOM of a demo-like 3-stage
 * half-wave ladder (6 capacitors C1–C6 and 6 diodes D1–D6, counted by hand from the drawing, the
 * designators the same as lib/circuit/document/designators.ts gives), the netlist read back by the
 * project's parser and solving to the same element set, the design JSON equal to the stored
 * document, and the report PDF (%PDF, and pdftotext from Debian's poppler-utils finds the section
 * headings, the tables' designators, the cautions and the approval record). Viewer downloads,
 * outsider 404, a private design only for its author, an unknown format 422, download headers.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as exportRoute from '@/app/api/designs/[designId]/revisions/[number]/export/route';
import { compileDocument, designDocumentSchema, halfWaveStarter, parseNetlist, type DesignDocument } from '@/lib/circuit';
import { designateParts } from '@/lib/circuit/document/designators';
import { createDesign, saveRevision } from '@/lib/data/designs';
import { createPart, setPartsPolicy } from '@/lib/data/parts';
import { decideReview, requestReview } from '@/lib/data/reviews';
import { bindCapacitor, bindDiode } from '@/lib/parts/binding';
import { partInputSchema } from '@/lib/parts/schema';
import { call, setupFixtures, teardown, type Fixtures, type FixtureUser } from './helpers';

let f: Fixtures;
let designId: string;
let doc: DesignDocument;

/** The demo "detector bias" ladder: 3 half-wave stages from 250 V peak at 50 kHz, 10 nF / 630 V, a 1 kV rectifier. */
function biasLadder(stages = 3): DesignDocument {
  const d = halfWaveStarter(stages, {
    amplitudeV: 250,
    frequencyHz: 50_000,
    capacitanceF: 10e-9,
    capacitorRatedV: 630,
    diode: { model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 }, ratedPivV: 1000, ratedAvgCurrentA: 1, partId: 'generic-rect-1k' },
    loadCurrentA: 100e-6,
  });
  d.settings.requirement = { outputV: 1500, loadCurrentA: 100e-6, maxRippleFraction: 0.01 };
  d.settings.bleederOhm = 1e9;
  return designDocumentSchema.parse(d);
}

const path1 = (id: string, n: number | string) => `/api/designs/${id}/revisions/${n}/export`;
const get = (as: FixtureUser | null, format: string, id = designId, n: number | string = 1) =>
  call(exportRoute.GET, `${path1(id, n)}?format=${encodeURIComponent(format)}`, { params: { designId: id, number: String(n) }, as });

function csvRows(raw: Uint8Array): string[][] {
  const text = new TextDecoder().decode(raw);
  const parsed = Papa.parse<string[]>(text.replace(/\r\n$/, ''), { newline: '\r\n' });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
}

beforeAll(async () => {
  f = await setupFixtures();
  doc = biasLadder();
  const created = await createDesign(f.users.designer.id, f.teamId, { title: '1.5 kV detector bias ladder', visibility: 'team', document: doc });
  designId = created.design.id;
});
afterAll(teardown);

describe('BOM', () => {
  it('groups the 3-stage ladder into 6 capacitors and 6 diodes with the designators of designators.ts', async () => {
    const res = await get(f.users.viewer, 'bom');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.headers.get('content-disposition')).toContain('1-5-kv-detector-bias-ladder-r1-bom.csv');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    const rows = csvRows(res.raw);
    const header = rows[0];
    expect(header).toEqual(['Designators', 'Quantity', 'Kind', 'Part number', 'Maker', 'Value', 'Tolerance', 'Ratings', 'Worst stress', 'Margin', 'Unit cost', 'Line cost', 'Currency']);
    const body = rows.slice(1, -1);
    expect(body).toHaveLength(2);
    const col = (name: string) => header.indexOf(name);
    const [caps, diodes] = body;
    // counted by hand: 3 stages × (pumping C + smoothing C) and 3 stages × (diode A + diode B)
    expect(caps[col('Designators')]).toBe('C1 C2 C3 C4 C5 C6');
    expect(caps[col('Quantity')]).toBe('6');
    expect(caps[col('Part number')]).toBe('unbound');
    expect(caps[col('Value')]).toBe('10 nF');
    expect(caps[col('Ratings')]).toBe('630 V DC');
    expect(diodes[col('Designators')]).toBe('D1 D2 D3 D4 D5 D6');
    expect(diodes[col('Quantity')]).toBe('6');
    // bound, but not a part of the team library: the id stays as the part number
    expect(diodes[col('Part number')]).toBe('generic-rect-1k');
    expect(diodes[col('Ratings')]).toBe('PIV 1 kV / IF(AV) 1 A');
    // the designators agree with the pure rule
    const expected = designateParts(doc).map((p) => p.designator);
    expect([...caps[0].split(' '), ...diodes[0].split(' ')]).toEqual(expected);
    // stress from the solve: each stage's capacitors see about 2 Vp = 500 V (Kind & Kuffel, High Voltage Engineering, 2nd ed., §2.2.2, from memory), 630 V × 0.8 = 504 V allowed
    const capMargin = Number(caps[col('Margin')]);
    expect(capMargin).toBeGreaterThan(0);
    expect(capMargin).toBeLessThan(0.05);
    expect(caps[col('Worst stress')]).toMatch(/^V 49\d V of 504 V allowed \(C\d\)$/);
    // PIV of each diode ≈ 2 Vp = 500 V against 0.8 × 1 kV = 800 V: margin ≈ 0.375
    expect(Number(diodes[col('Margin')])).toBeCloseTo(0.375, 1);
    const total = rows[rows.length - 1];
    expect(total[0]).toBe('Total');
    expect(total[1]).toBe('12');
    expect(total).toHaveLength(header.length);
  });

  it('a 4-stage revision has 8 + 8 parts', async () => {
    await saveRevision(f.users.designer.id, designId, { baseRevision: 1, document: biasLadder(4), message: 'Stage added' });
    const rows = csvRows((await get(f.users.reviewer, 'bom', designId, 2)).raw);
    expect(rows[1][0]).toBe('C1 C2 C3 C4 C5 C6 C7 C8');
    expect(rows[2][0]).toBe('D1 D2 D3 D4 D5 D6 D7 D8');
    expect(rows[rows.length - 1][1]).toBe('16');
  });
});

describe('netlist and JSON', () => {
  it('the netlist reads back with the project parser, with designator comments and the caution', async () => {
    const res = await get(f.users.viewer, 'netlist');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/plain; charset=utf-8');
    expect(res.headers.get('content-disposition')).toContain('-r1-netlist.cir');
    const text = new TextDecoder().decode(res.raw);
    expect(text.split('\n')[0]).toBe('1.5 kV detector bias ladder r1');
    expect(text).toContain('CAUTION: high voltage');
    expect(text).toMatch(/^\* C1 = \S+ \(Stage 1 · pumpC\)$/m);
    expect(text).toMatch(/^\* D6 = \S+ \(Stage 3 · diodeB\)$/m);
    const parsed = parseNetlist(text);
    expect(parsed.ok).toBe(true);
    const compiled = compileDocument(doc);
    if (!parsed.ok || !compiled.ok) throw new Error('unreachable');
    expect(parsed.netlist.elements.map((e) => e.name).sort()).toEqual(compiled.netlist.elements.map((e) => e.name).sort());
  });

  it('the design JSON parses back to the stored document', async () => {
    const res = await get(f.users.owner, 'json');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/json');
    expect(res.headers.get('content-disposition')).toContain('-r1-design.json');
    const text = new TextDecoder().decode(res.raw);
    expect(text).toContain('\n  "schemaVersion": 1');
    expect(designDocumentSchema.parse(JSON.parse(text))).toEqual(doc);
  });
});

describe('report PDF', () => {
  it('has the sections, the tables with their designators, the cautions and the approval record', async () => {
    const review = await requestReview(f.users.designer.id, designId, { revision: 1, reviewerIds: [f.users.reviewer.id] });
    await decideReview(f.users.reviewer.id, designId, review.review.id, { decision: 'approve', note: 'Checked the margins' });
    const res = await get(f.users.viewer, 'pdf');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    expect(res.headers.get('content-disposition')).toContain('1-5-kv-detector-bias-ladder-r1-report.pdf');
    expect(new TextDecoder().decode(res.raw.subarray(0, 5))).toBe('%PDF-');
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kr-report-'));
    const file = path.join(dir, 'report.pdf');
    fs.writeFileSync(file, res.raw);
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    fs.rmSync(dir, { recursive: true, force: true });
    for (const heading of ['Drawing', 'Requirement vs result', 'Per-node readings', 'Per-part stress', 'Waveforms', 'Safety', 'Revision and approval record']) expect(text).toContain(heading);
    expect(text).toMatch(/Team\s+Fixture Team\n/);
    expect(text).toContain('Half-wave · 3 stages');
    // per-part table: every designator with its derated limit (0.8 × 630 V, 0.8 × 1 kV)
    for (const d of ['C1', 'C6', 'D1', 'D6']) expect(text).toMatch(new RegExp(`^\\s*${d}\\s+Stage`, 'm'));
    expect(text).toMatch(/C1\s+Stage 1 · pumping C\s+voltage\s+\S+ V\s+630 V\s+504 V/);
    expect(text).toMatch(/D1\s+Stage 1 · diode A \(generic-rect-1k\)\s+PIV\s+\S+ V\s+1.00 kV\s+800 V/);
    // per-node table: the output and a column node
    expect(text).toMatch(/Output \+\s+y_s3\s+1\.4\d kV/);
    expect(text).toContain('Stage 1 · smoothing (y1)');
    // requirement: 1.5 kV asked, about 1.49 kV solved (within 5 %)
    expect(text).toMatch(/Output DC\s+1\.50 kV\s+1\.4\d kV\s+PASS/);
    // warm-up and waveform axes with units
    expect(text).toMatch(/Time in the period \(µs\)/);
    expect(text).toMatch(/Time from power-on \((ms|µs|s)\)/);
    // safety and cautions
    expect(text).toContain('Bleeder across the output: 1.00 GOhm');
    expect(text).toMatch(/lethal stored charge/i);
    expect(text).toMatch(/discharge and ground every node/i);
    expect(text).toMatch(/licensed practice/i);
    expect(text).toMatch(/not a safety\s+certificate/i);
    expect(text).toMatch(/Revision r1 was approved by Reviewer/);
  });

  it('a revision that is not approved says so, and a drawing that does not compile still gives a report with the reason', async () => {
    const broken = biasLadder();
    // the drive's hot lead wired to ground: the source is shorted and the drawing does not compile
    broken.wires.push({ id: 'w-short', source: 'src', sourcePort: 'hot', target: 'gnd', targetPort: 'g' });
    await saveRevision(f.users.designer.id, designId, { baseRevision: 2, document: broken, message: 'Drive shorted by mistake' });
    const res = await get(f.users.designer, 'pdf', designId, 3);
    expect(res.status).toBe(200);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kr-report-'));
    fs.writeFileSync(path.join(dir, 'r.pdf'), res.raw);
    const text = execFileSync('pdftotext', [path.join(dir, 'r.pdf'), '-'], { encoding: 'utf8' });
    fs.rmSync(dir, { recursive: true, force: true });
    expect(text).toContain('Revision r3: not approved.');
    expect(text).toMatch(/No results: the drawing does not compile: .*shorted/);
    expect(text).toContain('Per-part stress');
    expect(text).toMatch(/lethal stored charge/i);
    // the BOM of the same revision still lists the parts (without a working solve the stress columns go)
    const bom = csvRows((await get(f.users.viewer, 'bom', designId, 3)).raw);
    expect(bom[0]).not.toContain('Margin');
    expect(bom[1][0]).toBe('C1 C2 C3 C4 C5 C6');
    // and there is no netlist of a drawing that does not compile
    const net = await get(f.users.viewer, 'netlist', designId, 3);
    expect(net.status).toBe(422);
    expect((net.body as { error: { message: string } }).error.message).toMatch(/does not compile/);
  });
});

describe('team parts library and derating policy', () => {
  it('groups by the bound library part with its number, maker and cost, and judges stress at the team policy', async () => {
    const cap = await createPart(f.users.owner.id, f.teamId, partInputSchema.parse({ kind: 'capacitor', partNumber: 'TG-C10N-630', maker: 'Prairie Film, Ltd', unitCost: 0.85, currency: 'EUR', specs: { capacitanceF: 10e-9, tolerance: 0.05, ratedVoltageV: 630, dielectric: 'film-polypropylene' } }));
    const dio = await createPart(f.users.owner.id, f.teamId, partInputSchema.parse({ kind: 'diode', partNumber: 'TG-R1K', maker: 'Quarry Semi', unitCost: 0.12, currency: 'EUR', specs: { ratedPivV: 1000, ratedAvgCurrentA: 1, model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 } } }));
    const d = biasLadder();
    for (const b of d.blocks) {
      if (b.kind !== 'stage') continue;
      b.data.pumpC = bindCapacitor(b.data.pumpC, cap as never);
      b.data.smoothC = bindCapacitor(b.data.smoothC, cap as never);
      b.data.diodeA = bindDiode(b.data.diodeA, dio as never);
    }
    const { design } = await createDesign(f.users.designer.id, f.teamId, { title: 'Library ladder', visibility: 'team', document: d });
    await setPartsPolicy(f.users.owner.id, f.teamId, { deratingFraction: 0.7 });
    const rows = csvRows((await get(f.users.viewer, 'bom', design.id)).raw);
    const h = rows[0];
    const byNumber = Object.fromEntries(rows.slice(1, -1).map((r) => [r[h.indexOf('Part number')], r]));
    expect(byNumber['TG-C10N-630'][h.indexOf('Designators')]).toBe('C1 C2 C3 C4 C5 C6');
    expect(byNumber['TG-C10N-630'][h.indexOf('Maker')]).toBe('Prairie Film, Ltd');
    expect(byNumber['TG-C10N-630'][h.indexOf('Tolerance')]).toBe('±5 %');
    // 6 × 0.85 = 5.10 EUR
    expect(byNumber['TG-C10N-630'][h.indexOf('Line cost')]).toBe('5.10');
    // diode A of each stage bound (D1, D3, D5), diode B still the unbound generic part (D2, D4, D6)
    expect(byNumber['TG-R1K'][h.indexOf('Designators')]).toBe('D1 D3 D5');
    expect(byNumber['TG-R1K'][h.indexOf('Line cost')]).toBe('0.36');
    expect(byNumber['generic-rect-1k'][h.indexOf('Designators')]).toBe('D2 D4 D6');
    // at the team's 0.7: 0.7 × 630 V = 441 V allowed, and a ~498 V stress is over (negative margin)
    expect(byNumber['TG-C10N-630'][h.indexOf('Worst stress')]).toMatch(/of 441 V allowed/);
    expect(Number(byNumber['TG-C10N-630'][h.indexOf('Margin')])).toBeLessThan(0);
    const total = rows[rows.length - 1];
    expect(total.slice(-2)).toEqual(['5.46', 'EUR']);
    // the report's per-part table uses the same policy and names the library part
    const pdf = await get(f.users.viewer, 'pdf', design.id);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kr-report-'));
    fs.writeFileSync(path.join(dir, 'r.pdf'), pdf.raw);
    const text = execFileSync('pdftotext', ['-layout', path.join(dir, 'r.pdf'), '-'], { encoding: 'utf8' });
    fs.rmSync(dir, { recursive: true, force: true });
    expect(text).toMatch(/C1\s+Stage 1 · pumping C \(TG-C10N-630\)\s+voltage\s+2\d\d V\s+630 V\s+441 V\s+\d+\.\d %\s+OK/);
    expect(text).toMatch(/C2\s+Stage 1 · smoothing C \(TG-C10N-630\)\s+voltage\s+4\d\d V\s+630 V\s+441 V\s+-\d+\.\d %\s+OVER/);
    expect(text).toMatch(/70 % of their ratings \(the team's derating policy\)/);
    await setPartsPolicy(f.users.owner.id, f.teamId, { deratingFraction: 0.8 });
  });
});

describe('who may download', () => {
  it('outsiders 404, signed out 401, an unknown revision 404, an unknown format 422', async () => {
    expect((await get(f.users.outsider, 'bom')).status).toBe(404);
    expect((await get(null, 'bom')).status).toBe(401);
    expect((await get(f.users.viewer, 'bom', designId, 99)).status).toBe(404);
    expect((await get(f.users.viewer, 'bom', designId, 'r1')).status).toBe(404);
    const bad = await get(f.users.viewer, 'xlsx');
    expect(bad.status).toBe(422);
    expect((bad.body as { error: { field?: string } }).error.field).toBe('format');
  });

  it('a private design exports for its author only', async () => {
    const { design } = await createDesign(f.users.designer.id, f.teamId, { title: 'Private ladder', visibility: 'private', document: biasLadder() });
    expect((await get(f.users.designer, 'json', design.id)).status).toBe(200);
    expect((await get(f.users.owner, 'json', design.id)).status).toBe(404);
    expect((await get(f.users.viewer, 'json', design.id)).status).toBe(404);
  });
});
