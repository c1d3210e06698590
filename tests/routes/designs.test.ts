/**
 * Design storage against the real database: optimistic concurrency (one winner, the loser
 * loses nothing), bad input never answering 500 nor changing stored data, fork lineage, list
 * filters, archive, and append-only revisions.
 */
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as revision from '@/app/api/designs/[designId]/revisions/[number]/route';
import * as fork from '@/app/api/designs/[designId]/fork/route';
import { MAX_BODY_BYTES, type DesignDetailDto, type DesignSummaryDto, type RevisionDto, type RevisionSummaryDto } from '@/lib/api/contract';
import { halfWaveStarter, symmetricStarter } from '@/lib/circuit/document/starters';
import { db } from '@/lib/db';
import { addMember, call, sampleDocument, setupFixtures, teardown, type Fixtures } from './helpers';

let f: Fixtures;

beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

async function create(title: string, o: { as?: keyof Fixtures['users']; visibility?: 'team' | 'private'; capacitanceF?: number } = {}) {
  const res = await call<{ design: DesignDetailDto; revision: RevisionSummaryDto }>(teamDesigns.POST, `/api/teams/${f.teamId}/designs`, {
    method: 'POST',
    params: { teamId: f.teamId },
    as: f.users[o.as ?? 'designer'],
    body: { title, visibility: o.visibility, document: sampleDocument(o.capacitanceF ?? 10e-9), message: 'start' },
  });
  expect(res.status).toBe(201);
  return res.body.design;
}

function save(designId: string, baseRevision: number, capacitanceF: number, as = f.users.designer) {
  return call<{ revision?: RevisionSummaryDto; error?: { code: string; latestRevision?: number } }>(revisions.POST, `/api/designs/${designId}/revisions`, {
    method: 'POST',
    params: { designId },
    as,
    body: { baseRevision, document: sampleDocument(capacitanceF), message: `C = ${capacitanceF}` },
  });
}

async function getRev(designId: string, n: number) {
  return call<{ revision: RevisionDto }>(revision.GET, `/api/designs/${designId}/revisions/${n}`, { params: { designId, number: String(n) }, as: f.users.viewer });
}

async function snapshot(designId: string) {
  const d = await db().models.Design.findByPk(designId, { raw: true });
  const revs = await db().models.DesignRevision.findAll({ where: { designId }, order: [['number', 'ASC']], raw: true });
  return { d, revs };
}

