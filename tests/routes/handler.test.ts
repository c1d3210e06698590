/**
 * The route wrapper on its own: signed-in check before input, body limits, content type, and
 * unexpected errors answered as a bare 500 whose log line carries no request secrets.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { publicRoute, route } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { loadCaller } from '@/lib/data/access';
import { db } from '@/lib/db';
import { call, setupFixtures, teardown, type Fixtures } from './helpers';

let f: Fixtures;
beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

const echo = publicRoute({ body: z.object({ n: z.int() }) }, async ({ body }) => ({ n: body.n }));

describe("route wrapper: the caller's roles", () => {
  it('reads the user and their roles in one query, and the first authorisation check of the request uses them', async () => {
    const queries: string[] = [];
    const seq = db().sequelize;
    const original = seq.query.bind(seq) as (...a: unknown[]) => unknown;
    const spy = vi.spyOn(seq, 'query').mockImplementation(((...args: unknown[]) => {
      queries.push(String(args[0]));
      return original(...args);
    }) as never);
    try {
      const who = route({}, async ({ user }) => {
        const first = await loadCaller(user.id);
        const afterFirst = queries.length;
        const again = await loadCaller(user.id); // a later check reads the memberships anew
        return { first: [...first.roles.entries()], again: [...again.roles.entries()], afterFirst, afterAgain: queries.length };
      });
      const res = await call<{ first: [string, string][]; again: [string, string][]; afterFirst: number; afterAgain: number }>(who, '/x', { as: f.users.designer });
      expect(res.status).toBe(200);
      expect(res.body.first).toEqual([[f.teamId, 'designer']]);
      expect(res.body.again).toEqual(res.body.first);
      expect(res.body.afterFirst).toBe(1); // the session's user and roles together, nothing more
      expect(queries[0]).toMatch(/FROM users u LEFT JOIN memberships m/);
      expect(res.body.afterAgain).toBe(2);
    } finally {
      spy.mockRestore();
    }
  });

  it('a role changed during the request is seen by the next check', async () => {
    const { Membership } = db().models;
    const flip = route({}, async ({ user }) => {
      const before = await loadCaller(user.id);
      await Membership.update({ role: 'viewer' }, { where: { teamId: f.teamId, userId: user.id } });
      const after = await loadCaller(user.id);
      return { before: before.roles.get(f.teamId), after: after.roles.get(f.teamId) };
    });
    try {
      const res = await call<{ before: string; after: string }>(flip, '/x', { as: f.users.reviewer });
      expect(res.body).toEqual({ before: 'reviewer', after: 'viewer' });
    } finally {
      await Membership.update({ role: 'reviewer' }, { where: { teamId: f.teamId, userId: f.users.reviewer.id } });
    }
  });

  it('a user deleted since the session was made is 401, roles or not', async () => {
    const gone = await db().models.User.create({ name: 'Gone', email: `gone.${Date.now()}@example.test`, passwordHash: null, emailVerified: null, image: null });
    await db().models.Membership.create({ teamId: f.teamId, userId: gone.id, role: 'owner' });
    const cookieUser = { id: gone.id, email: gone.email, name: 'Gone' };
    await db().models.Membership.destroy({ where: { userId: gone.id } });
    await gone.destroy();
    const res = await call(route({}, async () => ({ ok: true })), '/x', { as: cookieUser });
    expect(res.status).toBe(401);
  });
});

describe('route wrapper', () => {
  it('a client that goes away mid-body changes nothing and is not logged as a server fault', async () => {
    const errors = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const act = vi.fn(async () => ({ ok: true }));
    const write = route({ body: z.object({ n: z.int() }) }, act);
    const body = new ReadableStream<Uint8Array>({
      start(c) {
        c.enqueue(new TextEncoder().encode('{"n":'));
        c.error(Object.assign(new Error('aborted'), { code: 'ECONNRESET' })); // what Node raises when the socket closes
      },
    });
    try {
      const res = await call(write, '/x', { method: 'POST', body, as: f.users.designer, headers: { 'content-type': 'application/json' } });
      expect(res.status).toBe(400);
      expect(res.body).toEqual({ error: { code: 'aborted', message: expect.any(String) } });
      expect(act).not.toHaveBeenCalled();
      expect(errors).not.toHaveBeenCalled();
    } finally {
      errors.mockRestore();
    }
  });

  it('checks the session before reading the body', async () => {
    const guarded = route({ body: z.object({ n: z.int() }) }, async ({ body, user }) => ({ n: body.n, user: user.id }));
    expect((await call(guarded, '/x', { method: 'POST', body: '{not json' })).status).toBe(401);
    const ok = await call(guarded, '/x', { method: 'POST', body: { n: 3 }, as: f.users.viewer });
    expect({ status: ok.status, body: ok.body }).toEqual({ status: 200, body: { n: 3, user: f.users.viewer.id } });
  });

  it('accepts +json types and charset parameters, refuses other types', async () => {
    expect((await call(echo, '/x', { method: 'POST', body: { n: 1 }, headers: { 'content-type': 'application/merge-patch+json' } })).status).toBe(200);
    expect((await call(echo, '/x', { method: 'POST', body: { n: 1 }, headers: { 'content-type': 'application/json; charset=utf-8' } })).status).toBe(200);
    const form = await call(echo, '/x', { method: 'POST', body: 'n=1', headers: { 'content-type': 'application/x-www-form-urlencoded' } });
    expect(form.status).toBe(415);
    expect(form.body).toEqual({ error: { code: 'unsupported_media_type', message: expect.any(String) } });
  });

  it('refuses a state-changing call from another site (Origin or Sec-Fetch-Site) before reading anything; reads and same-site calls pass', async () => {
    const act = vi.fn(async () => ({ ok: true }));
    const write = route({}, act);
    const as = f.users.owner;
    const crossSite: Record<string, string>[] = [{ origin: 'https://evil.example' }, { 'sec-fetch-site': 'cross-site' }, { origin: 'null' }];
    for (const headers of crossSite) {
      const res = await call(write, '/x', { method: 'POST', headers, as });
      expect({ headers, status: res.status, body: res.body }).toEqual({ headers, status: 403, body: { error: { code: 'cross_site', message: expect.any(String) } } });
    }
    expect(act).not.toHaveBeenCalled();
    expect((await call(write, '/x', { method: 'POST', headers: { origin: 'http://127.0.0.1:3000', 'sec-fetch-site': 'same-origin' }, as })).status).toBe(200);
    expect((await call(write, '/x', { method: 'DELETE', as })).status).toBe(200);
    // a cross-site read is left to the session and CORS (the browser will not show it to the other site)
    expect((await call(write, '/x', { method: 'GET', headers: { origin: 'https://evil.example' }, as })).status).toBe(200);
  });

  it('an empty body is validated as {} (422 naming the field)', async () => {
    const res = await call(echo, '/x', { method: 'POST' });
    expect(res.status).toBe(422);
    expect(res.body).toMatchObject({ error: { code: 'invalid', field: 'n' } });
  });

  it('AppErrors keep their status and extras; unexpected errors are a bare 500 logged without secrets', async () => {
    const conflicted = publicRoute({}, async () => {
      throw new AppError('conflict', 'stale', { latestRevision: 7 });
    });
    const stale = await call(conflicted, '/x');
    expect({ status: stale.status, body: stale.body }).toEqual({ status: 409, body: { error: { code: 'conflict', message: 'stale', latestRevision: 7 } } });

    const log = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const broken = publicRoute({}, async () => {
      throw new Error('database exploded');
    });
    const res = await call(broken, '/api/broken', { as: f.users.owner, headers: { authorization: 'Bearer very-secret-value' } });
    expect({ status: res.status, body: res.body }).toEqual({ status: 500, body: { error: { code: 'internal', message: 'something went wrong on the server' } } });
    const logged = log.mock.calls.map((c) => c.join(' ')).join('\n');
    log.mockRestore();
    expect(logged).toContain('GET /api/broken');
    expect(logged).toContain('database exploded');
    expect(logged).not.toMatch(/very-secret-value|next-auth\.session-token/);
  });
});
