/**
 * The team parts library against the real PostgreSQL and the S3 fake: list with search, kind
 * filter and sort; create with field-named validation errors; 409 for a taken part number
 * (case-insensitive); PATCH replaces the whole part; delete removes the row and its datasheet
 * object; roles (viewer 403, outsider 404, another team's part 404); the CSV import with good and
 * broken rows, a dry run that writes nothing and a failing import that leaves nothing; datasheets
 * checked by their bytes and size with nothing stored on refusal; the owner-only derating policy.
 */
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as teamParts from '@/app/api/teams/[teamId]/parts/route';
import * as partImport from '@/app/api/teams/[teamId]/parts/import/route';
import * as onePart from '@/app/api/parts/[partId]/route';
import * as datasheet from '@/app/api/parts/[partId]/datasheet/route';
import * as policy from '@/app/api/teams/[teamId]/parts-policy/route';
import { db } from '@/lib/db';
import { env } from '@/lib/env';
import { getObject, storageClient } from '@/lib/storage';
import { MAX_DATASHEET_BYTES, type PartDto, type PartImportReport, type PartInputRaw } from '@/lib/parts/schema';
import { addMember, call, setupFixtures, teardown, type Fixtures, type FixtureUser } from './helpers';

let f: Fixtures;
beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

type ErrorBody = { error?: { code: string; message: string; field?: string } };

let seq = 0;
const pn = (tag: string) => `${tag}-${Date.now().toString(36)}-${++seq}`;

function cap(partNumber: string, over: Partial<{ capacitanceF: number; ratedVoltageV: number; maker: string; unitCost: number; description: string }> = {}): PartInputRaw {
  return {
    kind: 'capacitor',
    partNumber,
    description: over.description ?? 'invented test capacitor',
    maker: over.maker ?? 'Fixture Components',
    ...(over.unitCost === undefined ? {} : { unitCost: over.unitCost }),
    specs: { capacitanceF: over.capacitanceF ?? 10e-9, tolerance: 0.1, ratedVoltageV: over.ratedVoltageV ?? 15_000, dielectric: 'ceramic-class1' },
  };
}
function diode(partNumber: string, ratedPivV = 10_000): PartInputRaw {
  return { kind: 'diode', partNumber, maker: 'Fixture Semis', specs: { ratedPivV, ratedAvgCurrentA: 0.05, model: { isA: 1e-12, n: 2.1, rsOhm: 12 } } };
}

async function create(input: PartInputRaw, as: FixtureUser = f.users.designer, teamId = f.teamId): Promise<PartDto> {
  const r = await call<{ part: PartDto }>(teamParts.POST, `/api/teams/${teamId}/parts`, { method: 'POST', params: { teamId }, body: input, as });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.part;
}

async function list(query: Record<string, string> = {}, as: FixtureUser = f.users.viewer): Promise<PartDto[]> {
  const r = await call<{ parts: PartDto[] }>(teamParts.GET, `/api/teams/${f.teamId}/parts`, { params: { teamId: f.teamId }, query, as });
  expect(r.status).toBe(200);
  return r.body.parts;
}

async function partRows(teamId = f.teamId): Promise<number> {
  return db().models.Part.count({ where: { teamId } });
}

async function objectsOf(partId: string): Promise<string[]> {
  const out = await storageClient().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `teams/${f.teamId}/parts/${partId}/` }));
  return (out.Contents ?? []).map((o) => o.Key ?? '');
}

/** A small but real PDF (one empty page), hand-written; its xref offsets are not checked by the server. */
function pdfBytes(tag = 'x'): Uint8Array {
  return new TextEncoder().encode(
    `%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] >> endobj\n% ${tag}\ntrailer << /Root 1 0 R >>\n%%EOF\n`,
  );
}
function form(bytes: Uint8Array | null, name = 'sheet.pdf', type = 'application/pdf'): FormData {
  const fd = new FormData();
  if (bytes) fd.set('file', new File([bytes as BlobPart], name, { type }));
  return fd;
}
async function upload(partId: string, fd: FormData, as: FixtureUser = f.users.designer) {
  return call<{ part: PartDto } & ErrorBody>(datasheet.PUT, `/api/parts/${partId}/datasheet`, { method: 'PUT', params: { partId }, body: fd, as });
}

