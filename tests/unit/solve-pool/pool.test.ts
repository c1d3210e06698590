/**
 * The solve pool (lib/solve-pool): the server's solves run in worker threads with a hard
 * cut-off, so a long solve neither hangs its caller nor holds up the request thread (issue 7).
 * Real threads, the real engine; no mocks.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { designDocumentSchema } from '@/lib/circuit/document/schema';
import { halfWaveStarter } from '@/lib/circuit/document/starters';
import { resultsOf } from '@/lib/compare/results';
import { pooledResultsOf } from '@/lib/compare/pooled';
import { closeSolvePool, cutOffFor, runSolve, solvePool } from '@/lib/solve-pool';

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
    const next = await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000 });
    expect(next.ok && next.value.ok).toBe(true);
  }, 60_000);

  it('answers busy, not never, when every thread stays occupied past the wait limit', async () => {
    const long = runSolve('resultsOf', [doc(200), 120_000], { timeoutMs: 3000 });
    const waiting = await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000, waitMs: 200 });
    expect(waiting).toEqual({ ok: false, code: 'busy', reason: expect.stringMatching(/busy.*retry/) });
    expect((await long).ok).toBe(false);
  }, 60_000);

  it('turns a solve that throws into a reason', async () => {
    const r = await runSolve('resultsOf', [null as never], { timeoutMs: 30_000 });
    expect(r).toEqual({ ok: false, code: 'error', reason: expect.stringMatching(/^the solve failed: /) });
    expect((await runSolve('resultsOf', [doc(2)], { timeoutMs: 30_000 })).ok).toBe(true);
  }, 60_000);

  it('gives every engine budget room for the set-up the budget does not count', () => {
    expect(cutOffFor(15_000)).toBe(27_500);
    expect(cutOffFor(300)).toBeGreaterThan(300 + 4000);
  });
});
