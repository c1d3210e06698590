/**
 * The editor side of the engine: schedules compile and solve jobs on two workers and keeps the
 * {@link EngineSnapshot} the canvas and the panel read (a small external store: `subscribe` /
 * `getSnapshot`, as `useSyncExternalStore` wants).
 *
 * Scheduling, so the UI never waits on the solver:
 * - edits are coalesced for `debounceMs` after the first one of a burst (a throttle, so a drag
 *   that edits every frame still gets an estimate every `debounceMs`);
 * - the compile worker is only ever given the latest document, one job at a time (compile and
 *   estimate take milliseconds, so it is always free for the next edit);
 * - the solve worker runs a synchronous solve and cannot be interrupted, so when a newer
 *   document arrives while it is busy (solve or warm-up) it is terminated and a spare worker,
 *   started in advance with the engine loaded and primed by one small solve, takes the new
 *   job. The spare is started when a solve hands over to its warm-up, never while a solve
 *   the editor waits for is running: loading and priming it would take CPU from that solve.
 * An edit that only moves blocks starts no job: the circuit is the same, so the results carry
 * over to the new version. Jobs carry their own increasing ids, so late replies of an older job are never mistaken for
 * the current one even if the editor's version counter restarts.
 */
import type { DesignDocument } from '@/lib/circuit';
import type { EngineSnapshot } from '../types';
import type { EngineReply, EngineRequest } from './protocol';

/** The part of `Worker` the controller uses (so tests can run the engine in-process). */
export interface EngineWorker {
  postMessage(message: EngineRequest): void;
  terminate(): void;
  onmessage: ((event: { data: EngineReply }) => void) | null;
  onerror: ((event: { message?: string }) => void) | null;
}

export type EngineWorkerFactory = (role: 'compile' | 'solve') => EngineWorker;

export interface EngineControllerOptions {
  /** Coalescing window after the first edit of a burst (ms). Default 12. */
  debounceMs?: number;
  /** Run the warm-up after each steady-state solve. Default true. */
  warmup?: boolean;
  /** Clock (ms); default `performance.now`. */
  now?: () => number;
  /**
   * Send the first edit of a burst at once (leading edge) instead of after the coalescing window:
   * the compile job always, the solve job when the solve worker is idle (a busy one is replaced
   * only after the window, so a burst does not throw away several workers). Edits inside the
   * window are coalesced into one job sent when it closes. Default false.
   */
  immediate?: boolean;
}

interface Job {
  id: number;
  /** Editor version and document the job's results are shown for (moved forward by moves, see `update`). */
  version: number;
  document: DesignDocument;
  /** {@link electricalKey} of the document. */
  key: string;
}

/**
 * What the engine's results depend on: the document without block positions (a move changes
 * the drawing, not the circuit). Labels stay in, since node and part labels show them.
 */
export function electricalKey(doc: DesignDocument): string {
  return JSON.stringify([doc.blocks.map(({ position: _p, ...rest }) => rest), doc.wires, doc.settings]);
}

/** The snapshot before any document was seen. */
export function initialSnapshot(version = 0): EngineSnapshot {
  return { status: 'idle', compiledVersion: null, solvedVersion: null, currentVersion: version, compile: null, estimate: null, solve: null, warmupPending: false, timings: {} };
}

export class EngineController {
  private snapshot: EngineSnapshot = initialSnapshot();
  private readonly listeners = new Set<() => void>();
  private readonly debounceMs: number;
  private readonly warmup: boolean;
  private readonly now: () => number;
  private readonly immediate: boolean;
  /** Id of the last job given to a solve worker. */
  private solveSent = 0;
  /** When the editor first saw each version (ms, `now()` clock). */
  private readonly seenAt = new Map<number, number>();
  private latest: Job | null = null;
  private nextId = 1;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private compileWorker: EngineWorker | null = null;
  private compileBusy: Job | null = null;
  /** Id of the last job given to the compile worker. */
  private compileSent = 0;
  private solveWorker: EngineWorker | null = null;
  private solveBusy: Job | null = null;
  /** A started, idle solve worker waiting to replace a terminated one. */
  private spare: EngineWorker | null = null;
  /** Jobs already sent to each worker, by id (until their last reply). */
  private readonly jobs = { compile: new Map<number, Job>(), solve: new Map<number, Job>() };
  private disposed = false;
  /** Last job whose compile, steady-state solve or solve failure arrived. */
  private compiledId = 0;
  private solvedId = 0;
  private failedId = 0;

