/**
 * Scheduling of the engine workers, with fake workers the test answers by hand (so a "running"
 * solve can be overtaken by a newer edit), and once end to end with the real request handler
 * running in-process behind the same worker interface.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { halfWaveStarter, type DesignDocument } from '@/lib/circuit';
import { EngineController, type EngineWorker } from '@/lib/editor/engine/controller';
import type { EngineReply, EngineRequest } from '@/lib/editor/engine/protocol';
import { handleEngineRequest } from '@/lib/editor/engine/run';
import type { CompileView, SolveView } from '@/lib/editor/types';

class FakeWorker implements EngineWorker {
  sent: EngineRequest[] = [];
  terminated = false;
  onmessage: ((event: { data: EngineReply }) => void) | null = null;
  onerror: ((event: { message?: string }) => void) | null = null;
  constructor(readonly role: 'compile' | 'solve') {}
  postMessage(message: EngineRequest): void {
    this.sent.push(message);
  }
  terminate(): void {
    this.terminated = true;
  }
  reply(data: EngineReply): void {
    if (!this.terminated) this.onmessage?.({ data });
  }
}

const O = { amplitudeV: 1000, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 1e-4 };
const okCompile = { ok: true, badge: { kind: 'half-wave', stages: 2, polarity: 'positive', label: 'Half-wave · 2 stages · +' }, diagnostics: [], nodeOfPort: {}, nodeLabels: {}, outputs: [], netlistText: 'x' } as CompileView;
const aSolve = { periodS: 1e-3, frequencyHz: 1e3, outputs: [], nodes: {}, parts: [] } as unknown as SolveView;

describe('engine controller scheduling', () => {
  let clock = 0;
  let workers: FakeWorker[] = [];
  let controller: EngineController;
  const of = (role: 'compile' | 'solve') => workers.filter((w) => w.role === role);
  /** The worker that holds the role's current job (a spare solve worker has no messages yet). */
  const live = (role: 'compile' | 'solve') => of(role).filter((w) => !w.terminated && w.sent.some((m) => m.type === role)).at(-1) as FakeWorker;
  /** Requests of real work a worker got (a spare's priming left out). */
  const jobsOf = (w: FakeWorker) => w.sent.filter((m) => m.type !== 'prime') as Extract<EngineRequest, { document: unknown }>[];
  const PRIME = { type: 'prime', version: 0 };

  beforeEach(() => {
    vi.useFakeTimers();
    clock = 1000;
    workers = [];
    controller = new EngineController(
      (role) => {
        const w = new FakeWorker(role);
        workers.push(w);
        return w;
      },
      { debounceMs: 12, now: () => clock },
    );
  });
  afterEach(() => {
    controller.dispose();
    vi.useRealTimers();
  });

  it('coalesces a burst of edits into one job per worker, with the latest document', () => {
    const docs = [1, 2, 3].map((n) => halfWaveStarter(n, O));
    docs.forEach((d, i) => controller.update(d, i + 1));
    expect(controller.getSnapshot()).toMatchObject({ status: 'compiling', currentVersion: 3 });
    // Workers start at the first edit, so loading the engine overlaps the coalescing window.
    expect(workers.map((w) => [w.role, w.sent.length])).toEqual([
      ['compile', 0],
      ['solve', 0],
    ]);
    vi.advanceTimersByTime(12);
    expect(of('compile')).toHaveLength(1);
    expect(of('solve').map((w) => w.sent.length)).toEqual([1]);
    expect(live('compile').sent).toHaveLength(1);
    expect(live('compile').sent[0]).toMatchObject({ type: 'compile', document: docs[2] });
    expect(live('solve').sent[0]).toMatchObject({ type: 'solve', document: docs[2], warmup: true });
  });

  it('shows the estimate, then the solve, then the warm-up, with edit → shown times', () => {
    controller.noteVersion(1); // the hook saw version 1 at t = 1000 ms
    clock = 1003;
    controller.update(halfWaveStarter(2, O), 1);
    vi.advanceTimersByTime(12);
    const id = live('compile').sent[0].version;
    clock = 1020;
    live('compile').reply({ type: 'compiled', version: id, compile: okCompile, estimate: null, timings: { compileMs: 2, estimateMs: 0.5 } });
    expect(controller.getSnapshot()).toMatchObject({ status: 'solving', compiledVersion: 1, compile: okCompile, timings: { compileMs: 2, estimateMs: 0.5, editToEstimateMs: 20 } });
    clock = 1300;
    live('solve').reply({ type: 'solved', version: id, solve: aSolve, timings: { solveMs: 250 } });
    expect(controller.getSnapshot()).toMatchObject({ status: 'solved', solvedVersion: 1, warmupPending: true, timings: { solveMs: 250, editToSolveMs: 300 } });
    const warm = { t90S: 0.01, t99S: 0.02, cycles90: 10, cycles99: 20, curve: { cycles: [0, 1], meanV: [0, 1] } };
    live('solve').reply({ type: 'warmup', version: id, warmup: warm, timings: { warmupMs: 900 } });
    expect(controller.getSnapshot()).toMatchObject({ status: 'solved', warmupPending: false, solve: { warmup: warm }, timings: { warmupMs: 900 } });
  });

  it('terminates a busy solve worker when a newer document arrives, and ignores the old job', () => {
    controller.update(halfWaveStarter(2, O), 1);
    vi.advanceTimersByTime(12);
    const first = live('solve');
    const oldId = first.sent[0].version;
    live('compile').reply({ type: 'compiled', version: oldId, compile: okCompile, estimate: null, timings: {} });
    const doc2 = halfWaveStarter(3, O);
    controller.update(doc2, 2);
    expect(controller.getSnapshot()).toMatchObject({ status: 'compiling', currentVersion: 2, compiledVersion: 1 });
    vi.advanceTimersByTime(12);
    expect(first.terminated).toBe(true);
    const second = live('solve');
    expect(second).not.toBe(first);
    expect(second.sent).toEqual([expect.objectContaining({ type: 'solve', document: doc2 })]);
    // No spare is started while the new solve runs (it would take CPU from it).
    expect(of('solve').map((w) => [w.terminated, jobsOf(w).length])).toEqual([
      [true, 1],
      [false, 1],
    ]);
    // The compile worker is not restarted: it was idle and takes the new job.
    expect(of('compile')).toHaveLength(1);
    expect(live('compile').sent).toHaveLength(2);
    // A late message of the old job (from the terminated worker's queue) changes nothing.
    first.terminated = false;
    first.reply({ type: 'solved', version: oldId, solve: aSolve, timings: {} });
    expect(controller.getSnapshot().solve).toBeNull();
  });

  it('hands an edit that overtakes a warm-up to the spare started when the warm-up began', () => {
    controller.update(halfWaveStarter(2, O), 1);
    vi.advanceTimersByTime(12);
    const first = live('solve');
    const id = first.sent[0].version;
    live('compile').reply({ type: 'compiled', version: id, compile: okCompile, estimate: null, timings: {} });
    expect(of('solve')).toHaveLength(1);
    first.reply({ type: 'solved', version: id, solve: aSolve, timings: {} });
    expect(of('solve')).toHaveLength(2); // the spare, started as the warm-up begins
    const spare = of('solve')[1];
    expect(spare.sent).toEqual([PRIME]);
    // Its priming reply is no job of the editor's and changes nothing.
    const before = controller.getSnapshot();
    spare.reply({ type: 'primed', version: 0, timings: { solveMs: 80 } });
    expect(controller.getSnapshot()).toBe(before);
    controller.update(halfWaveStarter(3, O), 2);
    vi.advanceTimersByTime(12);
    expect(first.terminated).toBe(true);
    expect(spare.sent).toEqual([PRIME, expect.objectContaining({ type: 'solve', document: halfWaveStarter(3, O) })]);
    // The old warm-up will not come: the shown (older) solve is no longer waiting for one.
    expect(controller.getSnapshot()).toMatchObject({ solvedVersion: 1, warmupPending: false, status: 'compiling' });
    expect(of('solve')).toHaveLength(2);
    // When the new solve hands over to its warm-up, the next spare starts.
    spare.reply({ type: 'solved', version: jobsOf(spare)[0].version, solve: aSolve, timings: {} });
    expect(of('solve')).toHaveLength(3);
    expect(of('solve')[2].sent).toEqual([PRIME]);
  });

  it('keeps the compile worker to one job at a time and then sends only the latest edit', () => {
    controller.update(halfWaveStarter(1, O), 1);
    vi.advanceTimersByTime(12);
    const cw = live('compile');
    const id1 = cw.sent[0].version;
    controller.update(halfWaveStarter(2, O), 2);
    vi.advanceTimersByTime(12);
    controller.update(halfWaveStarter(3, O), 3);
    vi.advanceTimersByTime(12);
    expect(cw.sent).toHaveLength(1); // still busy with version 1
    cw.reply({ type: 'compiled', version: id1, compile: okCompile, estimate: null, timings: {} });
    // An older compile is shown (marked by compiledVersion) but the status stays "compiling".
    expect(controller.getSnapshot()).toMatchObject({ compiledVersion: 1, currentVersion: 3, status: 'compiling' });
    expect(cw.sent).toHaveLength(2);
    expect(jobsOf(cw)[1].document).toEqual(halfWaveStarter(3, O));
  });

  it('starts no job for an edit that only moves blocks; the results carry over to the new version', () => {
    const doc = halfWaveStarter(2, O);
    controller.update(doc, 1);
    vi.advanceTimersByTime(12);
    const id = live('solve').sent[0].version;
    live('compile').reply({ type: 'compiled', version: id, compile: okCompile, estimate: null, timings: {} });
    const moved: DesignDocument = { ...doc, blocks: doc.blocks.map((b) => (b.id === 's1' ? { ...b, position: { x: b.position.x + 40, y: b.position.y - 8 } } : b)) };
    controller.update(moved, 2);
    vi.advanceTimersByTime(12);
    expect(live('compile').sent).toHaveLength(1);
    expect(live('solve').sent).toHaveLength(1);
    expect(controller.getSnapshot()).toMatchObject({ currentVersion: 2, compiledVersion: 2, solvedVersion: null, status: 'solving' });
    // The solve still running for version 1 arrives and is filed under version 2.
    live('solve').reply({ type: 'solved', version: id, solve: aSolve, timings: {} });
    expect(controller.getSnapshot()).toMatchObject({ currentVersion: 2, solvedVersion: 2, status: 'solved' });
    // Renaming a block is an edit the results show (labels), so it is compiled again.
    controller.update({ ...moved, blocks: moved.blocks.map((b) => (b.id === 's1' ? { ...b, label: 'Bottom stage' } : b)) }, 3);
    vi.advanceTimersByTime(12);
    expect(live('compile').sent).toHaveLength(2);
  });

  it('says "solved" only once the compile of the same edit is shown, whichever arrives first', () => {
    controller.update(halfWaveStarter(2, O), 1);
    vi.advanceTimersByTime(12);
    const id = live('solve').sent[0].version;
    live('solve').reply({ type: 'solved', version: id, solve: aSolve, timings: {} });
    expect(controller.getSnapshot()).toMatchObject({ status: 'compiling', solvedVersion: 1, compiledVersion: null });
    live('compile').reply({ type: 'compiled', version: id, compile: okCompile, estimate: null, timings: {} });
    expect(controller.getSnapshot()).toMatchObject({ status: 'solved', solvedVersion: 1, compiledVersion: 1, warmupPending: true });
  });

  it('reports compile errors, solver failures and dead workers as cannot-solve with the reason', () => {
    controller.update(halfWaveStarter(2, O), 1);
    vi.advanceTimersByTime(12);
    const id = live('compile').sent[0].version;
    live('compile').reply({ type: 'compiled', version: id, compile: { ...okCompile, ok: false, reason: 'src: the source terminals are wired together (shorted)' }, estimate: null, timings: {} });
    expect(controller.getSnapshot()).toMatchObject({ status: 'cannot-solve', reason: 'src: the source terminals are wired together (shorted)' });

    controller.update(halfWaveStarter(3, O), 2);
    vi.advanceTimersByTime(12);
    const id2 = live('solve').sent[0].version;
    live('compile').reply({ type: 'compiled', version: id2, compile: okCompile, estimate: null, timings: {} });
    live('solve').reply({ type: 'cannot-solve', version: id2, reason: 'no periodic steady state within the budget', timings: {} });
    expect(controller.getSnapshot()).toMatchObject({ status: 'cannot-solve', reason: 'no periodic steady state within the budget', warmupPending: false });

    controller.update(halfWaveStarter(4, O), 3);
    vi.advanceTimersByTime(12);
    const dead = live('solve');
    dead.onerror?.({ message: 'out of memory' });
    expect(dead.terminated).toBe(true);
    expect(controller.getSnapshot()).toMatchObject({ status: 'cannot-solve', reason: 'the engine worker stopped: out of memory' });
  });
});