describe('create, read, list', () => {
  it('creates a part (201) that reads back with its values, and lists it for every member', async () => {
    const number = pn('C-RT');
    const made = await create(cap(number, { unitCost: 1.25 }));
    expect(made).toMatchObject({ kind: 'capacitor', partNumber: number, teamId: f.teamId, unitCost: 1.25, currency: 'EUR', datasheet: null });
    expect(made.specs).toEqual({ capacitanceF: 10e-9, tolerance: 0.1, ratedVoltageV: 15_000, dielectric: 'ceramic-class1' });
    const got = await call<{ part: PartDto }>(onePart.GET, `/api/parts/${made.id}`, { params: { partId: made.id }, as: f.users.reviewer });
    expect(got.status).toBe(200);
    expect(got.body.part).toEqual(made);
    expect((await list()).map((p) => p.id)).toContain(made.id);
  });

  it('names the field of a validation error and stores nothing', async () => {
    const before = await partRows();
    const bad = cap(pn('C-BAD'), { capacitanceF: -1 });
    const r = await call<ErrorBody>(teamParts.POST, `/api/teams/${f.teamId}/parts`, { method: 'POST', params: { teamId: f.teamId }, body: bad, as: f.users.designer });
    expect(r.status).toBe(422);
    expect(r.body.error?.field).toBe('specs.capacitanceF');
    const noNumber = await call<ErrorBody>(teamParts.POST, `/api/teams/${f.teamId}/parts`, { method: 'POST', params: { teamId: f.teamId }, body: { ...cap('x'), partNumber: '' }, as: f.users.designer });
    expect(noNumber.status).toBe(422);
    expect(noNumber.body.error?.field).toBe('partNumber');
    const badKind = await call<ErrorBody>(teamParts.POST, `/api/teams/${f.teamId}/parts`, { method: 'POST', params: { teamId: f.teamId }, body: { ...cap('y'), kind: 'inductor' }, as: f.users.designer });
    expect(badKind.status).toBe(422);
    expect(badKind.body.error?.field).toBe('kind');
    expect(await partRows()).toBe(before);
  });

  it('refuses a part number already in the team (any case) with 409 exists; another team may use it', async () => {
    const number = pn('D-DUP');
    await create(diode(number));
    const r = await call<ErrorBody>(teamParts.POST, `/api/teams/${f.teamId}/parts`, { method: 'POST', params: { teamId: f.teamId }, body: diode(number.toLowerCase()), as: f.users.owner });
    expect(r.status).toBe(409);
    expect(r.body.error).toMatchObject({ code: 'exists', field: 'partNumber' });
    expect(r.body.error?.message).toContain(number.toLowerCase());
    expect(r.body.error?.message).toMatch(/already exists/);
    await create(diode(number), f.users.outsider, f.otherTeamId);
  });

  it('searches part number, description and maker; filters by kind; sorts both ways', async () => {
    const tag = `srch${Date.now().toString(36)}`;
    const a = await create(cap(`${tag}-A`, { unitCost: 3, maker: 'Alder Works' }));
    const b = await create(cap(pn('C-OTHER'), { unitCost: 1, description: `bulk film for ${tag}`, maker: 'Birch Works' }));
    const c = await create({ ...diode(pn('D-OTHER')), maker: `Maker ${tag.toUpperCase()}` });
    const other = await create(cap(pn('C-NOHIT'), { unitCost: 2 }));
    const hits = await list({ q: tag });
    expect(new Set(hits.map((p) => p.id))).toEqual(new Set([a.id, b.id, c.id]));
    expect((await list({ q: tag, kind: 'diode' })).map((p) => p.id)).toEqual([c.id]);
    expect((await list({ kind: 'capacitor' })).every((p) => p.kind === 'capacitor')).toBe(true);
    // LIKE wildcards in q are literal
    expect(await list({ q: '%_%' })).toEqual([]);

    const byCost = (await list({ q: tag, kind: 'capacitor', sort: 'unitCost', dir: 'asc' })).map((p) => p.id);
    expect(byCost).toEqual([b.id, a.id]);
    expect((await list({ q: tag, kind: 'capacitor', sort: 'unitCost', dir: 'desc' })).map((p) => p.id)).toEqual([a.id, b.id]);
    const numbers = (await list({ sort: 'partNumber', dir: 'desc' })).map((p) => p.partNumber.toLowerCase());
    expect(numbers).toEqual([...numbers].sort().reverse());
    const makers = (await list({ q: tag, sort: 'maker' })).map((p) => p.maker);
    expect(makers).toEqual(['Alder Works', 'Birch Works', `Maker ${tag.toUpperCase()}`]);
    expect((await list({ sort: 'updated', dir: 'desc' }))[0].id).toBe(other.id);

    const badSort = await call<ErrorBody>(teamParts.GET, `/api/teams/${f.teamId}/parts`, { params: { teamId: f.teamId }, query: { sort: 'price' }, as: f.users.viewer });
    expect(badSort.status).toBe(422);
    expect(badSort.body.error?.field).toBe('sort');
  });
});

