/**
 * Bench data against the real database and the S3 fake: a good file is stored (row and raw
 * file) and compared with the model; a broken file answers 422 with every line and reason; a
 * wrong type, an oversize file, a missing file or a bad mapping answer 4xx and store nothing
 * (rows and S3 objects counted); viewers and reviewers cannot upload (403), outsiders see
 * nothing (404); the comparison follows `?revision=`; a design whose model cannot be solved at
 * the measured currents gives a reason, not a 500.
 */
import fs from 'node:fs';
import path from 'node:path';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as bench from '@/app/api/designs/[designId]/bench/route';
import * as inspect from '@/app/api/designs/[designId]/bench/inspect/route';
import * as dataset from '@/app/api/bench/[datasetId]/route';
import * as datasetFile from '@/app/api/bench/[datasetId]/file/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import { createDesign } from '@/lib/data/designs';
import { DEMO_BENCH_ID, seedBench } from '@/scripts/seed-bench';
import { modelLoadCurve, solveOutput } from '@/lib/bench/model';
import { PeriodicWave } from '@/lib/bench/compare';
import type { BenchDatasetDto, BenchDetailDto, BenchInspectDto } from '@/lib/bench/types';
import type { DesignDocument } from '@/lib/circuit';
import { db } from '@/lib/db';
import { env } from '@/lib/env';
import { storageClient } from '@/lib/storage';
import { call, sampleDocument, setupFixtures, teardown, type Fixtures, type FixtureUser, type Who } from './helpers';

let f: Fixtures;
beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

const fixture = (name: string) => fs.readFileSync(path.join(__dirname, '../fixtures/bench', name));
type ErrorBody = { error?: { code: string; message: string; field?: string; lines?: { line: number; reason: string }[] } };

const LOAD_MAPPING = { kind: 'loadCurve', xColumn: 0, yColumn: 1, xScale: 1e-3, yScale: 1e3 };

async function newDesign(author: Who = 'designer', document: DesignDocument = sampleDocument()): Promise<string> {
  const { design } = await createDesign(f.users[author].id, f.teamId, { title: `Bench ${Math.random().toString(36).slice(2, 7)}`, visibility: 'team', document });
  return design.id;
}

function form(file: Uint8Array | null, fields: Record<string, string> = {}, fileName = 'bench.csv', type = 'text/csv'): FormData {
  const fd = new FormData();
  if (file) fd.set('file', new File([file as BlobPart], fileName, { type }));
  for (const [k, v] of Object.entries(fields)) fd.set(k, v);
  return fd;
}

function upload(designId: string, as: FixtureUser | null, body: FormData | string, contentType?: string) {
  return call<{ dataset: BenchDatasetDto } & ErrorBody>(bench.POST, `/api/designs/${designId}/bench`, { method: 'POST', params: { designId }, as, body, contentType });
}

async function stored(designId: string): Promise<{ rows: number; objects: number }> {
  const rows = await db().models.BenchDataset.count({ where: { designId } });
  const out = await storageClient().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `bench/${designId}/` }));
  return { rows, objects: out.KeyCount ?? 0 };
}

