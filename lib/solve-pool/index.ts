/**
 * The server's solve pool: the compare page, the exports and the bench comparison solve in
 * worker threads (node:worker_threads), never on the request thread, so one long solve does not
 * hold up the other requests of the web process (issue 7: "a solve that diverges or runs past its
 * budget is cut off with a message and does not block other requests").
 *
 * Two limits on every task:
 * - the engine's own wall-clock budget (passed in the task's arguments), which ends a solve with
 *   a typed failure at its next deadline check;
 * - a hard cut-off here (`timeoutMs`, counted from the moment a thread takes the task): past it
 *   the thread is terminated, the caller gets `{ ok: false, reason }`, and a fresh thread takes its
 *   place. This catches work the engine does not budget (netlist set-up of a very large ladder).
 *
 * Tasks wait in a FIFO queue while every thread is busy; a full queue, or a wait past
 * `waitMs`, answers "busy, retry" rather than queueing without bound. Threads are started on
 * first use; an idle thread is unref'd, so a script or a test that used the pool still exits.
 *
 * Size: SOLVE_POOL_SIZE, default one thread fewer than the cores (at least one, at most four):
 * on the 2-core machine, one solve thread beside the request thread.
 */
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { TaskName, Tasks } from './tasks';

export type PoolResult<T> = { ok: true; value: T } | { ok: false; reason: string; code: 'timeout' | 'busy' | 'crashed' | 'error' };

export interface RunOptions {
  /** Hard cut-off (ms) from the moment a thread starts the task. */
  timeoutMs: number;
  /** Longest wait (ms) in the queue before the task is refused as busy. Default 30 000. */
  waitMs?: number;
}

/** Tasks that may wait for a thread; one more is refused as busy. */
export const MAX_QUEUED = 64;

interface Job {
  name: TaskName;
  args: unknown[];
  timeoutMs: number;
  resolve: (r: PoolResult<unknown>) => void;
  waitTimer: NodeJS.Timeout | null;
}

interface Slot {
  worker: Worker;
  ready: boolean;
  job: { id: number; job: Job; timer: NodeJS.Timeout } | null;
}

function poolSize(): number {
  const fromEnv = Number(process.env.SOLVE_POOL_SIZE);
  if (Number.isInteger(fromEnv) && fromEnv >= 1 && fromEnv <= 16) return fromEnv;
  const cores = typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length;
  return Math.max(1, Math.min(4, cores - 1));
}

/**
 * The worker's file, found at run time from the project root (the web server, the tests and the
 * scripts all run there); kept out of the bundler's reach on purpose, since the worker must load
 * the engine's TypeScript itself.
 */
function workerFile(): string {
  return [process.cwd(), 'lib', 'solve-pool', 'worker.mjs'].join(path.sep);
}

class SolvePool {
  private readonly slots: Slot[] = [];
  private readonly queue: Job[] = [];
  private nextId = 1;
  private closed = false;
  readonly size = poolSize();
  /** Threads terminated by the hard cut-off or lost to a crash (for tests and logs). */
  restarts = 0;

  run(name: TaskName, args: unknown[], options: RunOptions): Promise<PoolResult<unknown>> {
    return new Promise((resolve) => {
      if (this.closed) return resolve({ ok: false, code: 'error', reason: 'the solver is shutting down' });
      if (this.queue.length >= MAX_QUEUED) return resolve({ ok: false, code: 'busy', reason: 'the solver is busy with other designs; retry in a moment' });
      const job: Job = { name, args, timeoutMs: options.timeoutMs, resolve, waitTimer: null };
      const waitMs = options.waitMs ?? 30_000;
      job.waitTimer = setTimeout(() => {
        const i = this.queue.indexOf(job);
        if (i >= 0) {
          this.queue.splice(i, 1);
          resolve({ ok: false, code: 'busy', reason: `the solver was busy with other designs for ${Math.round(waitMs / 1000)} s; retry in a moment` });
        }
      }, waitMs);
      job.waitTimer.unref();
      this.queue.push(job);
      this.pump();
    });
  }