describe('replace and delete', () => {
  it('PATCH replaces the whole part (optional values left out are cleared) and keeps the id', async () => {
    const made = await create(cap(pn('C-PATCH'), { unitCost: 9 }));
    const next = { ...diode(`${made.partNumber}-D`, 12_000), description: 'now a diode' };
    const r = await call<{ part: PartDto }>(onePart.PATCH, `/api/parts/${made.id}`, { method: 'PATCH', params: { partId: made.id }, body: next, as: f.users.owner });
    expect(r.status).toBe(200);
    expect(r.body.part).toMatchObject({ id: made.id, kind: 'diode', partNumber: `${made.partNumber}-D`, description: 'now a diode' });
    expect(r.body.part.unitCost).toBeUndefined();
    expect(r.body.part.specs).toEqual({ ratedPivV: 12_000, ratedAvgCurrentA: 0.05, model: { isA: 1e-12, n: 2.1, rsOhm: 12 } });
    const row = await db().models.Part.findByPk(made.id);
    expect(row?.unitCost).toBeNull();
  });

  it('PATCH to a part number another part has is 409 and changes nothing; the same number (other case) is fine', async () => {
    const one = await create(cap(pn('C-ONE')));
    const two = await create(cap(pn('C-TWO')));
    const r = await call<ErrorBody>(onePart.PATCH, `/api/parts/${two.id}`, { method: 'PATCH', params: { partId: two.id }, body: cap(one.partNumber), as: f.users.designer });
    expect(r.status).toBe(409);
    expect(r.body.error?.code).toBe('exists');
    expect((await db().models.Part.findByPk(two.id))?.partNumber).toBe(two.partNumber);
    const same = await call(onePart.PATCH, `/api/parts/${two.id}`, { method: 'PATCH', params: { partId: two.id }, body: cap(two.partNumber.toLowerCase()), as: f.users.designer });
    expect(same.status).toBe(200);
  });

  it('a bad PATCH body is 422 with the field and changes nothing', async () => {
    const made = await create(cap(pn('C-KEEP')));
    const r = await call<ErrorBody>(onePart.PATCH, `/api/parts/${made.id}`, { method: 'PATCH', params: { partId: made.id }, body: { ...cap(made.partNumber), currency: 'euro' }, as: f.users.designer });
    expect(r.status).toBe(422);
    expect(r.body.error?.field).toBe('currency');
    expect((await db().models.Part.findByPk(made.id))?.currency).toBe('EUR');
  });

  it('DELETE removes the row and its datasheet object, with audit rows for each step', async () => {
    const made = await create(cap(pn('C-DEL')));
    expect((await upload(made.id, form(pdfBytes('del')))).status).toBe(200);
    const keys = await objectsOf(made.id);
    expect(keys).toHaveLength(1);
    const r = await call<{ deleted: boolean }>(onePart.DELETE, `/api/parts/${made.id}`, { method: 'DELETE', params: { partId: made.id }, as: f.users.designer });
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ deleted: true });
    expect(await db().models.Part.findByPk(made.id)).toBeNull();
    expect(await objectsOf(made.id)).toEqual([]);
    expect(await getObject(keys[0])).toBeNull();
    const actions = (await db().models.AuditEvent.findAll({ where: { targetId: made.id }, order: [['id', 'ASC']] })).map((e) => e.action);
    expect(actions).toEqual(['part.created', 'part.datasheet_uploaded', 'part.deleted']);
    const again = await call(onePart.GET, `/api/parts/${made.id}`, { params: { partId: made.id }, as: f.users.owner });
    expect(again.status).toBe(404);
  });
});

