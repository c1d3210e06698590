/**
 * The job queue on PostgreSQL (pg-boss 10.4.2, schema `pgboss`): queue names, options, start/stop
 * and send. A job carries only the analysis id and has that id as its own job id, so sending the
 * same analysis twice is a no-op (pg-boss inserts with ON CONFLICT DO NOTHING).
 *
 * Retries: {@link ANALYSIS_RETRY_LIMIT} retries {@link ANALYSIS_RETRY_DELAY_S} s apart. A job
 * whose worker died is re-offered when a live worker's reaper sees its heartbeat go stale
 * (lib/jobs/analysis-worker.ts) and, as a backstop, when pg-boss expires it after
 * {@link ANALYSIS_EXPIRE_S} s in the active state (pg-boss's maintenance runs every 2 minutes).
 *
 * No `server-only` marker: the worker (scripts/worker.ts) runs this under tsx.
 */
import PgBoss from 'pg-boss';

/** The queue analysis runs go through. */
export const ANALYSIS_QUEUE = 'analysis-run';
/** Retries after the first attempt (graceful worker stops and crashes each use one). */
export const ANALYSIS_RETRY_LIMIT = 10;
/** Seconds between a failed attempt and its retry. */
export const ANALYSIS_RETRY_DELAY_S = 2;
/**
 * Longest an attempt may stay active before pg-boss fails it (and so retries it): above the
 * longest allowed run, 500 samples × 10 s budget ≈ 83 min.
 */
export const ANALYSIS_EXPIRE_S = 2 * 60 * 60;

/** What a job carries. */
export interface AnalysisJobData {
  analysisId: string;
}

/** A pg-boss instance on `connectionString` (not started). */
export function createBoss(connectionString: string, o: { role: 'web' | 'worker'; max?: number }): PgBoss {
  const boss = new PgBoss({
    connectionString,
    max: o.max ?? (o.role === 'web' ? 2 : 4),
    application_name: `kilorung-${o.role}`,
    // The web process only sends; maintenance (expiry, archiving) and cron run in the worker.
    supervise: o.role === 'worker',
    schedule: false,
  });
  return boss;
}

/** Create the analysis queue unless it exists (safe when two processes race). */
export async function ensureQueue(boss: PgBoss): Promise<void> {
  if (await boss.getQueue(ANALYSIS_QUEUE)) return;
  try {
    await boss.createQueue(ANALYSIS_QUEUE, {
      name: ANALYSIS_QUEUE,
      policy: 'standard',
      retryLimit: ANALYSIS_RETRY_LIMIT,
      retryDelay: ANALYSIS_RETRY_DELAY_S,
      expireInSeconds: ANALYSIS_EXPIRE_S,
    });
  } catch (e) {
    if (!(await boss.getQueue(ANALYSIS_QUEUE))) throw e;
  }
}

/** Queue the job of analysis `analysisId` (job id = analysis id; a second send does nothing). */
export async function sendAnalysisJob(boss: PgBoss, analysisId: string): Promise<void> {
  await boss.send(ANALYSIS_QUEUE, { analysisId } satisfies AnalysisJobData, {
    id: analysisId,
    retryLimit: ANALYSIS_RETRY_LIMIT,
    retryDelay: ANALYSIS_RETRY_DELAY_S,
    expireInSeconds: ANALYSIS_EXPIRE_S,
  });
}

const holder = globalThis as typeof globalThis & { __kilorungBoss?: Promise<PgBoss> };

/** The web process's sending instance, started on first use (kept on globalThis across reloads). */
export function webBoss(connectionString: string): Promise<PgBoss> {
  if (!holder.__kilorungBoss) {
    const boss = createBoss(connectionString, { role: 'web' });
    boss.on('error', (e: Error) => console.error(`[jobs] queue error: ${e.message}`));
    holder.__kilorungBoss = boss
      .start()
      .then(async () => {
        await ensureQueue(boss);
        return boss;
      })
      .catch((e: unknown) => {
        holder.__kilorungBoss = undefined;
        throw e;
      });
  }
  return holder.__kilorungBoss;
}

/** Stop the web process's instance (tests). */
export async function stopWebBoss(): Promise<void> {
  const p = holder.__kilorungBoss;
  holder.__kilorungBoss = undefined;
  if (p) await (await p).stop({ graceful: false, wait: true });
}
