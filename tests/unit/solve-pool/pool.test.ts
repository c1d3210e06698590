/**
 * The solve pool (lib/solve-pool): the server's solves run in worker threads with a hard
 * cut-off, so a long solve neither hangs its caller nor holds up the request thread (issue 7).
 * Real threads, the real engine; no mocks.
 */
import { readFileSync } from 'node:fs';
import os from 'node:os';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { designDocumentSchema } from '@/lib/circuit/document/schema';
import { halfWaveStarter } from '@/lib/circuit/document/starters';
import { resultsOf } from '@/lib/compare/results';
import { pooledResultsOf } from '@/lib/compare/pooled';
import { closeSolvePool, cutOffFor, runSolve, SolveCache, solvePool } from '@/lib/solve-pool';

const doc = (stages: number) => designDocumentSchema.parse(halfWaveStarter(stages, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 }));

const sizeBefore = process.env.SOLVE_POOL_SIZE;
beforeAll(async () => {
  await closeSolvePool();
  process.env.SOLVE_POOL_SIZE = '1'; // one thread, as on the 2-core machine
});
afterAll(async () => {
  await closeSolvePool();
  if (sizeBefore === undefined) delete process.env.SOLVE_POOL_SIZE;
  else process.env.SOLVE_POOL_SIZE = sizeBefore;
});

describe('the solve pool', () => {
  it('gives the same figures as the solve on the calling thread', async () => {
    const d = doc(3);
    const pooled = await runSolve('resultsOf', [d], { timeoutMs: 30_000 });
    expect(pooled.ok).toBe(true);
    expect(pooled.ok && pooled.value).toEqual(resultsOf(d));
    const side = await pooledResultsOf(d);
    expect(side.ok && side.outputDcV).toBeGreaterThan(5000); // 3 stages × 2 × 2 kV ideal, less sag
  }, 60_000);

  it('keeps the calling thread free while it solves', async () => {
    await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000 }); // the thread is up and warm
    let ticks = 0;
    let worstLag = 0;
    let last = performance.now();
    const timer = setInterval(() => {
      const now = performance.now();
      worstLag = Math.max(worstLag, now - last - 10);
      last = now;
      ticks += 1;
    }, 10);
    const t0 = performance.now();
    const r = await runSolve('resultsOf', [doc(60), 1500], { timeoutMs: 30_000 });
    const ms = performance.now() - t0;
    clearInterval(timer);
    console.info(`[solve-pool] 60-stage solve ${ms.toFixed(0)} ms in the pool; ${ticks} timer ticks meanwhile, worst lag ${worstLag.toFixed(0)} ms`);
    expect(r.ok).toBe(true); // the engine's own answer (ok or its budget reason), not a cut-off
    expect(ms).toBeGreaterThan(300); // long enough to matter (the 300 ms budget cuts it: tests/routes/faults.test.ts)
    // on the calling thread the timer could not have ticked at all until the solve ended
    expect(ticks).toBeGreaterThan(ms / 10 / 4);
    expect(worstLag).toBeLessThan(250);
  }, 60_000);

  it('cuts off a solve past its hard limit, answers with a message, and carries on with a fresh thread', async () => {
    const pool = solvePool();
    const restarts = pool.restarts;
    const t0 = performance.now();
    // a budget the engine would honour far too late: only the pool's cut-off can end it in time
    const r = await runSolve('resultsOf', [doc(200), 120_000], { timeoutMs: 800 });
    const ms = performance.now() - t0;
    expect(r).toEqual({ ok: false, code: 'timeout', reason: expect.stringMatching(/cut off after 0\.8 s/) });
    expect(ms).toBeLessThan(800 + 2000);
    expect(pool.restarts).toBe(restarts + 1);
    const next = await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000, cache: false });
    expect(next.ok && next.value.ok).toBe(true);
  }, 60_000);

  it('answers busy, not never, when every thread stays occupied past the wait limit', async () => {
    const long = runSolve('resultsOf', [doc(200), 120_000], { timeoutMs: 3000 });
    const waiting = await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000, waitMs: 200, cache: false });
    expect(waiting).toEqual({ ok: false, code: 'busy', reason: expect.stringMatching(/busy.*retry/) });
    expect((await long).ok).toBe(false);
  }, 60_000);

  it('turns a solve that throws into a reason', async () => {
    const r = await runSolve('resultsOf', [null as never], { timeoutMs: 30_000 });
    expect(r).toEqual({ ok: false, code: 'error', reason: expect.stringMatching(/^the solve failed: /) });
    expect((await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000, cache: false })).ok).toBe(true);
  }, 60_000);

  it('runs its threads at a lower scheduling priority than the request thread (Linux)', async () => {
    await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000, cache: false });
    const threads = solvePool().threadPriorities;
    expect(threads.length).toBeGreaterThan(0);
    if (process.platform !== 'linux') return;
    const own = os.getPriority();
    for (const t of threads) {
      expect(t.tid).toBeGreaterThan(0);
      expect(t.nice).toBe(Math.max(own, 10));
      // the kernel's own word: field 19 of /proc/<pid>/task/<tid>/stat is the thread's nice value
      const stat = readFileSync(`/proc/${process.pid}/task/${t.tid}/stat`, 'utf8');
      const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      expect(Number(fields[16])).toBe(Math.max(own, 10));
    }
    expect(os.getPriority()).toBe(own); // the calling thread is untouched
  }, 60_000);
});