describe('roles', () => {
  it('a viewer or reviewer cannot write (403) and nothing changes', async () => {
    const made = await create(cap(pn('C-ROLE')));
    for (const who of [f.users.viewer, f.users.reviewer]) {
      const post = await call<ErrorBody>(teamParts.POST, `/api/teams/${f.teamId}/parts`, { method: 'POST', params: { teamId: f.teamId }, body: cap(pn('C-NO')), as: who });
      expect(post.status).toBe(403);
      const patch = await call(onePart.PATCH, `/api/parts/${made.id}`, { method: 'PATCH', params: { partId: made.id }, body: cap(made.partNumber, { capacitanceF: 1e-6 }), as: who });
      expect(patch.status).toBe(403);
      expect((await call(onePart.DELETE, `/api/parts/${made.id}`, { method: 'DELETE', params: { partId: made.id }, as: who })).status).toBe(403);
      expect((await upload(made.id, form(pdfBytes()), who)).status).toBe(403);
      expect((await call(partImport.POST, `/api/teams/${f.teamId}/parts/import`, { method: 'POST', params: { teamId: f.teamId }, body: { csv: 'kind,part_number\n' }, as: who })).status).toBe(403);
    }
    const row = await db().models.Part.findByPk(made.id);
    expect(row?.specs).toMatchObject({ capacitanceF: 10e-9 });
    expect(row?.datasheetKey).toBeNull();
    expect(await objectsOf(made.id)).toEqual([]);
  });

  it('an outsider gets 404 for the team’s list and its parts; another team’s part is 404 to members', async () => {
    const made = await create(cap(pn('C-HIDE')));
    expect((await call(teamParts.GET, `/api/teams/${f.teamId}/parts`, { params: { teamId: f.teamId }, as: f.users.outsider })).status).toBe(404);
    expect((await call(onePart.GET, `/api/parts/${made.id}`, { params: { partId: made.id }, as: f.users.outsider })).status).toBe(404);
    expect((await call(onePart.DELETE, `/api/parts/${made.id}`, { method: 'DELETE', params: { partId: made.id }, as: f.users.outsider })).status).toBe(404);
    expect((await call(datasheet.GET, `/api/parts/${made.id}/datasheet`, { params: { partId: made.id }, as: f.users.outsider })).status).toBe(404);

    const theirs = await create(cap(pn('C-THEIRS')), f.users.outsider, f.otherTeamId);
    for (const who of [f.users.owner, f.users.designer]) {
      expect((await call(onePart.GET, `/api/parts/${theirs.id}`, { params: { partId: theirs.id }, as: who })).status).toBe(404);
      expect((await call(onePart.PATCH, `/api/parts/${theirs.id}`, { method: 'PATCH', params: { partId: theirs.id }, body: cap(theirs.partNumber), as: who })).status).toBe(404);
      expect((await upload(theirs.id, form(pdfBytes()), who)).status).toBe(404);
    }
    expect((await list({ q: theirs.partNumber })).length).toBe(0);
    expect((await call(onePart.GET, `/api/parts/${theirs.id}`, { params: { partId: theirs.id }, as: null })).status).toBe(401);
  });
});