  constructor(
    private readonly factory: EngineWorkerFactory,
    options: EngineControllerOptions = {},
  ) {
    this.debounceMs = options.debounceMs ?? 12;
    this.warmup = options.warmup ?? true;
    this.now = options.now ?? (() => performance.now());
    this.immediate = options.immediate ?? false;
  }

  readonly subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  readonly getSnapshot = (): EngineSnapshot => this.snapshot;

  /** Record when a version was first seen (the start of the edit → shown timings). Idempotent. */
  noteVersion(version: number): void {
    if (!this.seenAt.has(version)) this.seenAt.set(version, this.now());
    if (this.seenAt.size > 64) this.seenAt.delete(this.seenAt.keys().next().value as number);
  }

  /** A new document (or version) is on the canvas: mark results out of date and schedule the jobs. */
  update(document: DesignDocument, version: number): void {
    if (this.latest && this.latest.version === version && this.latest.document === document && !this.disposed) return;
    this.noteVersion(version);
    const key = electricalKey(document);
    if (this.latest && this.latest.key === key && !this.disposed) {
      // Only moved: the results of the previous version (shown or on their way) stand for this
      // one. The job is updated in place, so replies still to come are filed under the new version.
      const previous = this.latest.version;
      this.latest.version = version;
      this.latest.document = document;
      const s = this.snapshot;
      this.set({
        ...s,
        currentVersion: version,
        compiledVersion: s.compiledVersion === previous ? version : s.compiledVersion,
        solvedVersion: s.solvedVersion === previous ? version : s.solvedVersion,
      });
      return;
    }
    this.disposed = false;
    this.latest = { id: this.nextId++, version, document, key };
    this.set({ ...this.snapshot, currentVersion: version, status: 'compiling', reason: undefined });
    // Start the workers now, so that loading the engine overlaps the coalescing window.
    this.compileWorker ??= this.spawn('compile');
    this.solveWorker ??= this.spawn('solve');
    if (this.timer !== null) return;
    if (this.immediate) {
      // The worker starts on this edit while the main thread is still drawing it.
      this.sendCompile(this.latest);
      if (!this.solveBusy) this.sendSolve(this.latest);
    }
    this.timer = setTimeout(() => this.flush(), this.debounceMs);
  }

  /** Stop both workers and pending timers (the editor unmounted). A later `update` starts again. */
  dispose(): void {
    this.disposed = true;
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
    this.compileWorker?.terminate();
    this.solveWorker?.terminate();
    this.spare?.terminate();
    this.compileWorker = this.solveWorker = this.spare = null;
    this.compileBusy = this.solveBusy = null;
    this.compileSent = 0;
    this.jobs.compile.clear();
    this.jobs.solve.clear();
    if (this.snapshot.warmupPending) this.set({ ...this.snapshot, warmupPending: false });
  }

  private set(next: EngineSnapshot): void {
    this.snapshot = next;
    for (const l of [...this.listeners]) l();
  }

  private flush(): void {
    this.timer = null;
    const job = this.latest;
    if (!job || this.disposed) return;
    this.sendCompile(job);
    if (job.id > this.solveSent) this.sendSolve(job);
  }

  private elapsedSince(version: number): number | undefined {
    const t = this.seenAt.get(version);
    return t === undefined ? undefined : this.now() - t;
  }

  private sendCompile(job: Job): void {
    if (this.compileBusy || job.id <= this.compileSent) return; // a busy worker gets the latest job when it answers
    this.compileSent = job.id;
    const worker = (this.compileWorker ??= this.spawn('compile'));
    this.compileBusy = job;
    this.jobs.compile.set(job.id, job);
    worker.postMessage({ type: 'compile', version: job.id, document: job.document });
  }

  private sendSolve(job: Job): void {
    if (this.solveBusy) {
      // The solver cannot be interrupted: drop that worker with its solve and start afresh.
      this.solveWorker?.terminate();
      this.solveWorker = this.spare;
      this.spare = null;
      this.jobs.solve.delete(this.solveBusy.id);
      this.solveBusy = null;
      if (this.snapshot.warmupPending) this.set({ ...this.snapshot, warmupPending: false });
    }
    this.solveWorker ??= this.spawn('solve');
    this.solveSent = job.id;
    this.solveBusy = job;
    this.jobs.solve.set(job.id, job);
    this.solveWorker.postMessage({ type: 'solve', version: job.id, document: job.document, warmup: this.warmup });
  }

