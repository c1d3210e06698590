/**
 * The failed sign-in limit, kept in PostgreSQL so it holds across processes and restarts:
 * after MAX_FAILED_SIGN_INS wrong passwords for one address within the window, password
 * sign-in for that address is refused until the lock ends. Each failure is one atomic upsert,
 * so concurrent attempts cannot slip past the count.
 */
import 'server-only';
import { QueryTypes } from 'sequelize';
import { db } from '../db';

/** Wrong passwords allowed per address within FAILURE_WINDOW_S before the lock. */
export const MAX_FAILED_SIGN_INS = 5;
/** Length of the counting window (s): 15 minutes. */
export const FAILURE_WINDOW_S = 15 * 60;
/** How long an address stays locked (s): 15 minutes. */
export const LOCK_S = 15 * 60;

/** Whether password sign-in for `email` is currently locked. */
export async function isSignInLocked(email: string): Promise<boolean> {
  const rows = await db().sequelize.query<{ locked: boolean }>(
    'SELECT (locked_until IS NOT NULL AND locked_until > now()) AS locked FROM sign_in_throttles WHERE email = :email',
    { replacements: { email: email.toLowerCase() }, type: QueryTypes.SELECT },
  );
  return rows[0]?.locked ?? false;
}

/** Count one failed attempt for `email`; returns the failures now counted in the window. */
export async function recordFailedSignIn(email: string): Promise<number> {
  const fresh = `sign_in_throttles.window_started_at < now() - make_interval(secs => :windowS)`;
  const count = `CASE WHEN ${fresh} THEN 1 ELSE sign_in_throttles.failures + 1 END`;
  const rows = await db().sequelize.query<{ failures: number }>(
    `INSERT INTO sign_in_throttles (email, failures, window_started_at, locked_until)
     VALUES (:email, 1, now(), NULL)
     ON CONFLICT (email) DO UPDATE SET
       failures = ${count},
       window_started_at = CASE WHEN ${fresh} THEN now() ELSE sign_in_throttles.window_started_at END,
       locked_until = CASE WHEN ${count} >= :max THEN now() + make_interval(secs => :lockS) ELSE sign_in_throttles.locked_until END
     RETURNING failures`,
    {
      replacements: { email: email.toLowerCase(), windowS: FAILURE_WINDOW_S, lockS: LOCK_S, max: MAX_FAILED_SIGN_INS },
      type: QueryTypes.SELECT,
    },
  );
  return rows[0]?.failures ?? 1;
}

/** Forget the failures of `email` (after a successful sign-in). */
export async function clearFailedSignIns(email: string): Promise<void> {
  await db().sequelize.query('DELETE FROM sign_in_throttles WHERE email = :email', {
    replacements: { email: email.toLowerCase() },
  });
}