describe('CSV import', () => {
  const header = 'kind,part_number,description,maker,unit_cost,currency,capacitance,tolerance,rated_voltage,dielectric,rated_piv,avg_current,is,n,rs,resistance,power';
  async function importCsv(csv: string, dryRun?: boolean, as: FixtureUser = f.users.designer) {
    return call<PartImportReport & ErrorBody>(partImport.POST, `/api/teams/${f.teamId}/parts/import`, { method: 'POST', params: { teamId: f.teamId }, body: { csv, ...(dryRun === undefined ? {} : { dryRun }) }, as });
  }

  it('creates the good rows, replaces existing part numbers, and lists the broken rows by line with every reason', async () => {
    const t = `imp${Date.now().toString(36)}`;
    const existing = await create(cap(`${t}-C1`, { capacitanceF: 1e-9 }));
    const csv = [
      header,
      `capacitor,${t}-C1,replaced by import,Import Works,0.80,EUR,4.7nF,±5%,15kV,X7R,,,,,,,`,
      `diode,${t}-D1,HV rectifier,Import Works,1.10,USD,,,,,12kV,50m,2.5e-12,2.4,15,,`,
      `resistor,${t}-R1,bleeder,Import Works,,,,,20kV,,,,,,,100meg,2`,
      `capacitor,${t}-C9,broken,Import Works,,,-3n,5 %,abc,plastic,,,,,,,`,
      `transistor,${t}-Q1,,,,,,,,,,,,,,,`,
      `diode,${t}-D1,again,,,,,,,,12kV,50m,1e-12,2,,,`,
    ].join('\n');
    const before = await partRows();
    const r = await importCsv(csv);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body).toMatchObject({ created: 2, updated: 1, dryRun: false });
    expect(r.body.rejected.map((x) => x.line)).toEqual([5, 6, 7]);
    const c9 = r.body.rejected[0];
    expect(c9.partNumber).toBe(`${t}-C9`);
    expect(c9.reasons.some((m) => m.startsWith('rated_voltage:'))).toBe(true);
    expect(c9.reasons.some((m) => m.startsWith('dielectric:'))).toBe(true);
    expect(r.body.rejected[1].reasons.join(' ')).toMatch(/unknown kind "transistor"/);
    expect(r.body.rejected[2].reasons.join(' ')).toMatch(/also on line 3/);
    expect(await partRows()).toBe(before + 2);
    const replaced = await db().models.Part.findByPk(existing.id);
    expect(replaced?.description).toBe('replaced by import');
    expect(replaced?.specs).toEqual({ capacitanceF: 4.7e-9, tolerance: 0.05, ratedVoltageV: 15_000, dielectric: 'ceramic-class2' });
    const [d1] = await list({ q: `${t}-D1` });
    expect(d1).toMatchObject({ kind: 'diode', currency: 'USD', unitCost: 1.1, specs: { ratedPivV: 12_000, ratedAvgCurrentA: 0.05, model: { isA: 2.5e-12, n: 2.4, rsOhm: 15 } } });
    const [r1] = await list({ q: `${t}-R1` });
    expect(r1.specs).toEqual({ resistanceOhm: 100e6, ratedPowerW: 2, ratedVoltageV: 20_000 });
    const audit = await db().models.AuditEvent.findAll({ where: { teamId: f.teamId, action: 'part.imported' } });
    expect(audit.at(-1)?.summary).toMatchObject({ created: 2, updated: 1, rejected: 3 });
  });

  it('a dry run reports the same counts and writes nothing', async () => {
    const t = `dry${Date.now().toString(36)}`;
    const existing = await create(cap(`${t}-C1`, { capacitanceF: 1e-9 }));
    const csv = `${header}\ncapacitor,${t}-C1,changed,,,,2n,10%,5kV,mica,,,,,,,\ncapacitor,${t}-C2,new,,,,2n,10%,5kV,mica,,,,,,,\ncapacitor,,,,,,,,,,,,,,,,`;
    const before = await partRows();
    const audits = await db().models.AuditEvent.count();
    const dry = await importCsv(csv, true);
    expect(dry.status).toBe(200);
    expect(dry.body).toMatchObject({ created: 1, updated: 1, dryRun: true });
    expect(dry.body.rejected).toHaveLength(1);
    expect(await partRows()).toBe(before);
    expect(await db().models.AuditEvent.count()).toBe(audits);
    expect((await db().models.Part.findByPk(existing.id))?.description).toBe(existing.description);
    const real = await importCsv(csv, false);
    expect(real.body).toMatchObject({ created: 1, updated: 1, dryRun: false });
    expect(await partRows()).toBe(before + 1);
  });

  it('a file that does not read as a whole is 422 naming the problem, and stores nothing', async () => {
    const before = await partRows();
    const unknownColumn = await importCsv('kind,part_number,capacitence\ncapacitor,X1,1n');
    expect(unknownColumn.status).toBe(422);
    expect(unknownColumn.body.error?.message).toMatch(/unknown column "capacitence"/);
    expect(unknownColumn.body.error?.field).toBe('csv');
    const noKind = await importCsv('part_number,capacitance\nX1,1n');
    expect(noKind.status).toBe(422);
    expect(noKind.body.error?.message).toMatch(/"kind"/);
    const tooMany = await importCsv(`kind,part_number,resistance,power,rated_voltage\n${Array.from({ length: 5001 }, (_, i) => `resistor,R${i},1k,1,100`).join('\n')}`);
    expect(tooMany.status).toBe(422);
    expect(tooMany.body.error?.message).toMatch(/at most 5000/);
    const empty = await importCsv('');
    expect(empty.status).toBe(422);
    expect(await partRows()).toBe(before);
  });

  it('a failure part-way through leaves nothing of the import (one transaction)', async () => {
    const t = `fail${Date.now().toString(36)}`;
    const existing = await create(cap(`${t}-C0`, { capacitanceF: 1e-9 }));
    // line 2 replaces the existing part (done first), lines 3–5 are new parts (stored after)
    const rows = [0, 1, 2, 3].map((i) => `capacitor,${t}-C${i},import ${i},,,,${i + 1}n,10%,5kV,mica,,,,,,,`);
    const before = await partRows();
    const audits = await db().models.AuditEvent.count();
    const P = db().models.Part;
    let calls = 0;
    const spy = vi.spyOn(P, 'bulkCreate').mockImplementation((() => {
      calls += 1;
      return Promise.reject(new Error('simulated failure while storing the new parts'));
    }) as unknown as typeof P.bulkCreate);
    const errors = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    try {
      const r = await importCsv([header, ...rows].join('\n'));
      expect(r.status).toBe(500);
    } finally {
      spy.mockRestore();
      errors.mockRestore();
    }
    expect(calls).toBe(1);
    expect(await partRows()).toBe(before);
    expect(await db().models.AuditEvent.count()).toBe(audits);
    // the replacement of line 2 was rolled back with the rest
    expect((await db().models.Part.findByPk(existing.id))?.description).toBe(existing.description);
    expect((await db().models.Part.findByPk(existing.id))?.specs).toMatchObject({ capacitanceF: 1e-9 });
  });

  it('imports the largest file allowed (5000 rows) in one go', async () => {
    const t = `big${Date.now().toString(36)}`;
    const rows = Array.from({ length: 5000 }, (_, i) => `resistor,${t}-R${i},bulk,,,,,,200,,,,,,,${i + 1}k,0.25`);
    const before = await partRows();
    const started = performance.now();
    const r = await importCsv([header, ...rows].join('\n'));
    const ms = performance.now() - started;
    expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBe(200);
    expect(r.body).toMatchObject({ created: 5000, updated: 0, rejected: [] });
    expect(await partRows()).toBe(before + 5000);
    expect(ms).toBeLessThan(20_000);
  });
});