describe('upload, list, compare, download, delete', () => {
  it('stores a good load curve and compares it with the model at each measured current', async () => {
    const designId = await newDesign();
    const bytes = fixture('load-curve-good.csv');
    const up = await upload(designId, f.users.designer, form(bytes, { mapping: JSON.stringify(LOAD_MAPPING), name: 'Bench run 1', notes: 'HV divider 1000:1' }));
    expect(up.status).toBe(201);
    expect(up.body.dataset).toMatchObject({ designId, revision: 1, kind: 'loadCurve', name: 'Bench run 1', notes: 'HV divider 1000:1', pointCount: 5, fileName: 'bench.csv', fileBytes: bytes.byteLength, canDelete: true });
    expect(await stored(designId)).toEqual({ rows: 1, objects: 1 });
    const id = up.body.dataset.id;

    // the viewer lists and reads it
    const list = await call<{ datasets: BenchDatasetDto[] }>(bench.GET, `/api/designs/${designId}/bench`, { params: { designId }, as: f.users.viewer });
    expect(list.status).toBe(200);
    expect(list.body.datasets.map((d) => [d.id, d.canDelete])).toEqual([[id, false]]);
    const got = await call<BenchDetailDto>(dataset.GET, `/api/bench/${id}`, { params: { datasetId: id }, as: f.users.viewer });
    expect(got.status).toBe(200);
    expect(got.body.revision).toBe(1);
    expect(got.body.points[0]).toEqual({ line: 2, x: 0, y: 11950 });
    const c = got.body.comparison;
    expect(c.ok).toBe(true);
    if (!c.ok || c.kind !== 'loadCurve') throw new Error('no load-curve comparison');
    expect(c.exact).toBe(true);
    // the model at the same currents, solved here directly
    const model = modelLoadCurve(sampleDocument(), [0, 5e-5, 1e-4, 2e-4, 3e-4]);
    if (!model.ok) throw new Error(model.reason);
    c.points.forEach((p, k) => {
      expect(p.model).toBeCloseTo(model.curve[k].y, 6);
      expect(p.errorV).toBeCloseTo(p.measured - model.curve[k].y, 6);
      expect(p.errorPct as number).toBeCloseTo((100 * p.errorV) / model.curve[k].y, 6);
    });
    // the invented measurements sit 0.4–1.0 % below the model (worst at 0.3 mA: 11 840 V against 11 962 V)
    expect(c.summary.maxAbsErrorPct as number).toBeCloseTo(1.02, 1);
    expect(c.points.every((p) => p.errorV < 0)).toBe(true);

    // the raw file comes back as uploaded, as an attachment
    const file = await call(datasetFile.GET, `/api/bench/${id}/file`, { params: { datasetId: id }, as: f.users.reviewer });
    expect(file.status).toBe(200);
    expect(Buffer.from(file.raw).equals(bytes)).toBe(true);
    expect(file.headers.get('content-disposition')).toMatch(/^attachment; filename="bench.csv"/);
    expect(file.headers.get('x-content-type-options')).toBe('nosniff');

    // the viewer cannot delete; the designer can, and the row and the file go
    const no = await call<ErrorBody>(dataset.DELETE, `/api/bench/${id}`, { method: 'DELETE', params: { datasetId: id }, as: f.users.viewer });
    expect(no.status).toBe(403);
    expect(await stored(designId)).toEqual({ rows: 1, objects: 1 });
    const del = await call(dataset.DELETE, `/api/bench/${id}`, { method: 'DELETE', params: { datasetId: id }, as: f.users.designer });
    expect(del.status).toBe(200);
    expect(await stored(designId)).toEqual({ rows: 0, objects: 0 });
    expect((await call(dataset.GET, `/api/bench/${id}`, { params: { datasetId: id }, as: f.users.designer })).status).toBe(404);
  });

  it('inspects a file without storing anything', async () => {
    const designId = await newDesign();
    const r = await call<{ inspect: BenchInspectDto }>(inspect.POST, `/api/designs/${designId}/bench/inspect`, { method: 'POST', params: { designId }, as: f.users.owner, body: form(fixture('load-curve-semicolon.csv'), {}, 'log.csv') });
    expect(r.status).toBe(200);
    expect(r.body.inspect).toMatchObject({ fileName: 'log.csv', delimiter: ';', decimalComma: true, headerLines: [2], rowCount: 7 });
    expect(r.body.inspect.columns.map((c) => c.name)).toEqual(['Load current [uA]', 'Output [V]']);
    expect(r.body.inspect.suggested).toMatchObject({ kind: 'loadCurve', xColumn: 0, yColumn: 1, yScale: 1 });
    expect(await stored(designId)).toEqual({ rows: 0, objects: 0 });
  });

  it('compares with the revision asked for, and refuses one that does not exist', async () => {
    const designId = await newDesign();
    const up = await upload(designId, f.users.designer, form(fixture('load-curve-good.csv'), { mapping: JSON.stringify(LOAD_MAPPING), name: 'r1 run' }));
    const id = up.body.dataset.id;
    const saved = await call(revisions.POST, `/api/designs/${designId}/revisions`, { method: 'POST', params: { designId }, as: f.users.designer, body: { baseRevision: 1, document: sampleDocument(2.2e-9), message: 'smaller C' } });
    expect(saved.status).toBe(201);
    const r1 = await call<BenchDetailDto>(dataset.GET, `/api/bench/${id}`, { params: { datasetId: id }, as: f.users.designer });
    const r2 = await call<BenchDetailDto>(dataset.GET, `/api/bench/${id}`, { params: { datasetId: id }, as: f.users.designer, query: { revision: '2' } });
    expect(r2.status).toBe(200);
    expect(r2.body.revision).toBe(2);
    expect(r2.body.latestRevision).toBe(2);
    if (!r1.body.comparison.ok || !r2.body.comparison.ok || r2.body.comparison.kind !== 'loadCurve' || r1.body.comparison.kind !== 'loadCurve') throw new Error('no comparison');
    // smaller capacitors: a steeper model slope (more droop per mA)
    expect(r2.body.comparison.summary.modelSlopeOhm as number).toBeGreaterThan(2 * (r1.body.comparison.summary.modelSlopeOhm as number));
    const bad = await call<ErrorBody>(dataset.GET, `/api/bench/${id}`, { params: { datasetId: id }, as: f.users.designer, query: { revision: '9' } });
    expect(bad.status).toBe(422);
    expect(bad.body.error?.field).toBe('revision');
  });

  it('compares a ripple capture after removing the mean and aligning the phase', async () => {
    const doc = sampleDocument();
    const designId = await newDesign('owner', doc);
    const out = solveOutput(doc, 20_000, 400);
    if (!out.ok || !out.wave) throw new Error('no waveform');
    const wave = new PeriodicWave(out.wave, out.periodS);
    // 3 periods at 250 samples a period, in µs and kV, tab-separated, phase 0.6 T, 40 V probe offset
    const rows = Array.from({ length: 750 }, (_, k) => {
      const t = (k * out.periodS) / 250;
      return `${(t * 1e6).toFixed(4)}\t${((wave.at(t + 0.6 * out.periodS) + 40) / 1e3).toFixed(7)}`;
    });
    const text = `t (us)\tCH1 [kV]\n${rows.join('\n')}\n`;
    const ins = await call<{ inspect: BenchInspectDto }>(inspect.POST, `/api/designs/${designId}/bench/inspect`, { method: 'POST', params: { designId }, as: f.users.owner, body: form(new TextEncoder().encode(text), {}, 'scope.tsv', 'text/tab-separated-values') });
    expect(ins.body.inspect.suggested).toMatchObject({ kind: 'ripple', xColumn: 0, yColumn: 1, yScale: 1e3 });
    const up = await upload(designId, f.users.owner, form(new TextEncoder().encode(text), { mapping: JSON.stringify(ins.body.inspect.suggested), name: 'Scope capture' }, 'scope.tsv', 'text/tab-separated-values'));
    expect(up.status).toBe(201);
    const got = await call<BenchDetailDto>(dataset.GET, `/api/bench/${up.body.dataset.id}`, { params: { datasetId: up.body.dataset.id }, as: f.users.viewer });
    const c = got.body.comparison;
    if (!c.ok || c.kind !== 'ripple') throw new Error(c.ok ? 'wrong kind' : c.reason);
    // kV with 7 decimals rounds to 0.1 mV; the capture is the model itself
    expect(c.summary.rmsErrorV).toBeLessThan(0.01 * c.summary.modelPpV);
    expect(c.summary.measuredMeanV - c.summary.modelMeanV).toBeCloseTo(40, 0);
    expect(c.points).toHaveLength(750);
  });

  it('gives the reason when the model cannot be solved at the measured currents (no load block), not a 500', async () => {
    const doc = sampleDocument();
    const noLoad = { ...doc, blocks: doc.blocks.filter((b) => b.kind !== 'load'), wires: doc.wires.filter((w) => w.source !== 'load' && w.target !== 'load') };
    const designId = await newDesign('designer', noLoad);
    const up = await upload(designId, f.users.designer, form(fixture('load-curve-good.csv'), { mapping: JSON.stringify(LOAD_MAPPING), name: 'No load' }));
    expect(up.status).toBe(201);
    const got = await call<BenchDetailDto>(dataset.GET, `/api/bench/${up.body.dataset.id}`, { params: { datasetId: up.body.dataset.id }, as: f.users.designer });
    expect(got.status).toBe(200);
    expect(got.body.comparison).toEqual({ ok: false, reason: expect.stringMatching(/no load block/) });
  });
});

