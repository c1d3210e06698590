/**
 * `npm run worker`: the background worker for analysis runs (sweeps and tolerance spreads).
 * It reads DATABASE_URL (and the rest of the server environment, lib/env.ts) from the
 * environment, takes jobs off the pg-boss queue and computes them (lib/jobs/analysis-worker.ts).
 *
 * Run it as ONE process: `node --import tsx scripts/worker.ts` (what `npm run worker`,
 * scripts/app.sh and the e2e do). The `tsx` command line instead runs the script in a child and
 * relays signals: when the child does not acknowledge a signal within 30 ms — as here, while a
 * point's solve keeps the event loop busy — it SIGKILLs it, so a graceful stop would become a kill.
 *
 * WORKER_HEALTH_PORT (optional): listen on 127.0.0.1:<port> and answer GET /health with 200 once
 * the worker is taking jobs (the end-to-end tests wait on it). ANALYSIS_STALE_SECONDS (optional,
 * default 60): how long a running job may go without a heartbeat before it is re-offered.
 *
 * SIGTERM / SIGINT: stop taking jobs, let the running point finish, put its run back on the
 * queue, close the pool and exit 0. Logs never print the connection string or other secrets.
 */
import http from 'node:http';
import { env } from '../lib/env';
import { closeDb } from '../lib/db';
import { startAnalysisWorker, type RunningWorker } from '../lib/jobs/analysis-worker';

const log = (line: string) => console.log(`[worker ${process.pid}] ${line}`);

let worker: RunningWorker | null = null;
let server: http.Server | null = null;
let stopping = false;

async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  log(`${signal}: stopping`);
  server?.close();
  try {
    await worker?.stop();
    await closeDb();
  } finally {
    log('stopped');
    process.exit(0);
  }
}
// Registered first, so a signal during start-up also stops cleanly.
process.on('SIGTERM', () => void stop('SIGTERM'));
process.on('SIGINT', () => void stop('SIGINT'));

async function main(): Promise<void> {
  const e = env();
  const stale = process.env.ANALYSIS_STALE_SECONDS ? Number(process.env.ANALYSIS_STALE_SECONDS) : undefined;
  if (stale !== undefined && !(stale >= 1)) throw new Error('ANALYSIS_STALE_SECONDS must be a number of seconds, at least 1');
  const started = await startAnalysisWorker({ databaseUrl: e.DATABASE_URL, staleSeconds: stale, log });
  worker = started;
  if (stopping) {
    await started.stop();
    return;
  }

  const port = process.env.WORKER_HEALTH_PORT ? Number(process.env.WORKER_HEALTH_PORT) : 0;
  if (port > 0) {
    const s = http.createServer((req, res) => {
      const ok = req.url === '/health';
      res.writeHead(ok ? 200 : 404, { 'content-type': 'application/json' });
      res.end(JSON.stringify(ok ? { ok: true, pid: process.pid } : { error: 'not found' }));
    });
    server = s;
    await new Promise<void>((resolve, reject) => {
      s.once('error', reject);
      s.listen(port, '127.0.0.1', () => resolve());
    });
    log(`health on http://127.0.0.1:${port}/health`);
  }
}

main().catch((err: unknown) => {
  console.error(`[worker ${process.pid}] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
