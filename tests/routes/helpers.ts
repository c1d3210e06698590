/**
 * Route-test harness: a real PostgreSQL database (DATABASE_URL, which must name a *_test
 * database), re-created from the migrations for each test file, fixture users and teams, and
 * route handlers called directly with NextRequest objects whose session cookie is minted by
 * next-auth's own `encode()`.
 */
import { NextRequest } from 'next/server';
import { encode } from 'next-auth/jwt';
import { db, closeDb } from '@/lib/db';
import { createMigrator } from '@/migrations/migrator';
import { hashPassword } from '@/lib/auth/password';
import { halfWaveStarter } from '@/lib/circuit/document/starters';
import { designDocumentSchema, type DesignDocument } from '@/lib/circuit/document/schema';
import type { Role } from '@/lib/api/contract';

process.env.DATABASE_URL ??= 'postgres://app@127.0.0.1:54329/kilorung_test';
process.env.NEXTAUTH_SECRET ??= 'route-tests-secret-0123456789abcdef';
process.env.NEXTAUTH_URL ??= 'http://127.0.0.1:3000';
process.env.DB_POOL_MAX ??= '5';
if (!/_test(\?|$)/.test(process.env.DATABASE_URL)) {
  throw new Error(`route tests drop and re-create the schema; DATABASE_URL must name a *_test database, got ${process.env.DATABASE_URL.replace(/\/\/[^@]*@/, '//')}`);
}

/** Password of every fixture user. */
export const PASSWORD = 'fixture-password-1';

export type Who = Role | 'outsider';
export const WHO: Who[] = ['owner', 'designer', 'reviewer', 'viewer', 'outsider'];

export interface FixtureUser {
  id: string;
  email: string;
  name: string;
}

export interface Fixtures {
  teamId: string;
  otherTeamId: string;
  users: Record<Who, FixtureUser>;
}

let passwordHash: string | null = null;

/** Drop everything in the test database and migrate it from scratch. */
export async function resetDatabase(): Promise<void> {
  const { sequelize } = db();
  await sequelize.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
  await createMigrator(sequelize, true).up();
}

let counter = 0;
/** A unique lower-case address for this run. */
export function freshEmail(tag = 'person'): string {
  counter += 1;
  return `${tag}-${Date.now().toString(36)}-${counter}@fixture.test`;
}

/** Create a user with PASSWORD. */
export async function makeUser(name: string, email = freshEmail(name.toLowerCase())): Promise<FixtureUser> {
  passwordHash ??= await hashPassword(PASSWORD);
  const u = await db().models.User.create({ name, email, passwordHash, emailVerified: null, image: null });
  return { id: u.id, email: u.email, name };
}

/** Add `userId` to `teamId` with `role`. */
export async function addMember(teamId: string, userId: string, role: Role): Promise<void> {
  await db().models.Membership.create({ teamId, userId, role });
}

/** Reset the database and create a team with one user per role, plus an outsider in another team. */
export async function setupFixtures(): Promise<Fixtures> {
  await resetDatabase();
  const { Team } = db().models;
  const team = await Team.create({ name: 'Fixture Team' });
  const other = await Team.create({ name: 'Elsewhere Lab' });
  const users = {} as Record<Who, FixtureUser>;
  for (const who of WHO) users[who] = await makeUser(`${who[0].toUpperCase()}${who.slice(1)}`);
  for (const role of ['owner', 'designer', 'reviewer', 'viewer'] as const) await addMember(team.id, users[role].id, role);
  await addMember(other.id, users.outsider.id, 'owner');
  return { teamId: team.id, otherTeamId: other.id, users };
}

/** Close the pool after a test file. */
export async function teardown(): Promise<void> {
  await closeDb();
}

/** A session cookie for `user`, as next-auth would set it. */
export async function sessionCookie(user: FixtureUser): Promise<string> {
  const token = await encode({ token: { sub: user.id, name: user.name, email: user.email }, secret: process.env.NEXTAUTH_SECRET! });
  return `next-auth.session-token=${token}`;
}