describe('saving with optimistic concurrency', () => {
  it('two saves on the same base: one 201, one 409, and nothing is lost', async () => {
    const d = await create('Race ladder');
    const winnerDoc = sampleDocument(47e-9);
    const loserDoc = sampleDocument(68e-9);
    const [a, b] = await Promise.all([save(d.id, 1, 47e-9, f.users.designer), save(d.id, 1, 68e-9, f.users.owner)]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([201, 409]);
    const aWon = a.status === 201;
    const [won, lost] = aWon ? [a, b] : [b, a];
    const wonDoc = aWon ? winnerDoc : loserDoc;
    const lostDoc = aWon ? loserDoc : winnerDoc;
    expect(won.body.revision?.number).toBe(2);
    expect(lost.body.error?.code).toBe('conflict');
    expect(lost.body.error?.latestRevision).toBe(2);

    // the database holds exactly revisions 1 and 2, and 2 is the winner's document
    const { d: row, revs } = await snapshot(d.id);
    expect(row?.latestRevision).toBe(2);
    expect(revs.map((r) => r.number)).toEqual([1, 2]);
    expect((await getRev(d.id, 2)).body.revision.document).toEqual(wonDoc);

    // the loser still has its document and can save it on the new base
    const again = await save(d.id, 2, aWon ? 68e-9 : 47e-9, aWon ? f.users.owner : f.users.designer);
    expect(again.status).toBe(201);
    expect(again.body.revision?.number).toBe(3);
    expect((await getRev(d.id, 3)).body.revision.document).toEqual(lostDoc);
    expect((await getRev(d.id, 2)).body.revision.document).toEqual(wonDoc);
    expect((await getRev(d.id, 1)).body.revision.document).toEqual(sampleDocument(10e-9));
  });

  it('six concurrent saves on one base: exactly one wins', async () => {
    const d = await create('Crowded ladder');
    const results = await Promise.all([1, 2, 3, 4, 5, 6].map((k) => save(d.id, 1, k * 1e-9)));
    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    expect(results.filter((r) => r.status === 409)).toHaveLength(5);
    const { revs } = await snapshot(d.id);
    expect(revs.map((r) => r.number)).toEqual([1, 2]);
  });

  it('a stale base after several saves answers 409 with the latest number', async () => {
    const d = await create('Stale ladder');
    expect((await save(d.id, 1, 1e-9)).status).toBe(201);
    expect((await save(d.id, 2, 2e-9)).status).toBe(201);
    const stale = await save(d.id, 2, 3e-9);
    expect(stale.status).toBe(409);
    expect(stale.body.error?.latestRevision).toBe(3);
  });

  it('revisions are append-only: the database refuses an in-place update', async () => {
    const d = await create('Immutable ladder');
    await expect(db().sequelize.query(`UPDATE design_revisions SET message = 'x' WHERE design_id = '${d.id}'`)).rejects.toThrow(/never updated in place/);
  });

  it('the list shows topology and stages from the latest save', async () => {
    const d = await create('Bipolar ladder');
    const res = await call(revisions.POST, `/api/designs/${d.id}/revisions`, {
      method: 'POST',
      params: { designId: d.id },
      as: f.users.designer,
      body: { baseRevision: 1, document: symmetricStarter(4, { amplitudeV: 3000, frequencyHz: 40_000, capacitanceF: 4.7e-9 }) },
    });
    expect(res.status).toBe(201);
    const list = await call<{ designs: DesignSummaryDto[] }>(teamDesigns.GET, `/api/teams/${f.teamId}/designs`, { params: { teamId: f.teamId }, as: f.users.viewer, query: { q: 'Bipolar' } });
    expect(list.body.designs).toHaveLength(1);
    expect(list.body.designs[0]).toMatchObject({ title: 'Bipolar ladder', topology: 'symmetric', stages: 4, latestRevision: 2 });
  });
});

describe('bad input answers 4xx with a message and changes nothing', () => {
  it('malformed JSON, wrong types, wrong content type, oversize bodies, invalid documents, unknown ids', async () => {
    const d = await create('Guarded ladder');
    const before = await snapshot(d.id);
    const path = `/api/designs/${d.id}/revisions`;
    const params = { designId: d.id };
    const as = f.users.designer;
    const bigDoc = { baseRevision: 1, document: sampleDocument(), message: 'x'.repeat(MAX_BODY_BYTES) };
    const brokenDoc = sampleDocument();
    brokenDoc.wires[0] = { ...brokenDoc.wires[0], source: 'nowhere' };
    const probes: { name: string; status: number; field?: string; run: () => ReturnType<typeof call> }[] = [
      { name: 'malformed JSON', status: 400, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: '{"baseRevision": 1, "document": ' }) },
      { name: 'not JSON at all', status: 400, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: '\uD800' }) },
      { name: 'JSON array', status: 422, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: [1, 2] }) },
      { name: 'wrong type', status: 422, field: 'baseRevision', run: () => call(revisions.POST, path, { method: 'POST', params, as, body: { baseRevision: 'one', document: sampleDocument() } }) },
      { name: 'fractional base', status: 422, field: 'baseRevision', run: () => call(revisions.POST, path, { method: 'POST', params, as, body: { baseRevision: 1.5, document: sampleDocument() } }) },
      { name: 'missing document', status: 422, field: 'document', run: () => call(revisions.POST, path, { method: 'POST', params, as, body: { baseRevision: 1 } }) },
      { name: 'invalid document (wire to an unknown block)', status: 422, field: 'document.wires.0.source', run: () => call(revisions.POST, path, { method: 'POST', params, as, body: { baseRevision: 1, document: brokenDoc } }) },
      { name: 'negative capacitance', status: 422, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: { baseRevision: 1, document: halfWaveStarter(3, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF: -1e-9 }) } }) },
      { name: 'wrong schema version', status: 422, field: 'document.schemaVersion', run: () => call(revisions.POST, path, { method: 'POST', params, as, body: { baseRevision: 1, document: { ...sampleDocument(), schemaVersion: 99 } } }) },
      { name: 'text/plain body', status: 415, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: JSON.stringify({ baseRevision: 1, document: sampleDocument() }), headers: { 'content-type': 'text/plain' } }) },
      { name: 'oversize with content-length', status: 413, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: bigDoc }) },
      { name: 'oversize streamed without content-length', status: 413, run: () => call(revisions.POST, path, { method: 'POST', params, as, body: bigDoc, stream: true }) },
      { name: 'unknown design id', status: 404, run: () => call(revisions.POST, `/api/designs/${randomUUID()}/revisions`, { method: 'POST', params: { designId: randomUUID() }, as, body: { baseRevision: 1, document: sampleDocument() } }) },
      { name: 'non-UUID design id', status: 404, run: () => call(revisions.POST, '/api/designs/42/revisions', { method: 'POST', params: { designId: '42' }, as, body: { baseRevision: 1, document: sampleDocument() } }) },
      { name: 'unknown revision number', status: 404, run: () => call(revision.GET, `${path}/99`, { params: { designId: d.id, number: '99' }, as }) },
      { name: 'non-numeric revision number', status: 404, run: () => call(revision.GET, `${path}/abc`, { params: { designId: d.id, number: 'abc' }, as }) },
      { name: 'empty title on PATCH', status: 422, field: 'title', run: () => call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params, as, body: { title: '   ' } }) },
      { name: 'empty PATCH', status: 422, run: () => call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params, as, body: {} }) },
      { name: 'bad visibility', status: 422, field: 'visibility', run: () => call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params, as, body: { visibility: 'public' } }) },
      { name: 'fork of a revision that does not exist', status: 404, run: () => call(fork.POST, `/api/designs/${d.id}/fork`, { method: 'POST', params, as, body: { revision: 7 } }) },
      { name: 'fork into a team one is not in', status: 404, run: () => call(fork.POST, `/api/designs/${d.id}/fork`, { method: 'POST', params, as, body: { teamId: f.otherTeamId } }) },
      { name: 'bad sort in list query', status: 422, field: 'sort', run: () => call(teamDesigns.GET, `/api/teams/${f.teamId}/designs`, { params: { teamId: f.teamId }, as, query: { sort: 'colour' } }) },
    ];
    for (const p of probes) {
      const res = await p.run();
      const err = (res.body as { error?: { code: string; message: string; field?: string } }).error;
      expect({ probe: p.name, status: res.status }).toEqual({ probe: p.name, status: p.status });
      expect(err?.message, p.name).toMatch(/\w/);
      if (p.field) expect(err?.field, p.name).toBe(p.field);
    }
    expect(await snapshot(d.id)).toEqual(before);
    expect(await db().models.Design.count({ where: { forkedFromDesignId: d.id } })).toBe(0);
  });
});

