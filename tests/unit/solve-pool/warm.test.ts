/**
 * The web server starts its solve threads on its first API request (lib/api/handler.ts), so the
 * first compare page after a start does not wait for a thread to load the engine while the
 * requests behind it queue (seen in the load test: a 2 s stall after every start). Tests and
 * scripts (no NEXT_RUNTIME) start no threads they do not use.
 */
import { NextRequest } from 'next/server';
import { afterAll, describe, expect, it } from 'vitest';
import { publicRoute } from '@/lib/api/handler';
import { closeSolvePool, solvePool } from '@/lib/solve-pool';

const runtimeBefore = process.env.NEXT_RUNTIME;
afterAll(async () => {
  await closeSolvePool();
  if (runtimeBefore === undefined) delete process.env.NEXT_RUNTIME;
  else process.env.NEXT_RUNTIME = runtimeBefore;
});

const ping = publicRoute({}, async () => ({ pong: true }));
const call = () => ping(new NextRequest('http://127.0.0.1/api/ping'), { params: Promise.resolve({}) });

describe('starting the solve threads early', () => {
  it('outside the web server an API request starts no solve thread', async () => {
    delete process.env.NEXT_RUNTIME;
    await closeSolvePool();
    expect((await call()).status).toBe(200);
    expect(solvePool().threads).toBe(0);
  });

  it('in the web server the first API request starts them, once', async () => {
    process.env.NEXT_RUNTIME = 'nodejs';
    await closeSolvePool();
    expect((await call()).status).toBe(200);
    const pool = solvePool();
    expect(pool.threads).toBe(pool.size);
    await call();
    expect(pool.threads).toBe(pool.size);
  });
});