  private spawn(): Slot {
    // ref'd while it starts (a caller waits for it); pump() unrefs it once it is idle
    const worker = new Worker(workerFile());
    const slot: Slot = { worker, ready: false, job: null };
    worker.on('message', (msg: { ready?: true; id?: number; ok?: boolean; value?: unknown; error?: string }) => {
      if (msg.ready) {
        slot.ready = true;
        this.pump();
        return;
      }
      const current = slot.job;
      if (!current || current.id !== msg.id) return;
      clearTimeout(current.timer);
      slot.job = null;
      current.job.resolve(msg.ok ? { ok: true, value: msg.value } : { ok: false, code: 'error', reason: `the solve failed: ${msg.error ?? 'unknown error'}` });
      this.pump();
    });
    const lost = (why: string) => {
      const i = this.slots.indexOf(slot);
      if (i < 0) return; // already replaced (terminated on purpose)
      this.slots.splice(i, 1);
      this.restarts += 1;
      const current = slot.job;
      slot.job = null;
      if (current) {
        clearTimeout(current.timer);
        current.job.resolve({ ok: false, code: 'crashed', reason: `the solver stopped unexpectedly (${why}); retry` });
      } else if (!slot.ready) {
        // a thread that cannot even start fails the waiting tasks instead of respawning forever
        for (const job of this.queue.splice(0)) {
          if (job.waitTimer) clearTimeout(job.waitTimer);
          job.resolve({ ok: false, code: 'crashed', reason: `the solver could not start (${why})` });
        }
        console.error(`[solve-pool] a solve thread could not start: ${why}`);
        return;
      }
      this.pump();
    };
    worker.on('error', (e) => lost(e.message));
    worker.on('exit', (code) => lost(`exit code ${code}`));
    this.slots.push(slot);
    return slot;
  }

  private pump(): void {
    while (this.queue.length > 0) {
      const slot = this.slots.find((s) => s.ready && !s.job);
      if (!slot) {
        if (this.slots.length < this.size) this.spawn();
        return; // a thread that becomes ready or free calls pump again
      }
      const job = this.queue.shift()!;
      if (job.waitTimer) clearTimeout(job.waitTimer);
      const id = this.nextId++;
      const timer = setTimeout(() => this.cutOff(slot, id), job.timeoutMs);
      timer.unref();
      slot.job = { id, job, timer };
      slot.worker.ref(); // keep the process alive while a caller waits for this answer
      slot.worker.postMessage({ id, name: job.name, args: job.args });
    }
    for (const s of this.slots) if (s.ready && !s.job) s.worker.unref();
  }

  private cutOff(slot: Slot, id: number): void {
    const current = slot.job;
    if (!current || current.id !== id) return;
    const i = this.slots.indexOf(slot);
    if (i >= 0) this.slots.splice(i, 1);
    slot.job = null;
    this.restarts += 1;
    void slot.worker.terminate();
    const seconds = current.job.timeoutMs / 1000;
    current.job.resolve({ ok: false, code: 'timeout', reason: `the solve was cut off after ${seconds < 10 ? seconds.toFixed(1) : Math.round(seconds)} s (its time budget ran out); simplify the ladder or retry` });
    this.pump();
  }

  /** Stop every thread and refuse what waits (tests; a clean shutdown). */
  async close(): Promise<void> {
    this.closed = true;
    for (const job of this.queue.splice(0)) {
      if (job.waitTimer) clearTimeout(job.waitTimer);
      job.resolve({ ok: false, code: 'error', reason: 'the solver is shutting down' });
    }
    const slots = this.slots.splice(0);
    for (const s of slots) {
      if (s.job) {
        clearTimeout(s.job.timer);
        s.job.job.resolve({ ok: false, code: 'error', reason: 'the solver is shutting down' });
        s.job = null;
      }
    }
    await Promise.all(slots.map((s) => s.worker.terminate()));
  }

  /** Threads alive now (for tests). */
  get threads(): number {
    return this.slots.length;
  }
}

const KEY = Symbol.for('kilorung.solvePool');
type Holder = { [KEY]?: SolvePool };

/** The process's pool (one per process, also across dev-server module reloads). */
export function solvePool(): SolvePool {
  const g = globalThis as Holder;
  if (!g[KEY]) g[KEY] = new SolvePool();
  return g[KEY];
}

/** Close the process's pool; the next {@link runSolve} starts a fresh one. */
export async function closeSolvePool(): Promise<void> {
  const g = globalThis as Holder;
  const pool = g[KEY];
  delete g[KEY];
  if (pool) await pool.close();
}

/**
 * Run one of the server's solves ({@link Tasks}) in the pool: its value, or a reason it has
 * none (cut off, busy, the thread lost, or the solve threw).
 */
export async function runSolve<N extends TaskName>(name: N, args: Parameters<Tasks[N]>, options: RunOptions): Promise<PoolResult<ReturnType<Tasks[N]>>> {
  return (await solvePool().run(name, args as unknown[], options)) as PoolResult<ReturnType<Tasks[N]>>;
}

/** The hard cut-off for a solve with engine budget `budgetMs`: the budget plus room for the set-up it does not count. */
export function cutOffFor(budgetMs: number): number {
  return Math.round(budgetMs * 1.5 + 5_000);
}