describe('datasheets', () => {
  it('stores a PDF and downloads it byte-identical as an attachment with nosniff; replacing removes the old object', async () => {
    const made = await create(diode(pn('D-SHEET')));
    const bytes = pdfBytes('first');
    const r = await upload(made.id, form(bytes, 'D-sheet rev A.pdf'));
    expect(r.status).toBe(200);
    expect(r.body.part.datasheet).toMatchObject({ fileName: 'D-sheet rev A.pdf', sizeBytes: bytes.byteLength });
    const [key] = await objectsOf(made.id);
    expect(key).toMatch(new RegExp(`^teams/${f.teamId}/parts/${made.id}/datasheet-[0-9a-f-]{36}\\.pdf$`));
    const got = await call(datasheet.GET, `/api/parts/${made.id}/datasheet`, { params: { partId: made.id }, as: f.users.viewer });
    expect(got.status).toBe(200);
    expect(Buffer.from(got.raw).equals(Buffer.from(bytes))).toBe(true);
    expect(got.headers.get('content-type')).toBe('application/pdf');
    expect(got.headers.get('content-disposition')).toMatch(/^attachment; filename="D-sheet rev A\.pdf"/);
    expect(got.headers.get('x-content-type-options')).toBe('nosniff');

    const second = pdfBytes('second version');
    expect((await upload(made.id, form(second, 'rev B.pdf'))).status).toBe(200);
    const keys = await objectsOf(made.id);
    expect(keys).toHaveLength(1);
    expect(keys[0]).not.toBe(key);
    expect(await getObject(key)).toBeNull();
    const again = await call(datasheet.GET, `/api/parts/${made.id}/datasheet`, { params: { partId: made.id }, as: f.users.owner });
    expect(Buffer.from(again.raw).equals(Buffer.from(second))).toBe(true);

    const del = await call<{ part: PartDto }>(datasheet.DELETE, `/api/parts/${made.id}/datasheet`, { method: 'DELETE', params: { partId: made.id }, as: f.users.designer });
    expect(del.status).toBe(200);
    expect(del.body.part.datasheet).toBeNull();
    expect(await objectsOf(made.id)).toEqual([]);
    expect((await call(datasheet.GET, `/api/parts/${made.id}/datasheet`, { params: { partId: made.id }, as: f.users.owner })).status).toBe(404);
    expect((await call(datasheet.DELETE, `/api/parts/${made.id}/datasheet`, { method: 'DELETE', params: { partId: made.id }, as: f.users.owner })).status).toBe(404);
  });

  it('refuses HTML named .pdf (415), an oversize file (413) and a missing file (422), storing nothing; a refused replacement keeps the old sheet', async () => {
    const made = await create(diode(pn('D-REFUSE')));
    const html = new TextEncoder().encode('<!doctype html><script>alert(1)</script>');
    const h = await upload(made.id, form(html, 'sheet.pdf', 'application/pdf'));
    expect(h.status).toBe(415);
    expect(h.body.error?.code).toBe('unsupported_media_type');
    const big = new Uint8Array(MAX_DATASHEET_BYTES + 1);
    big.set(pdfBytes());
    const o = await upload(made.id, form(big));
    expect(o.status).toBe(413);
    const m = await upload(made.id, form(null));
    expect(m.status).toBe(422);
    expect(m.body.error?.field).toBe('file');
    const notForm = await call<ErrorBody>(datasheet.PUT, `/api/parts/${made.id}/datasheet`, { method: 'PUT', params: { partId: made.id }, body: pdfBytes(), contentType: 'application/pdf', as: f.users.designer });
    expect(notForm.status).toBe(415);
    expect(await objectsOf(made.id)).toEqual([]);
    expect((await db().models.Part.findByPk(made.id))?.datasheetKey).toBeNull();

    const good = pdfBytes('kept');
    expect((await upload(made.id, form(good))).status).toBe(200);
    const [key] = await objectsOf(made.id);
    expect((await upload(made.id, form(html, 'evil.pdf'))).status).toBe(415);
    expect(await objectsOf(made.id)).toEqual([key]);
    const got = await call(datasheet.GET, `/api/parts/${made.id}/datasheet`, { params: { partId: made.id }, as: f.users.viewer });
    expect(Buffer.from(got.raw).equals(Buffer.from(good))).toBe(true);
  });
});

