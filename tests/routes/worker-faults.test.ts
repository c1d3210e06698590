/**
 * The worker under faults, as separate processes (`node --import tsx scripts/worker.ts`, one
 * process each — as npm run worker, npm run app and the e2e start it; the `tsx` command line would
 * relay a SIGTERM as a SIGKILL to a worker busy in a solve, see scripts/worker.ts):
 * - a run queued through the data layer while no worker runs, and the sending (web) side shut
 *   down before any worker starts, is done by a worker started afterwards — the job lives in
 *   PostgreSQL, not in the web process;
 * - a worker killed with SIGKILL mid-run (after some points are saved): a second worker's reaper
 *   sees the heartbeat go stale, fails the pg-boss job so it is retried, and the retry resumes
 *   from the saved points; then that worker is stopped with SIGTERM mid-run (the run goes back to
 *   the queue) and a third finishes it. The run ends done exactly once: every point index once,
 *   in order, the points saved before the kill unchanged, attempts = 3, the job completed.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { computePoint, type AnalysisSpec, type PointResult } from '@/lib/analyses';
import { createAnalysis } from '@/lib/data/analyses';
import { createDesign } from '@/lib/data/designs';
import { db } from '@/lib/db';
import { stopWebBoss } from '@/lib/jobs/boss';
import { sampleDocument, setupFixtures, teardown, type Fixtures } from './helpers';

let f: Fixtures;
const children: ChildProcess[] = [];

beforeAll(async () => {
  f = await setupFixtures();
  await db().sequelize.query('DROP SCHEMA IF EXISTS pgboss CASCADE');
});
afterEach(() => {
  for (const c of children.splice(0)) if (c.exitCode === null) c.kill('SIGKILL');
});
afterAll(async () => {
  await stopWebBoss();
  await teardown();
});

interface Worker {
  child: ChildProcess;
  output: () => string;
  exited: Promise<number | null>;
}

/** Start `node --import tsx scripts/worker.ts` on this test database and wait for its "ready" line. */
async function startWorker(): Promise<Worker> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], {
    cwd: process.cwd(),
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, DATABASE_URL: process.env.DATABASE_URL, NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET, ANALYSIS_STALE_SECONDS: '3', DB_POOL_MAX: '3' },
  });
  children.push(child);
  let out = '';
  child.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  const exited = new Promise<number | null>((res) => child.on('close', (code) => res(code)));
  const t0 = Date.now();
  while (!/\] ready/.test(out)) {
    if (child.exitCode !== null) throw new Error(`worker exited: ${out}`);
    if (Date.now() - t0 > 60_000) throw new Error(`worker not ready: ${out}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return { child, output: () => out, exited };
}

/** SIGTERM: the worker logs "stopped" and exits 0. */
async function stopGracefully(w: Worker): Promise<void> {
  w.child.kill('SIGTERM');
  expect(await w.exited).toBe(0);
  expect(w.output()).toMatch(/SIGTERM: stopping[\s\S]*\] stopped/);
}

interface Row {
  status: string;
  done_points: number;
  total_points: number;
  attempts: number;
  points: PointResult[];
  result: { kind: string; output: { n: number } | null } | null;
}

async function row(id: string): Promise<Row> {
  const [r] = await db().sequelize.query<Row>(`SELECT status, done_points, total_points, attempts, points, result FROM analyses WHERE id = $1`, { bind: [id], type: 'SELECT' as never });
  return r;
}

async function until(id: string, test: (r: Row) => boolean, timeoutMs = 60_000): Promise<Row> {
  const t0 = Date.now();
  for (;;) {
    const r = await row(id);
    if (test(r)) return r;
    if (Date.now() - t0 > timeoutMs) throw new Error(`timed out at ${JSON.stringify({ ...r, points: r.points.length })}`);
    await new Promise((res) => setTimeout(res, 100));
  }
}

async function newRun(spec: AnalysisSpec): Promise<string> {
  const { design } = await createDesign(f.users.designer.id, f.teamId, { title: 'Fault ladder', visibility: 'team', document: sampleDocument(10e-9, 3) });
  const a = await createAnalysis(f.users.viewer.id, design.id, { spec });
  return a.id;
}

describe('worker faults', () => {
  it('a run queued while no worker runs survives the sending process going away', async () => {
    const id = await newRun({ kind: 'spread', samples: 4, seed: 11, distribution: 'uniform', assumedTolerance: 0.1, loadTolerance: 0 });
    // The web side's queue client goes away before any worker exists.
    await stopWebBoss();
    expect((await row(id)).status).toBe('queued');
    const w = await startWorker();
    const done = await until(id, (r) => r.status === 'done');
    expect(done.attempts).toBe(1);
    expect(done.result?.output?.n).toBe(4);
    await stopGracefully(w);
  });

  it('kill -9 mid-run: retried, resumed, done exactly once', async () => {
    const spec: AnalysisSpec = { kind: 'spread', samples: 80, seed: 2026, distribution: 'uniform', assumedTolerance: 0.1, loadTolerance: 0 };
    const id = await newRun(spec);
    await stopWebBoss();

    const a = await startWorker();
    const before = await until(id, (r) => r.done_points >= 5);
    a.child.kill('SIGKILL');
    expect(await a.exited).toBeNull();
    const atKill = await row(id);
    expect(atKill.status).toBe('running');
    expect(atKill.done_points).toBeLessThan(80);
    const saved = atKill.points;
    expect(saved.length).toBeGreaterThanOrEqual(before.done_points);

    // A second worker notices the silent run (stale after 3 s), the job is retried and resumes.
    const b = await startWorker();
    const resumed = await until(id, (r) => r.attempts === 2 && r.done_points >= saved.length + 5 && r.status === 'running');
    expect(resumed.points.slice(0, saved.length)).toEqual(saved);
    // A graceful stop mid-run puts it back on the queue …
    await stopGracefully(b);
    const afterStop = await row(id);
    expect(afterStop.status).toBe('queued');
    expect(afterStop.done_points).toBeLessThan(80);
    expect(b.output()).toMatch(/interrupted/);

    // … and a third worker finishes it.
    const c = await startWorker();
    const done = await until(id, (r) => r.status === 'done');
    expect(done.attempts).toBe(3);
    expect(done.done_points).toBe(80);
    expect(done.points.map((p) => p.index)).toEqual(Array.from({ length: 80 }, (_, i) => i));
    expect(done.points.slice(0, afterStop.done_points)).toEqual(afterStop.points);
    expect(done.result?.output?.n).toBe(80);
    // Resuming gave the same samples a fresh run computes (each sample's draw depends on seed and index only).
    const doc = sampleDocument(10e-9, 3);
    for (const i of [0, saved.length, 79]) {
      const fresh = computePoint(doc, spec, i);
      const stored = done.points[i];
      expect(stored.ok && fresh.ok && stored.outputDcV).toBe(fresh.ok && fresh.outputDcV);
    }
    const [job] = await db().sequelize.query<{ state: string; retry_count: number }>(
      `SELECT state, retry_count FROM pgboss.job WHERE name = 'analysis-run' AND id = $1 UNION ALL SELECT state, retry_count FROM pgboss.archive WHERE name = 'analysis-run' AND id = $1`,
      { bind: [id], type: 'SELECT' as never },
    );
    expect(job.state).toBe('completed');
    expect(job.retry_count).toBe(2);
    // The third worker wrote the one result.
    expect(c.output()).toMatch(new RegExp(`analysis ${id}: done`));
    await stopGracefully(c);
  });
});
