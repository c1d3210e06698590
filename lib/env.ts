/**
 * Server configuration, read from the process environment and checked with zod the first time
 * it is asked for. Lazy on purpose: `next build` imports route modules without a database or
 * secrets in the environment, so nothing here may run at import time.
 */
import { z } from 'zod';

const envSchema = z.object({
  /** postgres://user@host:port/db */
  DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL'),
  /** Largest number of pooled PostgreSQL connections this process opens. */
  DB_POOL_MAX: z.coerce.number().int().min(1).max(200).default(20),
  NEXTAUTH_SECRET: z.string().min(16, 'at least 16 characters'),
  /** Public base URL of the app, used in mailed links. */
  NEXTAUTH_URL: z.url().default('http://127.0.0.1:3000'),
  /** SMTP URL string (gotcha G6: a string, not an object), e.g. smtp://127.0.0.1:2525 */
  EMAIL_SERVER: z.string().regex(/^smtps?:\/\//, 'must be an smtp:// URL').default('smtp://127.0.0.1:2525'),
  EMAIL_FROM: z.string().min(3).default('Kilorung <no-reply@kilorung.test>'),
  S3_ENDPOINT: z.url().default('http://127.0.0.1:4569'),
  S3_BUCKET: z.string().min(1).default('kilorung'),
  S3_REGION: z.string().min(1).default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().min(1).default('S3RVER'),
  S3_SECRET_ACCESS_KEY: z.string().min(1).default('S3RVER'),
});

/** The checked server configuration. */
export type Env = z.infer<typeof envSchema>;

let cached: Env | null = null;

/**
 * The server configuration, parsed on first use and cached. Throws one readable error naming
 * every missing or malformed variable (without echoing their values, which may be secrets).
 */
export function env(): Env {
  if (cached) return cached;
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`invalid server environment: ${problems}`);
  }
  cached = parsed.data;
  return cached;
}

/** Forget the cached configuration (tests that change process.env call this). */
export function resetEnvCache(): void {
  cached = null;
}