describe('starting early', () => {
  it('starts its threads before any task, and a warm thread answers without the start-up wait', async () => {
    await closeSolvePool();
    const pool = solvePool();
    expect(pool.threads).toBe(0);
    pool.warm();
    expect(pool.threads).toBe(pool.size);
    const until = Date.now() + 30_000;
    while (pool.threadPriorities.length < pool.size && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
    expect(pool.threadPriorities.length).toBe(pool.size); // every thread loaded the engine and said ready
    pool.warm(); // again: no more threads
    expect(pool.threads).toBe(pool.size);
    const t0 = performance.now();
    const r = await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000, cache: false });
    const ms = performance.now() - t0;
    console.info(`[solve-pool] first solve on a warmed thread ${ms.toFixed(0)} ms`);
    expect(r.ok).toBe(true);
    expect(pool.threads).toBe(pool.size);
  }, 60_000);
});

describe('reusing answers', () => {
  it('solves the same revision once: a second ask is a kept copy, and callers cannot spoil it for each other', async () => {
    const pool = solvePool();
    const d = doc(4);
    const misses = pool.cache.misses;
    const t0 = performance.now();
    const first = await runSolve('resultsOf', [d], { timeoutMs: 30_000 });
    const solvedMs = performance.now() - t0;
    const t1 = performance.now();
    const again = await runSolve('resultsOf', [structuredClone(d)], { timeoutMs: 30_000 });
    const keptMs = performance.now() - t1;
    console.info(`[solve-pool] 4-stage solve ${solvedMs.toFixed(1)} ms; the same ask again ${keptMs.toFixed(2)} ms`);
    expect(pool.cache.misses).toBe(misses + 1);
    expect(again).toEqual(first);
    expect(first.ok && again.ok && first.value !== again.value).toBe(true); // a copy each
    if (first.ok && first.value.ok) first.value.outputDcV = -1; // one caller scribbles on its answer
    const third = await runSolve('resultsOf', [d], { timeoutMs: 30_000 });
    expect(third.ok && third.value.ok && third.value.outputDcV).toBeGreaterThan(5000);
    // a different document (smaller capacitors) is a different ask
    const changed = designDocumentSchema.parse(halfWaveStarter(4, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF: 2.2e-9, loadCurrentA: 1e-4 }));
    const other = await runSolve('resultsOf', [changed], { timeoutMs: 30_000 });
    expect(pool.cache.misses).toBe(misses + 2);
    expect(other.ok && other.value.ok && third.ok && third.value.ok && other.value.outputDcV).not.toBe(third.ok && third.value.ok && third.value.outputDcV);
  }, 60_000);

  it('shares one solve among callers asking the same thing at once', async () => {
    const pool = solvePool();
    const misses = pool.cache.misses;
    const d = doc(5);
    const answers = await Promise.all(Array.from({ length: 6 }, () => runSolve('resultsOf', [d], { timeoutMs: 30_000 })));
    expect(pool.cache.misses).toBe(misses + 1);
    for (const a of answers) expect(a).toEqual(answers[0]);
  }, 60_000);

  it('keeps no failure: a solve that was cut off is tried again next time', async () => {
    const pool = solvePool();
    const restarts = pool.restarts;
    for (let i = 0; i < 2; i++) {
      const r = await runSolve('resultsOf', [doc(200), 120_000], { timeoutMs: 600 });
      expect(r).toEqual({ ok: false, code: 'timeout', reason: expect.stringMatching(/cut off/) });
    }
    expect(pool.restarts).toBe(restarts + 2);
  }, 60_000);

  it("keeps no task's own failure either (a budget that ran out on a busy machine may not run out next time)", async () => {
    const cache = new SolveCache(4);
    let solves = 0;
    const outOfBudget = async () => {
      solves += 1;
      return { ok: true as const, value: { ok: false, reason: 'the solve ran past its time budget' } };
    };
    expect(await cache.get('k', outOfBudget)).toEqual({ ok: true, value: { ok: false, reason: 'the solve ran past its time budget' } });
    await cache.get('k', outOfBudget);
    expect(solves).toBe(2);
    expect(cache.size).toBe(0);
  });

  it('holds at most its capacity, least recently used out first', async () => {
    const cache = new SolveCache(2);
    const solve = (v: number) => async () => ({ ok: true as const, value: { v } });
    await cache.get('a', solve(1));
    await cache.get('b', solve(2));
    await cache.get('a', solve(99)); // a is now the most recent
    await cache.get('c', solve(3)); // b goes
    expect(cache.size).toBe(2);
    expect(await cache.get('a', solve(100))).toEqual({ ok: true, value: { v: 1 } });
    expect(await cache.get('b', solve(200))).toEqual({ ok: true, value: { v: 200 } });
    expect(SolveCache.key('resultsOf', [{ x: 1 }])).not.toBe(SolveCache.key('solveForExport', [{ x: 1 }]));
  });

  it('gives every engine budget room for the set-up the budget does not count', () => {
    expect(cutOffFor(15_000)).toBe(27_500);
    expect(cutOffFor(300)).toBeGreaterThan(300 + 4000);
  });
});
