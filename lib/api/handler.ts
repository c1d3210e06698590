/**
 * The wrapper every route handler goes through. It reads the body with a size limit, checks the
 * content type, parses JSON, validates body and query with zod, checks id-shaped path
 * parameters, and turns every failure into `{ error: { code, message, field? } }` with the
 * right status. Anything unexpected is logged (method, path and error text only — never
 * headers, cookies or bodies) and answered with a bare 500.
 */
import type { NextRequest } from 'next/server';
import { z } from 'zod';
import { ConnectionError, DatabaseError, UniqueConstraintError } from 'sequelize';
import { MAX_BODY_BYTES } from './contract';
import { AppError, notFound } from '../errors';
import { requireCaller, type SessionUser } from '../auth/session';
import { withPreloadedCaller } from '../data/access';
import { env } from '../env';
import { warmSolvePool } from '../solve-pool';

type Params = Record<string, string>;
type Schema = z.ZodType | undefined;
type Out<S extends Schema> = S extends z.ZodType ? z.output<S> : undefined;

/** What a public route's function receives. */
export interface PublicRouteContext<P extends Params, B, Q> {
  req: NextRequest;
  params: P;
  body: B;
  query: Q;
}

/** What a signed-in route's function receives: also the caller (checked before the body is read). */
export interface RouteContext<P extends Params, B, Q> extends PublicRouteContext<P, B, Q> {
  user: SessionUser;
}

/** How a route reads its input and answers. */
export interface RouteOptions<BS extends Schema, QS extends Schema> {
  /** zod schema of the JSON body; without one the body is ignored. */
  body?: BS;
  /** zod schema of the query string (values are strings). */
  query?: QS;
  /** Status of a successful answer (default 200; 201 for creations). */
  status?: number;
}

/** The function signature Next.js calls for an App Router route handler. */
export type NextRouteHandler<P extends Params> = (req: NextRequest, ctx: { params: Promise<P> }) => Promise<Response>;

const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A JSON response that no cache keeps. */
export function json(data: unknown, status = 200): Response {
  return Response.json(data, { status, headers: { 'cache-control': 'no-store' } });
}

/** What a client is told when the database cannot be reached: a change was not made. */
export const DB_UNAVAILABLE_WRITE = 'Not saved — the server could not reach its database. Retry.';
export const DB_UNAVAILABLE_READ = 'The server could not reach its database. Retry in a moment.';

// PostgreSQL SQLSTATE classes 08 (connection exception) and 57P (operator intervention: shutdown,
// crash, cannot connect now), and what node-postgres says when the server goes away mid-query
const UNAVAILABLE_SQLSTATE = /^(08|57P0[1-3])/;
const UNAVAILABLE_TEXT = /Connection terminated|not queryable|ECONNREFUSED|ECONNRESET|EPIPE|the database system is (starting up|shutting down|in recovery mode)/i;

/** True when `e` says the database could not be reached (so the request changed nothing it can promise). */
export function isDatabaseUnavailable(e: unknown): boolean {
  if (e instanceof ConnectionError) return true;
  if (e instanceof DatabaseError) {
    const parent = (e as DatabaseError & { parent?: { code?: string; message?: string } }).parent;
    return UNAVAILABLE_SQLSTATE.test(parent?.code ?? '') || UNAVAILABLE_TEXT.test(parent?.message ?? e.message);
  }
  // node-postgres used directly (not through Sequelize): only its own words, so that another
  // service being down (mail, object store: ECONNREFUSED too) is not reported as the database
  return e instanceof Error && /Connection terminated unexpectedly|not queryable|the database system is/i.test(e.message);
}

/** The JSON error response for `e` (an AppError, a ZodError, an unreachable database → 503, or anything else → 500). */
export function errorResponse(e: unknown, where: string): Response {
  if (e instanceof AppError) return json(e.toBody(), e.status);
  if (e instanceof z.ZodError) return json(zodError(e).toBody(), 422);
  if (e instanceof UniqueConstraintError) return json(new AppError('exists', 'that already exists').toBody(), 409);
  if (isDatabaseUnavailable(e)) {
    console.error(`[api] ${where} failed: database unavailable (${(e as Error).name}: ${(e as Error).message})`);
    const write = !/^(GET|HEAD|OPTIONS) /.test(where);
    const res = json(new AppError('unavailable', write ? DB_UNAVAILABLE_WRITE : DB_UNAVAILABLE_READ).toBody(), 503);
    res.headers.set('retry-after', '2');
    return res;
  }
  const detail = e instanceof Error ? `${e.name}: ${e.message}\n${e.stack ?? ''}` : String(e);
  console.error(`[api] ${where} failed: ${detail}`);
  return json({ error: { code: 'internal', message: 'something went wrong on the server' } }, 500);
}

/** The 422 AppError for a failed zod parse: the first issue, its path joined with '.'. */
export function zodError(err: z.ZodError): AppError {
  const issue = err.issues[0];
  const field = issue && issue.path.length ? issue.path.map(String).join('.') : undefined;
  const message = issue ? (field ? `${field}: ${issue.message}` : issue.message) : 'invalid input';
  return new AppError('invalid', message, field === undefined ? {} : { field });
}

/** Read the request body as bytes, refusing more than `maxBytes` (413) even without a content-length. */
export async function readBodyBytes(req: Request, maxBytes = MAX_BODY_BYTES): Promise<Uint8Array> {
  const declared = Number(req.headers.get('content-length') ?? '0');
  const tooLarge = () => new AppError('payload_too_large', `request body is larger than ${maxBytes} bytes`);
  if (declared > maxBytes) throw tooLarge();
  if (!req.body) return new Uint8Array();
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    bytes.set(c, at);
    at += c.byteLength;
  }
  return bytes;
}