describe('fork', () => {
  it('copies the chosen revision into a new design, keeps the parent intact and remembers lineage', async () => {
    const parent = await create('Parent ladder', { as: 'owner' });
    expect((await save(parent.id, 1, 33e-9, f.users.owner)).status).toBe(201);
    const before = await snapshot(parent.id);
    const res = await call<{ design: DesignDetailDto }>(fork.POST, `/api/designs/${parent.id}/fork`, { method: 'POST', params: { designId: parent.id }, as: f.users.designer, body: { revision: 1 } });
    expect(res.status).toBe(201);
    const child = res.body.design;
    expect(child.author.id).toBe(f.users.designer.id);
    expect(child.forkedFrom).toEqual({ designId: parent.id, title: 'Parent ladder', revision: 1 });
    expect(child.latestRevision).toBe(1);
    expect((await getRev(child.id, 1)).body.revision.document).toEqual(sampleDocument(10e-9));
    expect((await getRev(child.id, 1)).body.revision.message).toBe('Forked from Parent ladder r1');
    expect(await snapshot(parent.id)).toEqual(before);
    const parentView = await call<{ design: DesignDetailDto }>(design.GET, `/api/designs/${parent.id}`, { params: { designId: parent.id }, as: f.users.reviewer });
    expect(parentView.body.design.forks).toEqual([{ designId: child.id, title: 'Parent ladder (fork)', author: expect.objectContaining({ id: f.users.designer.id }), revision: 1 }]);
    // saving the fork leaves the parent alone
    expect((await save(child.id, 1, 1e-9)).status).toBe(201);
    expect(await snapshot(parent.id)).toEqual(before);
  });

  it('forks into another team where the caller designs; a viewer there is refused', async () => {
    const parent = await create('Travelling ladder');
    const otherTeam = await db().models.Team.create({ name: 'Second bench' });
    await addMember(otherTeam.id, f.users.designer.id, 'designer');
    await addMember(otherTeam.id, f.users.viewer.id, 'viewer');
    const ok = await call<{ design: DesignDetailDto }>(fork.POST, `/api/designs/${parent.id}/fork`, { method: 'POST', params: { designId: parent.id }, as: f.users.designer, body: { teamId: otherTeam.id, title: 'Travelled' } });
    expect(ok.status).toBe(201);
    expect(ok.body.design.teamId).toBe(otherTeam.id);
    const refused = await call(fork.POST, `/api/designs/${parent.id}/fork`, { method: 'POST', params: { designId: parent.id }, as: f.users.viewer, body: { teamId: otherTeam.id } });
    expect(refused.status).toBe(403);
  });
});