  /** Start a spare solve worker (if there is none) and have it prime itself with a small solve. */
  private startSpare(): void {
    if (this.spare) return;
    this.spare = this.spawn('solve');
    this.spare.postMessage({ type: 'prime', version: 0 });
  }

  private spawn(role: 'compile' | 'solve'): EngineWorker {
    const worker = this.factory(role);
    worker.onmessage = (event) => {
      if (worker === (role === 'compile' ? this.compileWorker : this.solveWorker)) this.receive(role, event.data);
    };
    worker.onerror = (event) => {
      if (worker === this.spare) {
        // A spare that failed to start is replaced when it is next needed.
        worker.terminate();
        this.spare = null;
      } else if (worker === (role === 'compile' ? this.compileWorker : this.solveWorker)) this.fail(role, `the engine worker stopped: ${event.message ?? 'script error'}`);
    };
    return worker;
  }

  /** A worker died (script error, out of memory): report it and let the next edit start a new one. */
  private fail(role: 'compile' | 'solve', reason: string): void {
    const busy = role === 'compile' ? this.compileBusy : this.solveBusy;
    if (role === 'compile') {
      this.compileWorker?.terminate();
      this.compileWorker = null;
      this.compileBusy = null;
    } else {
      this.solveWorker?.terminate();
      this.solveWorker = null;
      this.solveBusy = null;
    }
    if (busy) this.jobs[role].delete(busy.id);
    if (busy && busy.id === this.latest?.id) this.set({ ...this.snapshot, status: 'cannot-solve', reason, warmupPending: false });
  }

  private receive(role: 'compile' | 'solve', reply: EngineReply): void {
    const job = reply.version === null ? undefined : this.jobs[role].get(reply.version);
    if (!job) return;
    const current = this.latest?.id === job.id;
    const s = this.snapshot;
    switch (reply.type) {
      case 'compiled': {
        this.jobs.compile.delete(job.id);
        this.compileBusy = null;
        this.compiledId = job.id;
        let status: Partial<EngineSnapshot> = {};
        if (current && !reply.compile.ok) status = { status: 'cannot-solve', reason: reply.compile.reason };
        else if (current) status = this.solvedId === job.id ? { status: 'solved' } : this.failedId === job.id ? {} : { status: 'solving' };
        this.set({
          ...s,
          ...status,
          compile: reply.compile,
          estimate: reply.estimate,
          compiledVersion: job.version,
          timings: { ...s.timings, compileMs: reply.timings.compileMs, estimateMs: reply.timings.estimateMs, editToEstimateMs: this.elapsedSince(job.version) },
        });
        // A newer edit already past its coalescing window waited for this compile to finish.
        if (this.latest && !current && this.timer === null && !this.disposed) this.sendCompile(this.latest);
        return;
      }
      case 'solved':
        this.solvedId = job.id;
        this.set({
          ...s,
          solve: reply.solve,
          solvedVersion: job.version,
          warmupPending: this.warmup,
          // "solved" once the compile of the same edit is shown too (it normally arrives first).
          ...(current && this.compiledId === job.id ? { status: 'solved', reason: undefined } : {}),
          timings: { ...s.timings, solveMs: reply.timings.solveMs, warmupMs: undefined, editToSolveMs: this.elapsedSince(job.version) },
        });
        if (!this.warmup) this.solveDone(job);
        // The warm-up keeps this worker busy for a while: have a spare ready for the next edit.
        else if (!this.disposed) this.startSpare();
        return;
      case 'warmup':
        this.solveDone(job);
        if (this.solvedId !== job.id || !s.solve) return;
        this.set({
          ...s,
          solve: reply.warmup ? { ...s.solve, warmup: reply.warmup } : s.solve,
          warmupPending: false,
          timings: { ...s.timings, warmupMs: reply.timings.warmupMs },
        });
        return;
      case 'cannot-solve':
        this.solveDone(job);
        this.failedId = job.id;
        if (current) this.set({ ...s, warmupPending: false, status: 'cannot-solve', reason: reply.reason, timings: { ...s.timings, solveMs: reply.timings.solveMs } });
        return;
      case 'invalid':
        if (role === 'compile') {
          this.compileBusy = null;
          this.jobs.compile.delete(job.id);
        } else this.solveDone(job);
        if (current) this.set({ ...s, status: 'cannot-solve', reason: `the engine refused the document: ${reply.reason}`, warmupPending: false });
        return;
    }
  }

  private solveDone(job: Job): void {
    this.jobs.solve.delete(job.id);
    if (this.solveBusy?.id === job.id) this.solveBusy = null;
  }
}
