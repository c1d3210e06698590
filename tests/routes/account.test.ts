/**
 * Accounts against the real database: sign-up (duplicate 409), password change, the failed
 * sign-in limit stored in PostgreSQL, and session cookies (forged or for a deleted user → 401).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encode } from 'next-auth/jwt';
import * as signup from '@/app/api/account/signup/route';
import * as password from '@/app/api/account/password/route';
import * as me from '@/app/api/me/route';
import { authOptions, authorizeCredentials, RATE_LIMITED_ERROR } from '@/lib/auth/options';
import { MAX_FAILED_SIGN_INS } from '@/lib/auth/throttle';
import type { MeDto, UserDto } from '@/lib/api/contract';
import { db } from '@/lib/db';
import { call, freshEmail, makeUser, PASSWORD, setupFixtures, teardown, type Fixtures } from './helpers';

let f: Fixtures;

beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

describe('sign-up', () => {
  it('creates an account that can sign in with its password; the same address again is 409', async () => {
    const email = freshEmail('new');
    const res = await call<{ user: UserDto }>(signup.POST, '/api/account/signup', { method: 'POST', body: { email: email.toUpperCase(), name: 'Nia', password: 'correct horse battery' } });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email, name: 'Nia' });
    expect(JSON.stringify(res.body)).not.toMatch(/\$2[aby]\$/);
    expect(await authorizeCredentials({ email, password: 'correct horse battery' })).toMatchObject({ id: res.body.user.id, email });

    const dup = await call(signup.POST, '/api/account/signup', { method: 'POST', body: { email, name: 'Nia again', password: 'another long one' } });
    expect(dup.status).toBe(409);
    expect(dup.body).toEqual({ error: { code: 'exists', message: expect.any(String), field: 'email' } });
    expect(await db().models.User.count({ where: { email } })).toBe(1);
  });

  it('refuses short passwords and bad addresses with the field named', async () => {
    const short = await call(signup.POST, '/api/account/signup', { method: 'POST', body: { email: freshEmail(), name: 'Short', password: 'short' } });
    expect(short.status).toBe(422);
    expect((short.body as { error: { field: string } }).error.field).toBe('password');
    const bad = await call(signup.POST, '/api/account/signup', { method: 'POST', body: { email: 'nobody', name: 'Bad', password: 'long enough password' } });
    expect((bad.body as { error: { field: string } }).error.field).toBe('email');
  });
});

describe('password change', () => {
  it('needs the current password, then only the new one works', async () => {
    const u = await makeUser('Changer');
    const wrong = await call(password.POST, '/api/account/password', { method: 'POST', as: u, body: { currentPassword: 'not-it', newPassword: 'brand-new-password' } });
    expect(wrong.status).toBe(403);
    expect((wrong.body as { error: { field: string } }).error.field).toBe('currentPassword');
    expect(await authorizeCredentials({ email: u.email, password: PASSWORD })).not.toBeNull();

    const ok = await call(password.POST, '/api/account/password', { method: 'POST', as: u, body: { currentPassword: PASSWORD, newPassword: 'brand-new-password' } });
    expect(ok.status).toBe(200);
    expect(await authorizeCredentials({ email: u.email, password: 'brand-new-password' })).toMatchObject({ id: u.id });
    expect(await authorizeCredentials({ email: u.email, password: PASSWORD })).toBeNull();
  });
});

describe('failed sign-in limit', () => {
  it(`locks an address after ${MAX_FAILED_SIGN_INS} wrong passwords, even for the right one, and unlocks after the lock`, async () => {
    const u = await makeUser('Target');
    for (let i = 0; i < MAX_FAILED_SIGN_INS; i++) expect(await authorizeCredentials({ email: u.email, password: `guess-${i}` })).toBeNull();
    await expect(authorizeCredentials({ email: u.email, password: PASSWORD })).rejects.toThrow(RATE_LIMITED_ERROR);
    await expect(authorizeCredentials({ email: u.email.toUpperCase(), password: PASSWORD })).rejects.toThrow(RATE_LIMITED_ERROR);
    // another address is not affected
    expect(await authorizeCredentials({ email: f.users.viewer.email, password: PASSWORD })).toMatchObject({ id: f.users.viewer.id });
    // the lock lives in PostgreSQL: end it there, as the clock would
    await db().sequelize.query(`UPDATE sign_in_throttles SET locked_until = now() - interval '1 second', window_started_at = now() - interval '1 hour' WHERE email = :email`, { replacements: { email: u.email } });
    expect(await authorizeCredentials({ email: u.email, password: PASSWORD })).toMatchObject({ id: u.id });
    expect(await db().models.SignInThrottle.count({ where: { email: u.email } })).toBe(0);
  });

  it('counts addresses without an account too, and concurrent failures are all counted', async () => {
    const ghost = freshEmail('ghost');
    await Promise.all(Array.from({ length: MAX_FAILED_SIGN_INS }, (_, i) => authorizeCredentials({ email: ghost, password: `g${i}` })));
    const row = await db().models.SignInThrottle.findByPk(ghost);
    expect(row?.failures).toBe(MAX_FAILED_SIGN_INS);
    await expect(authorizeCredentials({ email: ghost, password: 'whatever' })).rejects.toThrow(RATE_LIMITED_ERROR);
  });

  it('failures older than the window start a new count', async () => {
    const u = await makeUser('Slow');
    for (let i = 0; i < MAX_FAILED_SIGN_INS - 1; i++) await authorizeCredentials({ email: u.email, password: 'nope' });
    await db().sequelize.query(`UPDATE sign_in_throttles SET window_started_at = now() - interval '16 minutes' WHERE email = :email`, { replacements: { email: u.email } });
    expect(await authorizeCredentials({ email: u.email, password: 'nope' })).toBeNull();
    expect((await db().models.SignInThrottle.findByPk(u.email))?.failures).toBe(1);
    expect(await authorizeCredentials({ email: u.email, password: PASSWORD })).toMatchObject({ id: u.id });
  });
});

describe('next-auth adapter on our tables', () => {
  it('exposes its methods as own properties and round-trips a sign-in link token', async () => {
    const adapter = authOptions.adapter!;
    // next-auth v4 wraps the adapter by copying Object.keys: methods must be enumerable own properties
    expect(Object.keys(adapter)).toEqual(expect.arrayContaining(['getUserByEmail', 'createVerificationToken', 'useVerificationToken', 'updateUser']));
    const byEmail = await adapter.getUserByEmail!(f.users.reviewer.email);
    expect(byEmail).toMatchObject({ id: f.users.reviewer.id, email: f.users.reviewer.email });
    expect(byEmail).not.toHaveProperty('passwordHash');
    const expires = new Date(Date.now() + 60_000);
    await adapter.createVerificationToken!({ identifier: f.users.reviewer.email, token: 'hashed-token-value', expires });
    expect(await adapter.useVerificationToken!({ identifier: f.users.reviewer.email, token: 'hashed-token-value' })).toMatchObject({ identifier: f.users.reviewer.email });
    expect(await adapter.useVerificationToken!({ identifier: f.users.reviewer.email, token: 'hashed-token-value' })).toBeNull();
    const verified = new Date();
    await adapter.updateUser!({ id: f.users.reviewer.id, emailVerified: verified });
    expect((await db().models.User.findByPk(f.users.reviewer.id))?.emailVerified?.getTime()).toBe(verified.getTime());
    const created = await adapter.createUser!({ email: freshEmail('linkonly'), emailVerified: verified });
    expect(created.id).toMatch(/^[0-9a-f-]{36}$/);
  });
});

describe('session cookie', () => {
  it('GET /api/me returns the user and teams for a valid cookie', async () => {
    const res = await call<MeDto>(me.GET, '/api/me', { as: f.users.designer });
    expect(res.status).toBe(200);
    expect(res.body.user).toEqual({ id: f.users.designer.id, name: 'Designer', email: f.users.designer.email });
    expect(res.body.teams).toEqual([expect.objectContaining({ id: f.teamId, role: 'designer' })]);
  });

  it('a cookie signed with another secret, a garbage cookie, or a deleted user answer 401', async () => {
    const forged = await encode({ token: { sub: f.users.owner.id }, secret: 'some-other-secret-0123456789' });
    for (const cookie of [`next-auth.session-token=${forged}`, 'next-auth.session-token=garbage', '']) {
      const res = await call(me.GET, '/api/me', { headers: { cookie } });
      expect(res.status).toBe(401);
      expect((res.body as { error: { code: string } }).error.code).toBe('unauthenticated');
    }
    const gone = await makeUser('Gone');
    await db().models.User.destroy({ where: { id: gone.id } });
    expect((await call(me.GET, '/api/me', { as: gone })).status).toBe(401);
  });
});
