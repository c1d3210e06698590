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
 * on the 2-core machine, one solve thread beside the request thread. The threads run at a lower
 * scheduling priority (SOLVE_NICE) and answers are reused (SOLVE_CACHE_SIZE), see below.
 */
import { createHash } from 'node:crypto';
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
  /**
   * Reuse the answer of the same task with the same arguments (default true): every task is a
   * pure function of its arguments, and a saved revision never changes, so a compare page opened
   * by five reviewers solves once. Only successful answers are kept, not a task's own
   * `{ ok: false }` ({@link SolveCache}).
   */
  cache?: boolean;
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
  /** The thread's Linux thread id and niceness as it reported them (null elsewhere). */
  tid: number | null;
  nice: number | null;
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
    const worker = new Worker(workerFile(), { workerData: { nice: solveNice() } });
    const slot: Slot = { worker, ready: false, tid: null, nice: null, job: null };
    worker.on('message', (msg: { ready?: true; tid?: number | null; nice?: number | null; id?: number; ok?: boolean; value?: unknown; error?: string }) => {
      if (msg.ready) {
        slot.ready = true;
        slot.tid = msg.tid ?? null;
        slot.nice = msg.nice ?? null;
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

  /**
   * Start the threads now, before any task, so the first solve does not wait for a thread to load
   * the engine (about 1–2 s on the 2-core machine). Idle threads do not keep the process alive.
   */
  warm(): void {
    if (this.closed) return;
    while (this.slots.length < this.size) this.spawn();
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

  /** Each started thread's Linux thread id and the niceness it set (for tests). */
  get threadPriorities(): { tid: number | null; nice: number | null }[] {
    return this.slots.filter((s) => s.ready).map((s) => ({ tid: s.tid, nice: s.nice }));
  }

  /** Answers kept for reuse. */
  readonly cache = new SolveCache(solveCacheSize());
}

/**
 * The niceness of the solve threads (SOLVE_NICE, 0–19, default 10). On Linux each thread lowers
 * its own scheduling priority (setpriority on its thread id), so when the cores are busy the
 * request thread and PostgreSQL go first and a burst of solves slows other solves, not the
 * list, open and save requests. Elsewhere the setting is ignored.
 */
function solveNice(): number {
  const n = Number(process.env.SOLVE_NICE);
  return Number.isInteger(n) && n >= 0 && n <= 19 ? n : 10;
}

function solveCacheSize(): number {
  const n = Number(process.env.SOLVE_CACHE_SIZE);
  return Number.isInteger(n) && n >= 0 && n <= 10_000 ? n : 200;
}

/**
 * A task's own `{ ok: false, reason }` (every task answers so: the engine ran out of its budget,
 * the drawing does not compile, …). Not kept: a budget can run out only because the cores were
 * busy at that moment, and the next ask deserves a fresh try.
 */
function isTypedFailure(value: unknown): boolean {
  return typeof value === 'object' && value !== null && (value as { ok?: unknown }).ok === false;
}

/**
 * Successful answers by task and arguments (a SHA-256 of the task name and the arguments' JSON),
 * least recently used out first, plus the solves in flight, so that callers asking the same
 * thing at the same moment share one solve. Each caller gets its own copy of the answer.
 */
export class SolveCache {
  private readonly done = new Map<string, unknown>();
  private readonly inFlight = new Map<string, Promise<PoolResult<unknown>>>();
  hits = 0;
  misses = 0;
  constructor(readonly capacity: number) {}

  static key(name: string, args: unknown[]): string {
    return createHash('sha256').update(name).update('\0').update(JSON.stringify(args)).digest('base64url');
  }

  async get(key: string, solve: () => Promise<PoolResult<unknown>>): Promise<PoolResult<unknown>> {
    if (this.done.has(key)) {
      const value = this.done.get(key);
      this.done.delete(key); // most recently used goes last
      this.done.set(key, value);
      this.hits += 1;
      return { ok: true, value: structuredClone(value) };
    }
    let pending = this.inFlight.get(key);
    if (pending) this.hits += 1;
    else {
      this.misses += 1;
      pending = solve().then((r) => {
        this.inFlight.delete(key);
        if (r.ok && this.capacity > 0 && !isTypedFailure(r.value)) {
          this.done.set(key, r.value);
          while (this.done.size > this.capacity) this.done.delete(this.done.keys().next().value as string);
        }
        return r;
      });
      this.inFlight.set(key, pending);
    }
    const r = await pending;
    return r.ok ? { ok: true, value: structuredClone(r.value) } : r;
  }

  get size(): number {
    return this.done.size;
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
 * Start the process's solve threads in the background (the web server calls this on its first
 * API request: lib/api/handler.ts). Without it the first compare page after a start waits for a
 * thread to load the engine, and every request behind it waits too.
 */
export function warmSolvePool(): void {
  solvePool().warm();
}

/**
 * Run one of the server's solves ({@link Tasks}) in the pool: its value, or a reason it has
 * none (cut off, busy, the thread lost, or the solve threw).
 */
export async function runSolve<N extends TaskName>(name: N, args: Parameters<Tasks[N]>, options: RunOptions): Promise<PoolResult<ReturnType<Tasks[N]>>> {
  const pool = solvePool();
  const solve = () => pool.run(name, args as unknown[], options);
  const r = options.cache === false ? await solve() : await pool.cache.get(SolveCache.key(name, args as unknown[]), solve);
  return r as PoolResult<ReturnType<Tasks[N]>>;
}

/** The hard cut-off for a solve with engine budget `budgetMs`: the budget plus room for the set-up it does not count. */
export function cutOffFor(budgetMs: number): number {
  return Math.round(budgetMs * 1.5 + 5_000);
}