export interface CallOptions {
  method?: string;
  params?: Record<string, string>;
  /** JSON-encoded unless a string or FormData / Uint8Array / ReadableStream (sent as is). */
  body?: unknown;
  /** Content type for a string or byte body (default application/json). */
  contentType?: string;
  as?: FixtureUser | null;
  headers?: Record<string, string>;
  query?: Record<string, string>;
  /** Send the body as a stream (no content-length header). */
  stream?: boolean;
}

/** Any App Router route handler. */
export type AnyHandler = (req: NextRequest, ctx: { params: Promise<never> }) => Promise<Response>;

export interface CallResult<T = Record<string, unknown>> {
  status: number;
  /** The parsed JSON answer ({} when the answer is empty or not JSON: see `raw`). */
  body: T;
  headers: Headers;
  /** The answer's bytes (CSV, PDF, …). */
  raw: Uint8Array;
}

/** Call a route handler the way Next.js would and read its JSON answer. */
export async function call<T = Record<string, unknown>>(handler: AnyHandler, path: string, o: CallOptions = {}): Promise<CallResult<T>> {
  const url = new URL(path, 'http://127.0.0.1:3000');
  for (const [k, v] of Object.entries(o.query ?? {})) url.searchParams.set(k, v);
  const headers = new Headers(o.headers);
  if (o.as) headers.set('cookie', await sessionCookie(o.as));
  let body: BodyInit | undefined;
  if (o.body instanceof FormData) {
    body = o.body;
  } else if (o.body instanceof ReadableStream) {
    body = o.body; // sent as is (a stream that fails part-way, for instance)
  } else if (o.body instanceof Uint8Array) {
    if (!headers.has('content-type')) headers.set('content-type', o.contentType ?? 'application/octet-stream');
    body = o.body as BodyInit;
  } else if (o.body !== undefined) {
    if (o.contentType && !headers.has('content-type')) headers.set('content-type', o.contentType);
    const text = typeof o.body === 'string' ? o.body : JSON.stringify(o.body);
    if (!headers.has('content-type')) headers.set('content-type', 'application/json');
    if (o.stream) {
      const bytes = new TextEncoder().encode(text);
      body = new ReadableStream({
        start(c) {
          for (let i = 0; i < bytes.length; i += 65536) c.enqueue(bytes.subarray(i, i + 65536));
          c.close();
        },
      });
    } else body = text;
  }
  const init: RequestInit & { duplex?: 'half' } = { method: o.method ?? 'GET', headers, body };
  if (o.stream || o.body instanceof ReadableStream) init.duplex = 'half';
  const req = new NextRequest(url, init as ConstructorParameters<typeof NextRequest>[1]);
  const res = await handler(req, { params: Promise.resolve(o.params ?? {}) as Promise<never> });
  const raw = new Uint8Array(await res.arrayBuffer());
  const isJson = (res.headers.get('content-type') ?? 'application/json').includes('json');
  const text = isJson ? new TextDecoder().decode(raw) : '';
  return { status: res.status, body: (text ? JSON.parse(text) : {}) as T, headers: res.headers, raw };
}

/** A valid 3-stage half-wave document (defaults applied). */
export function sampleDocument(capacitanceF = 10e-9, stages = 3): DesignDocument {
  return designDocumentSchema.parse(halfWaveStarter(stages, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF, loadCurrentA: 1e-4 }));
}

/** Caught mail for `to` from the local catcher (newest first). */
export async function mailFor(to: string): Promise<{ subject: string; text: string }[]> {
  const base = process.env.MAIL_CATCHER_URL ?? 'http://127.0.0.1:2580';
  const res = await fetch(`${base}/api/messages?to=${encodeURIComponent(to)}`);
  return (await res.json()) as { subject: string; text: string }[];
}