describe('derating policy', () => {
  it('every member reads 0.8 by default; only the owner sets it; bad values are 422', async () => {
    for (const who of [f.users.owner, f.users.viewer, f.users.reviewer]) {
      const r = await call<{ policy: { deratingFraction: number } }>(policy.GET, `/api/teams/${f.teamId}/parts-policy`, { params: { teamId: f.teamId }, as: who });
      expect(r.status).toBe(200);
      expect(r.body).toEqual({ policy: { deratingFraction: 0.8 } });
    }
    expect((await call(policy.GET, `/api/teams/${f.teamId}/parts-policy`, { params: { teamId: f.teamId }, as: f.users.outsider })).status).toBe(404);
    for (const who of [f.users.designer, f.users.reviewer, f.users.viewer]) {
      expect((await call(policy.PUT, `/api/teams/${f.teamId}/parts-policy`, { method: 'PUT', params: { teamId: f.teamId }, body: { deratingFraction: 0.5 }, as: who })).status).toBe(403);
    }
    for (const bad of [0, -0.1, 1.01, 'half']) {
      const r = await call<ErrorBody>(policy.PUT, `/api/teams/${f.teamId}/parts-policy`, { method: 'PUT', params: { teamId: f.teamId }, body: { deratingFraction: bad }, as: f.users.owner });
      expect(r.status).toBe(422);
      expect(r.body.error?.field).toBe('deratingFraction');
    }
    const set = await call<{ policy: { deratingFraction: number } }>(policy.PUT, `/api/teams/${f.teamId}/parts-policy`, { method: 'PUT', params: { teamId: f.teamId }, body: { deratingFraction: 0.6 }, as: f.users.owner });
    expect(set.status).toBe(200);
    expect(set.body.policy.deratingFraction).toBe(0.6);
    const read = await call<{ policy: { deratingFraction: number } }>(policy.GET, `/api/teams/${f.teamId}/parts-policy`, { params: { teamId: f.teamId }, as: f.users.designer });
    expect(read.body.policy.deratingFraction).toBe(0.6);
    const other = await call<{ policy: { deratingFraction: number } }>(policy.GET, `/api/teams/${f.otherTeamId}/parts-policy`, { params: { teamId: f.otherTeamId }, as: f.users.outsider });
    expect(other.body.policy.deratingFraction).toBe(0.8);
    const audit = await db().models.AuditEvent.findAll({ where: { teamId: f.teamId, action: 'part.policy_changed' } });
    expect(audit.at(-1)?.summary).toMatchObject({ deratingFraction: 0.6, was: 0.8 });
  });
});

