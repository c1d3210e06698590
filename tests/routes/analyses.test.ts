/**
 * Analysis runs through the routes against the real database, with the worker started in this
 * process (lib/jobs/analysis-worker.ts): a run is queued (202), worked and read back done with
 * its result; a stage sweep marks its optimum; everyone who can read the design may run and read
 * (viewers too), outsiders 404, signed out 401; a bad spec is 422 naming the field and queues
 * nothing; cancel is for the starter or an owner; at most three open runs per person.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as designAnalyses from '@/app/api/designs/[designId]/analyses/route';
import * as analysisRoute from '@/app/api/analyses/[analysisId]/route';
import type { AnalysisDto, AnalysisSummaryDto } from '@/lib/analyses/contract';
import { createDesign } from '@/lib/data/designs';
import { db } from '@/lib/db';
import { startAnalysisWorker, type RunningWorker } from '@/lib/jobs/analysis-worker';
import { stopWebBoss } from '@/lib/jobs/boss';
import { call, sampleDocument, setupFixtures, teardown, WHO, type Fixtures, type FixtureUser, type Who } from './helpers';

let f: Fixtures;
let worker: RunningWorker;

beforeAll(async () => {
  f = await setupFixtures();
  await db().sequelize.query('DROP SCHEMA IF EXISTS pgboss CASCADE');
  worker = await startAnalysisWorker({ databaseUrl: process.env.DATABASE_URL!, staleSeconds: 30, pollSeconds: 0.5, log: () => {} });
});
afterAll(async () => {
  await worker?.stop();
  await stopWebBoss();
  await teardown();
});

type Answer = { analysis: AnalysisDto; error?: { code: string; field?: string; message: string } };

async function newDesign(o: { visibility?: 'team' | 'private'; stages?: number } = {}): Promise<string> {
  const { design } = await createDesign(f.users.designer.id, f.teamId, { title: 'Swept ladder', visibility: o.visibility ?? 'team', document: sampleDocument(10e-9, o.stages ?? 3) });
  return design.id;
}

function start(designId: string, as: FixtureUser | null, spec: unknown, revision?: number) {
  return call<Answer>(designAnalyses.POST, `/api/designs/${designId}/analyses`, { method: 'POST', params: { designId }, as, body: { spec, ...(revision ? { revision } : {}) } });
}

function read(analysisId: string, as: FixtureUser | null) {
  return call<Answer>(analysisRoute.GET, `/api/analyses/${analysisId}`, { params: { analysisId }, as });
}

async function untilFinished(analysisId: string, as: FixtureUser = f.users.viewer, timeoutMs = 45_000): Promise<AnalysisDto> {
  const t0 = Date.now();
  for (;;) {
    const r = await read(analysisId, as);
    expect(r.status).toBe(200);
    if (['done', 'failed', 'cancelled'].includes(r.body.analysis.status)) return r.body.analysis;
    if (Date.now() - t0 > timeoutMs) throw new Error(`analysis still ${r.body.analysis.status} at ${r.body.analysis.donePoints}/${r.body.analysis.totalPoints}`);
    await new Promise((res) => setTimeout(res, 250));
  }
}

describe('running an analysis', () => {
  it('a viewer queues a spread (202), the worker works it, and the result has percentiles', async () => {
    const designId = await newDesign();
    const res = await start(designId, f.users.viewer, { kind: 'spread', samples: 6, seed: 7 });
    expect(res.status).toBe(202);
    expect(res.body.analysis).toMatchObject({ status: 'queued', kind: 'spread', revision: 1, totalPoints: 6, donePoints: 0, progress: 0, createdBy: { id: f.users.viewer.id } });
    // The pg-boss job carries only the id and has the run's id.
    const [job] = await db().sequelize.query<{ data: unknown }>(`SELECT data FROM pgboss.job WHERE name = 'analysis-run' AND id = $1`, { bind: [res.body.analysis.id], type: 'SELECT' as never });
    expect(job?.data).toEqual({ analysisId: res.body.analysis.id });

    const done = await untilFinished(res.body.analysis.id);
    expect(done).toMatchObject({ status: 'done', progress: 1, donePoints: 6, attempts: 1, error: null });
    expect(done.points.map((p) => p.index)).toEqual([0, 1, 2, 3, 4, 5]);
    const r = done.result;
    if (r?.kind !== 'spread') throw new Error('no spread result');
    expect(r.failed).toBe(0);
    expect(r.output!.n).toBe(6);
    expect(r.output!.p5).toBeLessThanOrEqual(r.output!.p50);
    expect(r.output!.p50).toBeLessThanOrEqual(r.output!.p95);
    expect(r.output!.std).toBeGreaterThan(0);
  });

  it('a stage sweep marks the stage count with the highest output', async () => {
    const designId = await newDesign();
    const res = await start(designId, f.users.designer, { kind: 'sweep', parameter: 'stages', from: 1, to: 4 });
    expect(res.status).toBe(202);
    const done = await untilFinished(res.body.analysis.id);
    const r = done.result;
    if (r?.kind !== 'sweep') throw new Error('no sweep result');
    expect(r.points.map((p) => p.value)).toEqual([1, 2, 3, 4]);
    const ok = r.points.filter((p) => p.ok);
    expect(ok).toHaveLength(4);
    const best = ok.reduce((a, b) => (b.ok && a.ok && b.outputDcV > a.outputDcV ? b : a));
    expect(r.optimum?.value).toBe(best.value);
    // The demo ladder's rated parts give a worst margin at every point.
    expect(ok.every((p) => p.ok && typeof p.worstMargin === 'number')).toBe(true);
  });

  it('lists the design’s runs newest first, without their points', async () => {
    const designId = await newDesign();
    const a = await start(designId, f.users.owner, { kind: 'sweep', parameter: 'frequency', from: 10_000, to: 40_000, points: 2 });
    const b = await start(designId, f.users.reviewer, { kind: 'sweep', parameter: 'loadCurrent', from: 0, to: 2e-4, points: 2 });
    await untilFinished(a.body.analysis.id);
    await untilFinished(b.body.analysis.id);
    const list = await call<{ analyses: AnalysisSummaryDto[] }>(designAnalyses.GET, `/api/designs/${designId}/analyses`, { params: { designId }, as: f.users.viewer });
    expect(list.status).toBe(200);
    expect(list.body.analyses.map((x) => x.id)).toEqual([b.body.analysis.id, a.body.analysis.id]);
    expect(list.body.analyses[0]).not.toHaveProperty('points');
    expect(list.body.analyses[0]).not.toHaveProperty('result');
    expect(list.body.analyses[0].status).toBe('done');
  });
});

describe('who may run and read', () => {
  it('every member who can read the design may run; outsiders 404; signed out 401', async () => {
    const designId = await newDesign();
    const expected: Record<Who, number> = { owner: 202, designer: 202, reviewer: 202, viewer: 202, outsider: 404 };
    const ids: string[] = [];
    for (const who of WHO) {
      const res = await start(designId, f.users[who], { kind: 'sweep', parameter: 'stages', from: 1, to: 2 });
      expect({ who, status: res.status }).toEqual({ who, status: expected[who] });
      if (res.status === 202) ids.push(res.body.analysis.id);
    }
    expect((await start(designId, null, { kind: 'sweep', parameter: 'stages', from: 1, to: 2 })).status).toBe(401);
    expect((await read(ids[0], f.users.outsider)).status).toBe(404);
    expect((await read(ids[0], null)).status).toBe(401);
    const list = await call(designAnalyses.GET, `/api/designs/${designId}/analyses`, { params: { designId }, as: f.users.outsider });
    expect(list.status).toBe(404);
    for (const id of ids) await untilFinished(id);
  });

  it('a private design’s runs are hidden from everyone but its author', async () => {
    const designId = await newDesign({ visibility: 'private' });
    const res = await start(designId, f.users.designer, { kind: 'sweep', parameter: 'stages', from: 1, to: 2 });
    expect(res.status).toBe(202);
    expect((await start(designId, f.users.owner, { kind: 'sweep', parameter: 'stages', from: 1, to: 2 })).status).toBe(404);
    expect((await read(res.body.analysis.id, f.users.owner)).status).toBe(404);
    expect((await read(res.body.analysis.id, f.users.designer)).status).toBe(200);
    await untilFinished(res.body.analysis.id, f.users.designer);
  });
});

describe('bad input', () => {
  async function count(): Promise<number> {
    return db().models.Analysis.count();
  }
  it('422 names the field and queues nothing', async () => {
    const designId = await newDesign();
    const before = await count();
    const cases: Array<[unknown, string]> = [
      [{ kind: 'spread', samples: 501, seed: 1 }, 'spec.samples'],
      [{ kind: 'spread', samples: 10, seed: -1 }, 'spec.seed'],
      [{ kind: 'sweep', parameter: 'frequency', from: 1000, to: 2000, points: 61 }, 'spec.points'],
      [{ kind: 'sweep', parameter: 'stages', from: 5, to: 3 }, 'spec.to'],
      [{ kind: 'sweep', parameter: 'wattage', from: 1, to: 3, points: 3 }, 'spec.parameter'],
      [{ kind: 'histogram' }, 'spec.kind'],
    ];
    for (const [spec, field] of cases) {
      const res = await start(designId, f.users.designer, spec);
      expect({ spec, status: res.status, field: res.body.error?.field }).toEqual({ spec, status: 422, field });
    }
    const rev = await start(designId, f.users.designer, { kind: 'spread', samples: 4, seed: 1 }, 9);
    expect([rev.status, rev.body.error?.field]).toEqual([422, 'revision']);
    expect(await count()).toBe(before);
  });

  it('a stage sweep of a drawing without a ladder is refused before queueing', async () => {
    const doc = sampleDocument();
    const stages = new Set(doc.blocks.filter((b) => b.kind === 'stage').map((b) => b.id));
    const bare = { ...doc, blocks: doc.blocks.filter((b) => !stages.has(b.id)), wires: doc.wires.filter((w) => !stages.has(w.source) && !stages.has(w.target)) };
    const { design } = await createDesign(f.users.designer.id, f.teamId, { title: 'No ladder', visibility: 'team', document: bare });
    const res = await start(design.id, f.users.designer, { kind: 'sweep', parameter: 'stages', from: 1, to: 3 });
    expect(res.status).toBe(422);
    expect(res.body.error).toMatchObject({ field: 'spec.parameter' });
    expect(res.body.error?.message).toMatch(/no ladder/);
  });
});

describe('cancel and limits', () => {
  it('the starter or an owner cancels; others 403; the worker stops and the run stays cancelled', async () => {
    const designId = await newDesign({ stages: 4 });
    const res = await start(designId, f.users.reviewer, { kind: 'spread', samples: 300, seed: 5 });
    expect(res.status).toBe(202);
    const id = res.body.analysis.id;
    const del = (as: FixtureUser) => call<Answer>(analysisRoute.DELETE, `/api/analyses/${id}`, { method: 'DELETE', params: { analysisId: id }, as });
    expect((await del(f.users.viewer)).status).toBe(403);
    expect((await del(f.users.designer)).status).toBe(403);
    expect((await del(f.users.outsider)).status).toBe(404);
    const ok = await del(f.users.reviewer);
    expect(ok.status).toBe(200);
    expect(ok.body.analysis.status).toBe('cancelled');
    expect((await del(f.users.owner)).status).toBe(409);
    await new Promise((r) => setTimeout(r, 1500));
    const after = (await read(id, f.users.viewer)).body.analysis;
    expect(after.status).toBe('cancelled');
    expect(after.result).toBeNull();
    expect(after.donePoints).toBeLessThan(300);
  });

  it('at most three open runs per person (429), counted again once one is cancelled', async () => {
    const designId = await newDesign({ stages: 4 });
    const ids: string[] = [];
    for (let i = 0; i < 3; i++) {
      const res = await start(designId, f.users.viewer, { kind: 'spread', samples: 400, seed: i });
      expect(res.status).toBe(202);
      ids.push(res.body.analysis.id);
    }
    const fourth = await start(designId, f.users.viewer, { kind: 'spread', samples: 400, seed: 9 });
    expect(fourth.status).toBe(429);
    for (const id of ids) expect((await call(analysisRoute.DELETE, `/api/analyses/${id}`, { method: 'DELETE', params: { analysisId: id }, as: f.users.owner })).status).toBe(200);
    const again = await start(designId, f.users.viewer, { kind: 'sweep', parameter: 'stages', from: 1, to: 2 });
    expect(again.status).toBe(202);
    await untilFinished(again.body.analysis.id);
  });
});
