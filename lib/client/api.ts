/**
 * Typed fetch wrapper for the browser: calls a route named as in `Api` (lib/api/contract.ts),
 * fills in its `:params`, sends JSON, and turns the `{ error: { code, message, field } }` body
 * into an {@link ApiError}. Every client hook goes through here, so error handling is uniform.
 */
import type { Api, ApiErrorBody } from '@/lib/api/contract';

/** A route key of the contract, e.g. `'GET /api/teams/:teamId'`. */
export type RouteKey = keyof Api;

type ParamsOf<P extends string> = P extends `${string}:${infer Param}/${infer Rest}`
  ? { [K in Param]: string } & ParamsOf<`/${Rest}`>
  : P extends `${string}:${infer Param}`
    ? { [K in Param]: string }
    : Record<never, never>;

type PathOf<K extends RouteKey> = K extends `${string} ${infer Path}` ? Path : never;

/** The `:param` values a route key needs, as an object. */
export type RouteParams<K extends RouteKey> = ParamsOf<PathOf<K>>;

/** An error answered by the API (or a network failure, with code `network` and status 0). */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  /** Request field the error is about (dot path, e.g. `email` or `document.blocks.0.id`). */
  readonly field?: string;
  /** On a 409 from a stale save: the newest revision number. */
  readonly latestRevision?: number;

  constructor(status: number, body: ApiErrorBody['error']) {
    super(body.message);
    this.name = 'ApiError';
    this.status = status;
    this.code = body.code;
    this.field = body.field;
    this.latestRevision = body.latestRevision;
  }
}

export interface RequestOptions<K extends RouteKey> {
  params?: RouteParams<K>;
  query?: Record<string, string | undefined>;
  body?: unknown;
  signal?: AbortSignal;
}

function isErrorBody(v: unknown): v is ApiErrorBody {
  if (typeof v !== 'object' || v === null || !('error' in v)) return false;
  const e = (v as { error: unknown }).error;
  return typeof e === 'object' && e !== null && typeof (e as { message?: unknown }).message === 'string';
}

/** Builds the URL for a route key from its params and query (empty query values are dropped). */
export function routeUrl<K extends RouteKey>(key: K, params?: RouteParams<K>, query?: Record<string, string | undefined>): string {
  const path = key.slice(key.indexOf(' ') + 1);
  const values = (params ?? {}) as Record<string, string>;
  const filled = path.replace(/:([A-Za-z]+)/g, (_, name: string) => {
    const v = values[name];
    if (v === undefined) throw new Error(`missing route param ${name} for ${key}`);
    return encodeURIComponent(v);
  });
  const qs = new URLSearchParams();
  for (const [k, v] of Object.entries(query ?? {})) if (v !== undefined && v !== '') qs.set(k, v);
  const s = qs.toString();
  return s ? `${filled}?${s}` : filled;
}

/** Calls one API route and returns its typed response body, or throws {@link ApiError}. */
export async function api<K extends RouteKey>(key: K, opts: RequestOptions<K> = {}): Promise<Api[K]> {
  const method = key.slice(0, key.indexOf(' '));
  const url = routeUrl(key, opts.params, opts.query);
  let res: Response;
  try {
    res = await fetch(url, {
      method,
      headers: opts.body === undefined ? { accept: 'application/json' } : { accept: 'application/json', 'content-type': 'application/json' },
      body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
      credentials: 'same-origin',
      signal: opts.signal,
    });
  } catch (e) {
    if (e instanceof DOMException && e.name === 'AbortError') throw e;
    throw new ApiError(0, { code: 'network', message: 'Could not reach the server. Check your connection and try again.' });
  }
  const text = await res.text();
  let parsed: unknown = undefined;
  if (text) {
    try {
      parsed = JSON.parse(text);
    } catch {
      parsed = undefined;
    }
  }
  if (!res.ok) {
    if (isErrorBody(parsed)) throw new ApiError(res.status, parsed.error);
    throw new ApiError(res.status, { code: `http_${res.status}`, message: `The server answered ${res.status} ${res.statusText}.` });
  }
  return parsed as Api[K];
}

/** The message for a form field from an error, when the server named that field. */
export function fieldError(error: unknown, field: string): string | undefined {
  if (!(error instanceof ApiError) || error.field !== field) return undefined;
  // Shown under the field itself, so a leading "field: " in the message is redundant.
  const prefix = `${field}: `;
  return error.message.startsWith(prefix) ? error.message.slice(prefix.length) : error.message;
}

/** The message for an error that is not about one of `fields` (shown at the top of a form). */
export function formError(error: unknown, fields: readonly string[] = []): string | undefined {
  if (!error) return undefined;
  if (error instanceof ApiError) return error.field && fields.includes(error.field) ? undefined : error.message;
  return error instanceof Error ? error.message : 'Something went wrong.';
}
