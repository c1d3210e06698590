import { db } from '@/lib/db';

export const dynamic = 'force-dynamic';

/** Liveness for the web-server checks: `{ ok, db }`, 503 when PostgreSQL does not answer. */
export async function GET(): Promise<Response> {
  // db() itself throws when the environment is incomplete: that is "no database" too
  const dbOk = await Promise.resolve()
    .then(() => db().sequelize.query('SELECT 1'))
    .then(() => true)
    .catch(() => false);
  return Response.json({ ok: dbOk, db: dbOk }, { status: dbOk ? 200 : 503, headers: { 'cache-control': 'no-store' } });
}