describe('demo seed (scripts/seed-parts.ts)', () => {
  it('creates the invented library once with the parts the e2e relies on, a readable datasheet PDF, and policy 0.8', async () => {
    const { seedParts, demoParts, DEMO_DATASHEET_PART } = await import('@/scripts/seed-parts');
    const team = await db().models.Team.create({ name: 'Seed Check Instruments' });
    await addMember(team.id, f.users.owner.id, 'owner');
    const run = () => db().sequelize.transaction((t) => seedParts(t, { teamId: team.id, createdBy: f.users.designer.id }));
    // fixed ids are global: clear any from an earlier run in this database
    await db().models.Part.destroy({ where: { id: demoParts().map((d) => d.id) } });
    expect(await run()).toBe(demoParts().length);
    expect(await run()).toBe(0);
    const parts = await db().models.Part.findAll({ where: { teamId: team.id } });
    const byKind = (k: string) => parts.filter((p) => p.kind === k).length;
    expect([byKind('capacitor'), byKind('diode'), byKind('resistor')]).toEqual([6, 4, 3]);
    // the bias ladder's own rectifier (1 kV) and a bleeder-grade HV resistor are in the library
    expect(parts.find((p) => p.partNumber === 'TGD-1K0-1A')?.specs).toMatchObject({ ratedPivV: 1000, model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 } });
    expect(parts.some((p) => p.kind === 'resistor' && (p.specs as { resistanceOhm: number; ratedVoltageV: number }).resistanceOhm >= 100e6 && (p.specs as { ratedVoltageV: number }).ratedVoltageV >= 10_000)).toBe(true);
    const sheet = parts.find((p) => p.partNumber === DEMO_DATASHEET_PART)!;
    expect(sheet.datasheetKey).toMatch(new RegExp(`^teams/${team.id}/parts/${sheet.id}/datasheet-[0-9a-f-]{36}\\.pdf$`));
    const got = await call(datasheet.GET, `/api/parts/${sheet.id}/datasheet`, { params: { partId: sheet.id }, as: f.users.owner });
    expect(got.status).toBe(200);
    expect(new TextDecoder().decode(got.raw.subarray(0, 5))).toBe('%PDF-');
    expect(got.raw.byteLength).toBe(sheet.datasheetSize);
    const pol = await call<{ policy: { deratingFraction: number } }>(policy.GET, `/api/teams/${team.id}/parts-policy`, { params: { teamId: team.id }, as: f.users.owner });
    expect(pol.body.policy.deratingFraction).toBe(0.8);
    // the fitted 12 kV stack reproduces the sheet's forward points (4 significant digits kept)
    const { diodeForwardVoltage } = await import('@/lib/circuit/devices/diode-fit');
    const { DEMO_FORWARD_POINTS } = await import('@/scripts/seed-parts');
    const model = (sheet.specs as { model: { isA: number; n: number; rsOhm: number } }).model;
    for (const p of DEMO_FORWARD_POINTS) expect(Math.abs(diodeForwardVoltage(model, p.currentA) - p.voltageV)).toBeLessThan(0.01);
    await db().models.Part.destroy({ where: { teamId: team.id } });
  });
});
