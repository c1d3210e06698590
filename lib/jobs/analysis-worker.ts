/**
 * The analysis worker: takes analysis jobs off the queue and computes them, point by point.
 *
 * Not lost, not duplicated:
 * - Claim: one UPDATE moves the row to 'running' and adds 1 to `attempts`; this attempt's
 *   number guards every later write (`attempts = <mine> AND status = 'running'`), so an attempt
 *   that was given up on (a stale worker that wakes up) can no longer write.
 * - Points: each point is appended in its own short UPDATE guarded by `done_points = <index>`,
 *   so a point is stored once and in order. A retried run resumes from the points already saved
 *   (a spread sample's draw depends only on the seed and its index, so resuming gives the same
 *   samples as a fresh run).
 * - Result: written with status 'done' in one UPDATE guarded by `status <> 'done'`; a retry of
 *   a job whose attempt had finished finds 'done' and does nothing.
 * - A killed worker: every attempt writes `heartbeat_at` with each point. Each worker's reaper
 *   (every few seconds) fails the pg-boss job of a 'running' row whose heartbeat is older than
 *   `staleSeconds` (default 60 s, above the 10 s per-point budget), which makes pg-boss retry it
 *   (retry limit and delay in boss.ts); pg-boss's own expiry is the backstop. A row whose job has
 *   no retries left is marked failed. A queued row with no job (the web process died between the
 *   insert and the send) is sent again.
 * - Graceful stop (SIGTERM): the running attempt stops after its current point, puts the row back
 *   to 'queued' and throws, so pg-boss retries it on the next worker.
 */
import type PgBoss from 'pg-boss';
import { QueryTypes } from 'sequelize';
import { analysisSpecSchema, computePoint, summarise, type PointResult } from '../analyses';
import { designDocumentSchema } from '../circuit/document/schema';
import { db } from '../db';
import { ANALYSIS_QUEUE, createBoss, ensureQueue, sendAnalysisJob, type AnalysisJobData } from './boss';

export interface WorkerOptions {
  databaseUrl: string;
  /** A 'running' row without a heartbeat for this long is taken to have lost its worker. */
  staleSeconds?: number;
  /** How often the reaper looks (s). */
  reapSeconds?: number;
  /** pg-boss polling interval (s). */
  pollSeconds?: number;
  /** Per-point solve budget (ms). */
  pointBudgetMs?: number;
  log?: (line: string) => void;
}

export interface RunningWorker {
  boss: PgBoss;
  /** Stop taking jobs; the running attempt stops after its current point and is retried elsewhere. */
  stop(): Promise<void>;
}

class Stopping extends Error {
  constructor() {
    super('the worker is stopping; the run goes back to the queue');
  }
}

interface Claimed {
  attempts: number;
  spec: unknown;
  design_id: string;
  revision: number;
  done_points: number;
  total_points: number;
}

