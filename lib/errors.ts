/**
 * One error type for everything an API route may answer with on purpose. Each code maps to one
 * HTTP status; route handlers turn an AppError into `{ error: { code, message, field? } }`.
 */

/** HTTP status for each error code. */
export const ERROR_STATUS = {
  bad_json: 400,
  /** The client went away while its request body was being read: nothing was changed. */
  aborted: 400,
  unauthenticated: 401,
  forbidden: 403,
  cross_site: 403,
  not_found: 404,
  conflict: 409,
  last_owner: 409,
  exists: 409,
  expired: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  invalid: 422,
  rate_limited: 429,
  internal: 500,
  /** The database could not be reached (stopped, restarting, pool exhausted): nothing was changed; retry. */
  unavailable: 503,
} as const;

/** The error codes the API uses. */
export type ErrorCode = keyof typeof ERROR_STATUS;

/** Extra fields an error body may carry besides code and message. */
export interface ErrorExtras {
  /** Input field the error is about (zod path joined with '.'). */
  field?: string;
  /** On a stale save: the design's current revision number. */
  latestRevision?: number;
}

/** An expected failure with a typed code; its HTTP status follows from the code. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly extras: ErrorExtras;
  constructor(code: ErrorCode, message: string, extras: ErrorExtras = {}) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.extras = extras;
  }
  /** HTTP status for this error's code. */
  get status(): number {
    return ERROR_STATUS[this.code];
  }
  /** The JSON body sent to the client. */
  toBody(): { error: { code: ErrorCode; message: string } & ErrorExtras } {
    return { error: { code: this.code, message: this.message, ...this.extras } };
  }
}

/** 401: no valid session. */
export const unauthenticated = (message = 'sign in first'): AppError => new AppError('unauthenticated', message);
/** 403: signed in and allowed to see the thing, but not to do this. */
export const forbidden = (message = 'your role does not allow this'): AppError => new AppError('forbidden', message);
/** 404: unknown, or not visible to the caller (existence must not leak). */
export const notFound = (what = 'resource'): AppError => new AppError('not_found', `${what} not found`);
/** 409: the request conflicts with the current state. */
export const conflict = (message: string, extras: ErrorExtras = {}): AppError => new AppError('conflict', message, extras);
/** 422: input that parsed but is not acceptable. */
export const invalid = (message: string, field?: string): AppError =>
  new AppError('invalid', message, field === undefined ? {} : { field });

/** True when `e` is an AppError. */
export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}