/** Read the request body as UTF-8 text, refusing more than MAX_BODY_BYTES (413). */
export async function readBodyText(req: Request, maxBytes = MAX_BODY_BYTES): Promise<string> {
  const bytes = await readBodyBytes(req, maxBytes);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new AppError('bad_json', 'request body is not valid UTF-8');
  }
}

function isJsonType(contentType: string | null): boolean {
  if (!contentType) return false;
  const mime = contentType.split(';')[0].trim().toLowerCase();
  return mime === 'application/json' || mime.endsWith('+json');
}

async function parseBody(req: NextRequest, schema: z.ZodType): Promise<unknown> {
  const text = await readBodyText(req);
  let raw: unknown = {};
  if (text.trim() !== '') {
    if (!isJsonType(req.headers.get('content-type'))) {
      throw new AppError('unsupported_media_type', 'send the body as application/json');
    }
    try {
      raw = JSON.parse(text);
    } catch {
      throw new AppError('bad_json', 'request body is not valid JSON');
    }
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw zodError(parsed.error);
  return parsed.data;
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request forgery guard for every state-changing call (defence in depth beside the
 * SameSite=Lax session cookie and the JSON-only bodies): a browser that says the request comes
 * from another site (`Sec-Fetch-Site: cross-site`) or names another `Origin` than this app's is
 * refused before anything is read. Non-browser clients send neither header and are unaffected.
 */
export function checkSameOrigin(req: Pick<NextRequest, 'method' | 'headers' | 'nextUrl'>): void {
  if (SAFE_METHODS.has(req.method)) return;
  const site = req.headers.get('sec-fetch-site');
  if (site === 'cross-site') throw new AppError('cross_site', 'requests from other sites are refused');
  const origin = req.headers.get('origin');
  if (!origin) return;
  const allowed = new Set([req.nextUrl.origin]);
  try {
    allowed.add(new URL(env().NEXTAUTH_URL).origin);
  } catch {
    // NEXTAUTH_URL is validated by lib/env.ts; an unusable one only narrows the set
  }
  if (!allowed.has(origin)) throw new AppError('cross_site', 'requests from other sites are refused');
}

let warmed = false;
/** In the web server (not in tests or scripts), start the solve threads on the first API request. */
function warmOnce(): void {
  if (warmed || process.env.NEXT_RUNTIME !== 'nodejs') return;
  warmed = true;
  try {
    warmSolvePool();
  } catch (e) {
    console.error(`[solve-pool] could not start the solve threads early: ${e instanceof Error ? e.message : String(e)}`);
  }
}

function wrap<P extends Params, BS extends Schema, QS extends Schema>(
  options: RouteOptions<BS, QS>,
  signedIn: boolean,
  fn: (ctx: RouteContext<P, Out<BS>, Out<QS>>) => Promise<unknown>,
): NextRouteHandler<P> {
  return async (req, ctx) => {
    const where = `${req.method} ${req.nextUrl.pathname}`;
    warmOnce();
    try {
      checkSameOrigin(req);
      const who = signedIn ? await requireCaller(req) : null;
      const user = who ? who.user : (null as unknown as SessionUser);
      const params = ((await ctx?.params) ?? {}) as P;
      for (const [key, value] of Object.entries(params)) {
        if (key.endsWith('Id') && !UUID_RE.test(value)) throw notFound(key.slice(0, -2));
      }
      let query: unknown = undefined;
      if (options.query) {
        const parsed = options.query.safeParse(Object.fromEntries(req.nextUrl.searchParams));
        if (!parsed.success) throw zodError(parsed.error);
        query = parsed.data;
      }
      const body = options.body ? await parseBody(req, options.body) : undefined;
      const call = () => fn({ req, params, body: body as Out<BS>, query: query as Out<QS>, user });
      // the roles were read with the user: the request's first authorisation check uses them
      const result = who ? await withPreloadedCaller(who.caller, call) : await call();
      return result instanceof Response ? result : json(result, options.status ?? 200);
    } catch (e) {
      if (isClientAbort(e)) return errorResponse(new AppError('aborted', 'the request was cancelled before its body arrived'), where);
      return errorResponse(e, where);
    }
  };
}

/**
 * True when the client went away while its body was being read (Node's "aborted", ECONNRESET): the
 * request changed nothing, no one waits for the answer, and it is not a server fault to log.
 */
export function isClientAbort(e: unknown): boolean {
  return e instanceof Error && e.message === 'aborted' && (e as Error & { code?: string }).code === 'ECONNRESET';
}

/**
 * Wrap a route function for signed-in callers (401 first, before any input is read). Path
 * parameters whose name ends in `Id` must be UUIDs (else 404, as for any unknown id). The
 * function returns the response body (sent as JSON with `options.status`) or a ready Response.
 */
export function route<P extends Params = Params, BS extends Schema = undefined, QS extends Schema = undefined>(
  options: RouteOptions<BS, QS>,
  fn: (ctx: RouteContext<P, Out<BS>, Out<QS>>) => Promise<unknown>,
): NextRouteHandler<P> {
  return wrap(options, true, fn);
}

/** Like `route`, for routes that anyone may call (sign-up, invitation preview). */
export function publicRoute<P extends Params = Params, BS extends Schema = undefined, QS extends Schema = undefined>(
  options: RouteOptions<BS, QS>,
  fn: (ctx: PublicRouteContext<P, Out<BS>, Out<QS>>) => Promise<unknown>,
): NextRouteHandler<P> {
  return wrap(options, false, fn);
}