describe('bad uploads store nothing', () => {
  let designId: string;
  beforeAll(async () => {
    designId = await newDesign();
  });
  const fields = () => ({ mapping: JSON.stringify(LOAD_MAPPING), name: 'x' });

  it('a broken file: 422 with every line and reason', async () => {
    const r = await upload(designId, f.users.designer, form(fixture('load-curve-broken.csv'), fields()));
    expect(r.status).toBe(422);
    expect(r.body.error).toEqual({
      code: 'invalid',
      field: 'file',
      message: 'line 4: "eleven" in column "Vout (kV)" is not a number',
      lines: [
        { line: 4, reason: '"eleven" in column "Vout (kV)" is not a number' },
        { line: 6, reason: 'missing cell in column "Vout (kV)" (the line has 1 cell)' },
      ],
    });
    const ins = await call<ErrorBody>(inspect.POST, `/api/designs/${designId}/bench/inspect`, { method: 'POST', params: { designId }, as: f.users.designer, body: form(new TextEncoder().encode('# nothing\n')) });
    expect(ins.status).toBe(422);
    expect(ins.body.error?.lines).toEqual([{ line: 1, reason: expect.stringMatching(/no data lines/) }]);
    expect(await stored(designId)).toEqual({ rows: 0, objects: 0 });
  });

  it('not multipart 415, not text 415, too large 413, no file 422, bad mapping or name 422', async () => {
    expect((await upload(designId, f.users.designer, JSON.stringify({ file: 'x' }), 'application/json')).status).toBe(415);
    const png = await upload(designId, f.users.designer, form(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0, 0, 1]), fields(), 'x.png', 'image/png'));
    expect(png.status).toBe(415);
    const binary = await upload(designId, f.users.designer, form(new Uint8Array([0x31, 0x2c, 0, 0x32]), fields()));
    expect(binary.status).toBe(415);
    const big = new Uint8Array(2 * 1024 * 1024 + 1).fill(0x31);
    expect((await upload(designId, f.users.designer, form(big, fields()))).status).toBe(413);
    const none = await upload(designId, f.users.designer, form(null, fields()));
    expect(none.status).toBe(422);
    expect(none.body.error?.field).toBe('file');
    const good = fixture('load-curve-good.csv');
    for (const [extra, field] of [
      [{ mapping: '{not json' }, 'mapping'],
      [{ mapping: JSON.stringify({ ...LOAD_MAPPING, yColumn: 0 }) }, 'mapping'],
      [{ mapping: JSON.stringify({ ...LOAD_MAPPING, xScale: -1 }) }, 'mapping'],
      [{ name: '   ' }, 'name'],
      [{ revision: '7' }, 'revision'],
    ] as const) {
      const r = await upload(designId, f.users.designer, form(good, { ...fields(), ...extra }));
      expect(r.status, JSON.stringify(extra)).toBe(422);
      expect(r.body.error?.field).toBe(field);
    }
    const missingMapping = await upload(designId, f.users.designer, form(good, { name: 'x' }));
    expect(missingMapping.body.error?.field).toBe('mapping');
    // a mapping past the file's columns is a file problem with its line
    const wide = await upload(designId, f.users.designer, form(good, { ...fields(), mapping: JSON.stringify({ ...LOAD_MAPPING, yColumn: 5 }) }));
    expect(wide.status).toBe(422);
    expect(wide.body.error?.lines?.[0].line).toBe(1);
    expect(await stored(designId)).toEqual({ rows: 0, objects: 0 });
  });

  it('more than 20 000 rows: 422 naming the first line past the limit; an archived design: 409', async () => {
    const rows = Array.from({ length: 20_001 }, (_, k) => `${(k * 1e-5).toFixed(5)},11.9`).join('\n');
    const r = await upload(designId, f.users.designer, form(new TextEncoder().encode(`I (mA),Vout (kV)\n${rows}\n`), fields()));
    expect(r.status).toBe(422);
    expect(r.body.error?.lines).toEqual([{ line: 20_002, reason: expect.stringMatching(/more than 20 000 data rows/) }]);
    const archived = await newDesign();
    await db().models.Design.update({ archivedAt: new Date() }, { where: { id: archived } });
    const a = await upload(archived, f.users.owner, form(fixture('load-curve-good.csv'), fields()));
    expect(a.status).toBe(409);
    expect(await stored(designId)).toEqual({ rows: 0, objects: 0 });
    expect(await stored(archived)).toEqual({ rows: 0, objects: 0 });
  });

  it('roles: reviewer and viewer 403, outsider 404, signed out 401 — and nothing stored', async () => {
    for (const [who, status] of [['reviewer', 403], ['viewer', 403], ['outsider', 404]] as const) {
      expect((await upload(designId, f.users[who], form(fixture('load-curve-good.csv'), fields()))).status).toBe(status);
    }
    expect((await upload(designId, null, form(fixture('load-curve-good.csv'), fields()))).status).toBe(401);
    expect(await stored(designId)).toEqual({ rows: 0, objects: 0 });
    const list = await call<ErrorBody>(bench.GET, `/api/designs/${designId}/bench`, { params: { designId }, as: f.users.outsider });
    expect(list.status).toBe(404);
  });

  it('an outsider cannot read, download or delete a dataset; a private design hides its datasets from teammates', async () => {
    const privateDesign = (await createDesign(f.users.designer.id, f.teamId, { title: 'Private bench', visibility: 'private', document: sampleDocument() })).design.id;
    const up = await upload(privateDesign, f.users.designer, form(fixture('load-curve-good.csv'), fields()));
    expect(up.status).toBe(201);
    const id = up.body.dataset.id;
    for (const who of ['outsider', 'owner', 'viewer'] as const) {
      expect((await call(dataset.GET, `/api/bench/${id}`, { params: { datasetId: id }, as: f.users[who] })).status).toBe(404);
      expect((await call(datasetFile.GET, `/api/bench/${id}/file`, { params: { datasetId: id }, as: f.users[who] })).status).toBe(404);
      expect((await call(dataset.DELETE, `/api/bench/${id}`, { method: 'DELETE', params: { datasetId: id }, as: f.users[who] })).status).toBe(404);
    }
    expect(await stored(privateDesign)).toEqual({ rows: 1, objects: 1 });
  });
});

describe('demo bench data (scripts/seed-bench.ts)', () => {
  it('adds one invented load curve once, marked as invented, that reads and compares', async () => {
    const designId = await newDesign();
    const seedOnce = () => db().sequelize.transaction((t) => seedBench(t, { designId, revision: 1, uploadedById: f.users.designer.id }));
    expect(await seedOnce()).toBe(1);
    expect(await seedOnce()).toBe(0);
    expect(await stored(designId)).toEqual({ rows: 1, objects: 1 });
    const got = await call<BenchDetailDto>(dataset.GET, `/api/bench/${DEMO_BENCH_ID}`, { params: { datasetId: DEMO_BENCH_ID }, as: f.users.viewer });
    expect(got.status).toBe(200);
    expect(got.body.dataset.name).toMatch(/invented demo data/);
    expect(got.body.dataset.notes).toMatch(/not a measurement/);
    expect(got.body.points).toHaveLength(7);
    expect(got.body.comparison.ok).toBe(true);
  });
});