export async function startAnalysisWorker(o: WorkerOptions): Promise<RunningWorker> {
  const log = o.log ?? ((l: string) => console.log(`[worker] ${l}`));
  const staleSeconds = o.staleSeconds ?? 60;
  const { sequelize } = db();
  const boss = createBoss(o.databaseUrl, { role: 'worker' });
  boss.on('error', (e: Error) => log(`queue error: ${e.message}`));
  await boss.start();
  await ensureQueue(boss);
  let stopping = false;

  async function run(job: PgBoss.JobWithMetadata<AnalysisJobData>): Promise<void> {
    const id = job.data.analysisId;
    const [claimed] = await sequelize.query<Claimed>(
      `UPDATE analyses SET status = 'running', attempts = attempts + 1, heartbeat_at = now(), started_at = COALESCE(started_at, now()), error = NULL, updated_at = now()
       WHERE id = $1 AND status IN ('queued', 'running')
       RETURNING attempts, spec, design_id, revision, done_points, total_points`,
      { bind: [id], type: QueryTypes.SELECT },
    );
    if (!claimed) {
      log(`analysis ${id}: nothing to do (finished, cancelled or gone)`);
      return;
    }
    const attempt = claimed.attempts;
    const guard = `id = $1 AND status = 'running' AND attempts = $2`;
    const failRun = async (message: string) => {
      await sequelize.query(`UPDATE analyses SET status = 'failed', error = $3, finished_at = now(), updated_at = now() WHERE ${guard}`, { bind: [id, attempt, message] });
      log(`analysis ${id}: failed: ${message}`);
    };
    try {
      const spec = analysisSpecSchema.safeParse(claimed.spec);
      if (!spec.success) return await failRun(`the stored spec is not valid: ${spec.error.issues[0]?.message ?? 'unknown'}`);
      const rev = await db().models.DesignRevision.findOne({ where: { designId: claimed.design_id, number: claimed.revision } });
      if (!rev) return await failRun(`revision ${claimed.revision} of the design no longer exists`);
      const doc = designDocumentSchema.safeParse(rev.document);
      if (!doc.success) return await failRun('the stored revision does not read as a design document');
      log(`analysis ${id}: attempt ${attempt}, ${spec.data.kind}, points ${claimed.done_points}/${claimed.total_points}`);
      for (let index = claimed.done_points; index < claimed.total_points; index++) {
        if (stopping) throw new Stopping();
        const point = computePoint(doc.data, spec.data, index, o.pointBudgetMs);
        const [, saved] = await sequelize.query(
          `UPDATE analyses SET points = points || jsonb_build_array($4::jsonb), done_points = done_points + 1,
             progress = LEAST(1, (done_points + 1)::double precision / total_points), heartbeat_at = now(), updated_at = now()
           WHERE ${guard} AND done_points = $3`,
          { bind: [id, attempt, index, JSON.stringify(point)] },
        );
        if (rowCount(saved) === 0) {
          log(`analysis ${id}: attempt ${attempt} gave up at point ${index} (cancelled or taken over)`);
          return;
        }
      }
      const [row] = await sequelize.query<{ points: PointResult[] }>(`SELECT points FROM analyses WHERE id = $1`, { bind: [id], type: QueryTypes.SELECT });
      const result = summarise(spec.data, row?.points ?? []);
      const [, done] = await sequelize.query(
        `UPDATE analyses SET status = 'done', result = $3::jsonb, progress = 1, finished_at = now(), heartbeat_at = now(), updated_at = now()
         WHERE ${guard} AND status <> 'done'`,
        { bind: [id, attempt, JSON.stringify(result)] },
      );
      log(`analysis ${id}: ${rowCount(done) === 1 ? 'done' : 'already finished elsewhere'} (${result.failed} failed points)`);
    } catch (e) {
      const lastTry = job.retryCount >= job.retryLimit;
      const message = e instanceof Error ? e.message : String(e);
      if (lastTry && !(e instanceof Stopping)) {
        await failRun(`stopped after ${attempt} attempts: ${message}`);
        return;
      }
      await sequelize.query(`UPDATE analyses SET status = 'queued', updated_at = now() WHERE ${guard}`, { bind: [id, attempt] });
      log(`analysis ${id}: attempt ${attempt} interrupted (${message}); pg-boss retries it`);
      throw e;
    }
  }

  async function reap(): Promise<void> {
    const stale = await sequelize.query<{ id: string }>(
      `SELECT id FROM analyses WHERE status = 'running' AND heartbeat_at < now() - make_interval(secs => $1) LIMIT 20`,
      { bind: [staleSeconds], type: QueryTypes.SELECT },
    );
    for (const { id } of stale) {
      const job = await boss.getJobById(ANALYSIS_QUEUE, id);
      if (job?.state === 'active') await boss.fail(ANALYSIS_QUEUE, id, { message: 'the worker stopped sending heartbeats' });
      const after = await boss.getJobById(ANALYSIS_QUEUE, id);
      const retried = after !== null && (after.state === 'retry' || after.state === 'created' || after.state === 'active');
      await sequelize.query(
        retried
          ? `UPDATE analyses SET status = 'queued', updated_at = now() WHERE id = $1 AND status = 'running' AND heartbeat_at < now() - make_interval(secs => $2)`
          : `UPDATE analyses SET status = 'failed', error = 'the worker stopped during every attempt', finished_at = now(), updated_at = now() WHERE id = $1 AND status = 'running' AND heartbeat_at < now() - make_interval(secs => $2)`,
        { bind: [id, staleSeconds] },
      );
      log(`analysis ${id}: its worker went quiet; ${retried ? 'queued again' : 'no retries left, failed'}`);
    }
    const orphans = await sequelize.query<{ id: string }>(
      `SELECT id FROM analyses WHERE status = 'queued' AND created_at < now() - interval '60 seconds' ORDER BY created_at LIMIT 20`,
      { type: QueryTypes.SELECT },
    );
    for (const { id } of orphans) {
      if (!(await boss.getJobById(ANALYSIS_QUEUE, id, { includeArchive: true }))) {
        await sendAnalysisJob(boss, id);
        log(`analysis ${id}: queued row had no job; sent again`);
      }
    }
  }

  let reaping: Promise<void> = Promise.resolve();
  const reaper = setInterval(() => {
    reaping = reaping.then(reap).catch((e: unknown) => log(`reaper: ${e instanceof Error ? e.message : String(e)}`));
  }, (o.reapSeconds ?? Math.max(1, Math.min(10, staleSeconds / 3))) * 1000);

  await boss.work<AnalysisJobData>(ANALYSIS_QUEUE, { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: o.pollSeconds ?? 1 }, async (jobs) => {
    for (const job of jobs) await run(job);
  });
  log('ready');

  return {
    boss,
    async stop() {
      stopping = true;
      clearInterval(reaper);
      await reaping;
      await boss.stop({ graceful: true, wait: true, timeout: 30_000 });
    },
  };
}

/** Rows changed by a Sequelize UPDATE query (its second result is the pg result). */
function rowCount(meta: unknown): number {
  if (typeof meta === 'number') return meta;
  const m = meta as { rowCount?: number } | null;
  return m?.rowCount ?? 0;
}
