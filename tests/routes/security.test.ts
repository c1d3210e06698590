/**
 * Security review checks against the real database and the real next-auth core:
 * - the session cookie next-auth sets on a password sign-in is HttpOnly, SameSite=Lax, Path=/,
 *   and Secure (with the __Secure- prefix) when NEXTAUTH_URL is https;
 * - the failed sign-in limit (lib/auth/throttle.ts): the 6th try within the window is refused
 *   even with the right password, concurrent wrong tries cannot slip past the count, the lock
 *   ends, a success clears the count, another address is not affected; hostile credentials are
 *   refused without an exception;
 * - object ids of another team answer 404 (designs, revisions, comments, reviews, offers);
 * - downloads are attachments with nosniff, a sandbox policy and a header-safe file name;
 * - no secrets in the tracked files, the server reads them only from the environment, and the
 *   error log line of a 500 carries neither cookies nor the body.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { createRequire } from 'node:module';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as revision from '@/app/api/designs/[designId]/revisions/[number]/route';
import * as designComments from '@/app/api/designs/[designId]/comments/route';
import * as comment from '@/app/api/comments/[commentId]/route';
import * as reviews from '@/app/api/designs/[designId]/reviews/route';
import * as review from '@/app/api/designs/[designId]/reviews/[reviewId]/route';
import * as decision from '@/app/api/designs/[designId]/reviews/[reviewId]/decision/route';
import * as offers from '@/app/api/designs/[designId]/offers/route';
import * as offer from '@/app/api/offers/[offerId]/route';
import * as offerDecision from '@/app/api/offers/[offerId]/decision/route';
import * as fork from '@/app/api/designs/[designId]/fork/route';
import { authOptions, authorizeCredentials, RATE_LIMITED_ERROR } from '@/lib/auth/options';
import { MAX_FAILED_SIGN_INS } from '@/lib/auth/throttle';
import { fileResponse } from '@/lib/api/upload';
import { route } from '@/lib/api/handler';
import { createComment } from '@/lib/data/comments';
import { createDesign, forkDesign } from '@/lib/data/designs';
import { createOffer } from '@/lib/data/offers';
import { requestReview } from '@/lib/data/reviews';
import { env, resetEnvCache } from '@/lib/env';
import { db } from '@/lib/db';
import { addMember, call, makeUser, PASSWORD, sampleDocument, setupFixtures, teardown, type AnyHandler, type Fixtures, type FixtureUser } from './helpers';

const REPO = path.resolve(import.meta.dirname, '../..');

// next-auth's core (what its route handler runs once Next has given it the request's cookies);
// loaded by file path because the package's export map does not list it
interface InternalResponse {
  status?: number;
  body?: unknown;
  redirect?: string;
  cookies?: { name: string; value: string; options: { httpOnly?: boolean; sameSite?: string; secure?: boolean; path?: string } }[];
}
const { AuthHandler } = createRequire(import.meta.url)(path.join(REPO, 'node_modules/next-auth/core/index.js')) as {
  AuthHandler: (p: { req: Request; options: typeof authOptions }) => Promise<InternalResponse>;
};

let f: Fixtures;
beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

async function signIn(base: string, email: string, password: string): Promise<InternalResponse> {
  const options = { ...authOptions, secret: process.env.NEXTAUTH_SECRET };
  const csrf = await AuthHandler({ req: new Request(`${base}/api/auth/csrf`), options });
  const csrfCookie = csrf.cookies!.find((c) => c.name.endsWith('next-auth.csrf-token'))!;
  const csrfToken = (csrf.body as { csrfToken: string }).csrfToken;
  // the core reads a Request's body as JSON (the Next route handler parses the form first)
  const form = JSON.stringify({ csrfToken, email, password, callbackUrl: `${base}/designs`, json: 'true' });
  return AuthHandler({
    req: new Request(`${base}/api/auth/callback/credentials`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie: `${csrfCookie.name}=${csrfCookie.value}` },
      body: form,
    }),
    options,
  });
}

describe('session cookie flags (next-auth, as configured in lib/auth/options.ts)', () => {
  it('over http: HttpOnly, SameSite=Lax, Path=/, not Secure; the CSRF cookie is HttpOnly too', async () => {
    const res = await signIn('http://127.0.0.1:3000', f.users.owner.email, PASSWORD);
    const session = res.cookies?.find((c) => c.name === 'next-auth.session-token');
    expect(session, JSON.stringify(res)).toBeDefined();
    expect(session!.options).toMatchObject({ httpOnly: true, sameSite: 'lax', path: '/' });
    expect(session!.options.secure).toBeFalsy();
    expect(authOptions.useSecureCookies).toBeUndefined(); // so next-auth decides from NEXTAUTH_URL
    expect(authOptions.session?.strategy).toBe('jwt');
  });

  it('over https (NEXTAUTH_URL https://…): Secure and the __Secure- prefix', async () => {
    const saved = process.env.NEXTAUTH_URL;
    process.env.NEXTAUTH_URL = 'https://kilorung.example';
    try {
      const res = await signIn('https://kilorung.example', f.users.designer.email, PASSWORD);
      const session = res.cookies?.find((c) => c.name.endsWith('next-auth.session-token'));
      expect(session?.name).toBe('__Secure-next-auth.session-token');
      expect(session!.options).toMatchObject({ httpOnly: true, sameSite: 'lax', secure: true, path: '/' });
    } finally {
      process.env.NEXTAUTH_URL = saved;
    }
  });

  it('a wrong password sets no session cookie', async () => {
    const res = await signIn('http://127.0.0.1:3000', f.users.viewer.email, 'wrong-password-0');
    expect(res.cookies?.some((c) => c.name.endsWith('session-token'))).toBe(false);
    expect(JSON.stringify(res)).toMatch(/error=CredentialsSignin/);
    await db().sequelize.query('DELETE FROM sign_in_throttles');
  });
});

describe('sign-in rate limit (lib/auth/throttle.ts, per address)', () => {
  it(`${MAX_FAILED_SIGN_INS} wrong passwords lock the address: the right one is refused until the lock ends`, async () => {
    const u = await makeUser('Throttled');
    for (let i = 0; i < MAX_FAILED_SIGN_INS; i++) expect(await authorizeCredentials({ email: u.email, password: `wrong-${i}-xxxxxx` })).toBeNull();
    await expect(authorizeCredentials({ email: u.email, password: PASSWORD })).rejects.toThrow(RATE_LIMITED_ERROR);
    await expect(authorizeCredentials({ email: u.email.toUpperCase(), password: PASSWORD })).rejects.toThrow(RATE_LIMITED_ERROR);
    // through next-auth: the client sees error=rate_limited and gets no session
    const res = await signIn('http://127.0.0.1:3000', u.email, PASSWORD);
    expect(JSON.stringify(res)).toMatch(/error=rate_limited/);
    expect(res.cookies?.some((c) => c.name.endsWith('session-token'))).toBe(false);
    // another address is not affected
    expect(await authorizeCredentials({ email: f.users.reviewer.email, password: PASSWORD })).toMatchObject({ id: f.users.reviewer.id });
    // the lock ends (moved into the past here rather than waiting 15 minutes)
    await db().sequelize.query(`UPDATE sign_in_throttles SET locked_until = now() - interval '1 second', window_started_at = now() - interval '1 hour' WHERE email = :e`, { replacements: { e: u.email } });
    expect(await authorizeCredentials({ email: u.email, password: PASSWORD })).toMatchObject({ id: u.id });
    // a success forgets earlier failures
    const [[row]] = (await db().sequelize.query('SELECT count(*)::int AS n FROM sign_in_throttles WHERE email = :e', { replacements: { e: u.email } })) as [[{ n: number }], unknown];
    expect(row.n).toBe(0);
  });

  it('twenty concurrent wrong passwords cannot slip past the count', async () => {
    const u = await makeUser('Concurrent');
    const results = await Promise.allSettled(Array.from({ length: 20 }, (_, i) => authorizeCredentials({ email: u.email, password: `bad-${i}-xxxxxxxx` })));
    expect(results.every((r) => r.status === 'fulfilled' ? r.value === null : String(r.reason).includes(RATE_LIMITED_ERROR))).toBe(true);
    const [[row]] = (await db().sequelize.query('SELECT failures, locked_until > now() AS locked FROM sign_in_throttles WHERE email = :e', { replacements: { e: u.email } })) as [[{ failures: number; locked: boolean }], unknown];
    expect(row.locked).toBe(true);
    expect(row.failures).toBeGreaterThanOrEqual(MAX_FAILED_SIGN_INS);
    await expect(authorizeCredentials({ email: u.email, password: PASSWORD })).rejects.toThrow(RATE_LIMITED_ERROR);
  });

  it('hostile credentials are refused (null), never an exception', async () => {
    for (const input of [null, undefined, 42, 'x', [], {}, { email: [], password: {} }, { email: 'a@b.c', password: 'x'.repeat(100_000) }, { email: `${'a'.repeat(300)}@b.c`, password: 'x' }, { email: 'a@b.c\u0000', password: 'x' }, { email: "' OR 1=1 --", password: 'x' }, { email: 'NaN', password: NaN }]) {
      await expect(authorizeCredentials(input)).resolves.toBeNull();
    }
  });
});

describe("another team's object ids answer 404", () => {
  it('designs, revisions, comments, reviews and offers of the other team are not found for the fixture owner', async () => {
    // the outsider owns "Elsewhere Lab"; a colleague there reviews
    const colleague = await makeUser('Elsewhere reviewer');
    await addMember(f.otherTeamId, colleague.id, 'reviewer');
    const outsider = f.users.outsider;
    const { design: d } = await createDesign(outsider.id, f.otherTeamId, { title: 'Elsewhere ladder', visibility: 'team', document: sampleDocument() });
    const c = await createComment(outsider.id, d.id, { revision: 1, body: 'private note', anchor: { kind: 'design' } });
    const { review: r } = await requestReview(outsider.id, d.id, { revision: 1, reviewerIds: [colleague.id] });
    const forked = await forkDesign(outsider.id, d.id, {});
    const { offer: o } = await createOffer(outsider.id, forked.id, {});
    const me: FixtureUser = f.users.owner;
    const probes: [string, AnyHandler, string, Record<string, string>, unknown?][] = [
      ['GET design', design.GET, 'GET', { designId: d.id }],
      ['PATCH design', design.PATCH, 'PATCH', { designId: d.id }, { title: 'mine now' }],
      ['GET revisions', revisions.GET, 'GET', { designId: d.id }],
      ['POST revision', revisions.POST, 'POST', { designId: d.id }, { baseRevision: 1, document: sampleDocument(1e-9) }],
      ['GET revision 1', revision.GET, 'GET', { designId: d.id, number: '1' }],
      ['POST fork', fork.POST, 'POST', { designId: d.id }, {}],
      ['GET comments', designComments.GET, 'GET', { designId: d.id }],
      ['POST comment', designComments.POST, 'POST', { designId: d.id }, { revision: 1, body: 'hello', anchor: { kind: 'design' } }],
      ['PATCH comment', comment.PATCH, 'PATCH', { commentId: c.id }, { resolved: true }],
      ['GET reviews', reviews.GET, 'GET', { designId: d.id }],
      ['DELETE review', review.DELETE, 'DELETE', { designId: d.id, reviewId: r.id }],
      ['POST decision', decision.POST, 'POST', { designId: d.id, reviewId: r.id }, { decision: 'approve' }],
      ['GET offers', offers.GET, 'GET', { designId: d.id }],
      ['DELETE offer', offer.DELETE, 'DELETE', { offerId: o.id }],
      ['POST offer decision', offerDecision.POST, 'POST', { offerId: o.id }, { decision: 'accept', parentBaseRevision: 1 }],
    ];
    for (const [name, handler, method, params, body] of probes) {
      const res = await call<{ error?: { code: string } }>(handler, `/api/x`, { method, params, body, as: me });
      expect(res.status, `${name}: ${JSON.stringify(res.body)}`).toBe(404);
      expect(res.body.error?.code).toBe('not_found');
    }
    // and a mix: our review id under their design, their review id under our design
    const { design: ours } = await createDesign(f.users.designer.id, f.teamId, { title: 'Ours', visibility: 'team', document: sampleDocument() });
    expect((await call(decision.POST, '/api/x', { method: 'POST', params: { designId: ours.id, reviewId: r.id }, body: { decision: 'approve' }, as: me })).status).toBe(404);
    // nothing of theirs changed
    expect((await db().models.Design.findByPk(d.id))!.title).toBe('Elsewhere ladder');
    expect(await db().models.DesignRevision.count({ where: { designId: d.id } })).toBe(1);
    expect((await db().models.ReviewRequest.findByPk(r.id))!.state).toBe('open');
  });
});

describe('downloads (lib/api/upload.ts fileResponse)', () => {
  it('are attachments with a fixed type, nosniff, a sandbox policy and a header-safe name', async () => {
    for (const evil of ['../../etc/passwd', 'a\r\nSet-Cookie: x=1.pdf', '<script>.html', '..\\..\\win.ini', '"quoted".pdf', 'résumé ⚡.pdf']) {
      const res = fileResponse('<html><script>alert(1)</script></html>', 'application/pdf', evil);
      expect(res.headers.get('content-type')).toBe('application/pdf');
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      expect(res.headers.get('content-security-policy')).toMatch(/sandbox/);
      expect(res.headers.get('cache-control')).toMatch(/no-store/);
      const cd = res.headers.get('content-disposition')!;
      expect(cd.startsWith('attachment;')).toBe(true);
      expect(cd).not.toMatch(/[\r\n]|\.\.|[/\\]|<|filename="[^"]*"[^;]*"/);
      expect(res.headers.get('set-cookie')).toBeNull();
    }
  });
});

describe('secrets', () => {
  it('no tracked file holds something that looks like a secret', () => {
    const files = execFileSync('git', ['ls-files', '-z'], { cwd: REPO, encoding: 'utf8' }).split('\0').filter(Boolean);
    expect(files.length).toBeGreaterThan(50);
    expect(files.filter((p) => /(^|\/)\.env(\.|$)/.test(p) && !p.endsWith('.example'))).toEqual([]);
    expect(files.filter((p) => p.startsWith('.data/') || /\.(pem|key|p12|pfx|dump)$/.test(p))).toEqual([]);
    // patterns assembled from pieces so that this file does not match itself
    const patterns: [string, RegExp][] = [
      ['private key', new RegExp('-----BEGIN ([A-Z]+ )?' + 'PRIVATE KEY-----')],
      ['AWS access key id', new RegExp('\\b(AKIA|ASIA)' + '[0-9A-Z]{16}\\b')],
      ['GitHub token', new RegExp('\\b(ghp|gho|ghs|ghu)_' + '[A-Za-z0-9]{30,}|github_pat_' + '[A-Za-z0-9_]{30,}')],
      ['Slack token', new RegExp('xox[baprs]-' + '[0-9A-Za-z-]{10,}')],
      ['Stripe key', new RegExp('\\b[sr]k_live_' + '[0-9a-zA-Z]{16,}')],
      ['password in a URL', new RegExp('[a-z]+://[^\\s:/@"\'`]+:(?!password@|\\$\\{|<)[^\\s:/@"\'`]{6,}@')],
    ];
    const allowedSecrets = new Set(['route-tests-secret-0123456789abcdef', 'e2e-only-secret-not-for-production', 'seed-does-not-sign-anything']);
    const secretAssign = new RegExp('NEXTAUTH_SECRET' + `["']?\\s*(?:\\?\\?=|=|:|\\?\\?)\\s*["'\`]([^"'\`]{4,})["'\`]`, 'g');
    const hits: string[] = [];
    for (const file of files) {
      if (file === 'tests/routes/security.test.ts' || file === 'package-lock.json') continue;
      const full = path.join(REPO, file);
      if (!fs.existsSync(full) || fs.statSync(full).size > 2_000_000) continue;
      const text = fs.readFileSync(full, 'utf8');
      if (text.includes('\u0000')) continue; // binary
      for (const [what, re] of patterns) if (re.test(text)) hits.push(`${file}: ${what}`);
      for (const m of text.matchAll(secretAssign)) if (!allowedSecrets.has(m[1]) && !m[1].startsWith('$')) hits.push(`${file}: NEXTAUTH_SECRET value "${m[1].slice(0, 6)}…"`);
    }
    expect(hits).toEqual([]);
  });

  it('the generated development secret lives in the git-ignored data folder', () => {
    const ignored = fs.readFileSync(path.join(REPO, '.gitignore'), 'utf8');
    expect(ignored).toMatch(/^\/?\.data\/?$/m);
    expect(fs.readFileSync(path.join(REPO, 'scripts/env.sh'), 'utf8')).toMatch(/nextauth-secret/);
  });

  it('lib/env.ts reads NEXTAUTH_SECRET only from the environment and never echoes values', () => {
    const saved = { ...process.env };
    try {
      delete process.env.NEXTAUTH_SECRET;
      resetEnvCache();
      expect(() => env()).toThrow(/NEXTAUTH_SECRET/);
      process.env.NEXTAUTH_SECRET = 'short';
      process.env.DATABASE_URL = 'mysql://leaky-marker-password@db';
      resetEnvCache();
      let message = '';
      try {
        env();
      } catch (e) {
        message = (e as Error).message;
      }
      expect(message).toMatch(/DATABASE_URL/);
      expect(message).not.toMatch(/leaky-marker|short/);
    } finally {
      process.env = saved;
      resetEnvCache();
    }
    expect(env().NEXTAUTH_SECRET).toBe(process.env.NEXTAUTH_SECRET);
    const source = fs.readFileSync(path.join(REPO, 'lib/env.ts'), 'utf8');
    expect(source).toMatch(/NEXTAUTH_SECRET: z\.string\(\)\.min\(16[^\n]*\),\n/);
    expect(source).not.toMatch(/NEXTAUTH_SECRET:[^\n]*\.default\(/);
  });
});

describe('the error log of a 500', () => {
  it('names method, path and error, never the cookie, other headers or the body', async () => {
    const boom = route({ body: z.object({ note: z.string() }) }, async () => {
      throw new Error('database went away');
    }) as AnyHandler;
    const spy = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    try {
      const res = await call(boom, '/api/designs/boom?q=1', {
        method: 'POST',
        as: f.users.owner,
        headers: { authorization: 'Bearer header-marker-123', 'x-api-key': 'header-marker-456' },
        body: { note: 'body-marker-789 lethal stored charge' },
      });
      expect(res.status).toBe(500);
      expect(res.body).toEqual({ error: { code: 'internal', message: 'something went wrong on the server' } });
      const logged = spy.mock.calls.map((args) => args.map(String).join(' ')).join('\n');
      expect(logged).toMatch(/POST \/api\/designs\/boom failed: Error: database went away/);
      expect(logged).not.toMatch(/session-token|next-auth|eyJ|header-marker|body-marker|cookie/i);
      expect(JSON.stringify(res.body)).not.toMatch(/database went away/);
    } finally {
      spy.mockRestore();
    }
  });
});