describe('list, privacy and archive', () => {
  it('hides private designs from others, filters archived ones and sorts', async () => {
    await create('Zeta private ladder', { visibility: 'private' });
    const a = await create('Alpha ladder', { as: 'owner' });
    const list = (as: keyof Fixtures['users'], query: Record<string, string> = {}) =>
      call<{ designs: DesignSummaryDto[] }>(teamDesigns.GET, `/api/teams/${f.teamId}/designs`, { params: { teamId: f.teamId }, as: f.users[as], query });
    expect((await list('designer', { q: 'zeta' })).body.designs.map((d) => d.title)).toEqual(['Zeta private ladder']);
    expect((await list('owner', { q: 'zeta' })).body.designs).toEqual([]);
    const byTitle = (await list('viewer', { sort: 'title' })).body.designs.map((d) => d.title);
    expect(byTitle).toEqual([...byTitle].sort((x, y) => x.localeCompare(y)));
    expect(byTitle[0]).toBe('Alpha ladder');

    const archived = await call<{ design: DesignDetailDto }>(design.PATCH, `/api/designs/${a.id}`, { method: 'PATCH', params: { designId: a.id }, as: f.users.owner, body: { archived: true } });
    expect(archived.status).toBe(200);
    expect(archived.body.design.archived).toBe(true);
    expect(archived.body.design.permissions.edit).toBe(false);
    expect((await list('viewer')).body.designs.map((d) => d.id)).not.toContain(a.id);
    expect((await list('viewer', { archived: 'true' })).body.designs.map((d) => d.id)).toEqual([a.id]);
    const saveArchived = await save(a.id, 1, 1e-9, f.users.owner);
    expect(saveArchived.status).toBe(409);
    expect((await snapshot(a.id)).revs).toHaveLength(1);
  });

  it('a design made private disappears for colleagues and comes back when shared', async () => {
    const d = await create('Shy ladder');
    const get = (as: keyof Fixtures['users']) => call(design.GET, `/api/designs/${d.id}`, { params: { designId: d.id }, as: f.users[as] });
    expect((await get('viewer')).status).toBe(200);
    expect((await call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params: { designId: d.id }, as: f.users.designer, body: { visibility: 'private' } })).status).toBe(200);
    expect((await get('viewer')).status).toBe(404);
    expect((await get('owner')).status).toBe(404);
    expect((await call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params: { designId: d.id }, as: f.users.designer, body: { visibility: 'team' } })).status).toBe(200);
    expect((await get('viewer')).status).toBe(200);
  });
});
