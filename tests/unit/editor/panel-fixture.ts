/**
 * A real engine snapshot for the panel tests: a starter document run through the worker's own
 * request handler (compile → estimate → steady-state solve → warm-up), collected the way
 * `useEngine` assembles its snapshot.
 */
import type { DesignDocument } from '@/lib/circuit';
import { handleEngineRequest } from '@/lib/editor/engine/run';
import type { EngineReply } from '@/lib/editor/engine/protocol';
import type { EngineSnapshot } from '@/lib/editor/types';

export function engineSnapshot(document: DesignDocument, opts: { warmup?: boolean; version?: number } = {}): EngineSnapshot {
  const version = opts.version ?? 1;
  const replies: EngineReply[] = [];
  handleEngineRequest({ type: 'compile', version, document }, (r) => replies.push(r));
  handleEngineRequest({ type: 'solve', version, document, warmup: opts.warmup ?? false }, (r) => replies.push(r));
  const snap: EngineSnapshot = {
    status: 'idle',
    compiledVersion: null,
    solvedVersion: null,
    currentVersion: version,
    compile: null,
    estimate: null,
    solve: null,
    warmupPending: false,
    timings: {},
  };
  for (const r of replies) {
    if (r.type === 'compiled') Object.assign(snap, { compile: r.compile, estimate: r.estimate, compiledVersion: r.version, status: 'solving' });
    else if (r.type === 'solved') Object.assign(snap, { solve: r.solve, solvedVersion: r.version, status: 'solved', timings: { ...snap.timings, solveMs: r.timings.solveMs } });
    else if (r.type === 'warmup' && snap.solve && r.warmup) snap.solve = { ...snap.solve, warmup: r.warmup };
    else if (r.type === 'cannot-solve') Object.assign(snap, { status: 'cannot-solve', reason: r.reason });
    else if (r.type === 'invalid') throw new Error(`engine refused the request: ${r.reason}`);
  }
  return snap;
}