describe('engine controller with the real engine in-process', () => {
  it('ends solved with the output reading of the solve', async () => {
    const doc: DesignDocument = halfWaveStarter(2, O);
    const factory = () => {
      let alive = true;
      const w: EngineWorker = {
        onmessage: null,
        onerror: null,
        postMessage(message) {
          setTimeout(() => handleEngineRequest(message, (data) => alive && w.onmessage?.({ data })), 0);
        },
        terminate() {
          alive = false;
        },
      };
      return w;
    };
    const controller = new EngineController(factory, { debounceMs: 1 });
    const done = new Promise<void>((resolve) =>
      controller.subscribe(() => {
        const s = controller.getSnapshot();
        if (s.status === 'solved' && !s.warmupPending) resolve();
      }),
    );
    controller.update(doc, 5);
    await done;
    const s = controller.getSnapshot();
    expect(s).toMatchObject({ compiledVersion: 5, solvedVersion: 5, currentVersion: 5 });
    expect(s.compile?.badge.label).toBe('Half-wave · 2 stages · +');
    const out = s.solve!.outputs[0].node;
    expect(s.solve!.nodes[out].label).toBe('Output +');
    // 2nVp = 4 kV less a small load drop.
    expect(s.solve!.nodes[out].meanV).toBeGreaterThan(3900);
    expect(s.solve!.warmup?.cycles90).toBeGreaterThan(1);
    expect(s.timings.editToEstimateMs).toBeGreaterThanOrEqual(0);
    expect(s.timings.editToSolveMs).toBeGreaterThanOrEqual(s.timings.editToEstimateMs!);
    controller.dispose();
  });
});
