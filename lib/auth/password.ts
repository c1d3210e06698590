/**
 * Password hashing with bcrypt (bcryptjs, pure JS). Kept free of `server-only` so the seed
 * script (tsx) can hash the demo passwords with the same cost as the app.
 */
import bcrypt from 'bcryptjs';

/** bcrypt cost factor: 2^10 rounds, about 60–100 ms per hash here (common practice ≥ 10). */
export const BCRYPT_COST = 10;

/** A bcrypt hash of `password`. */
export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

// A valid hash of a random string: comparing against it when there is no account keeps the
// answer time the same whether or not the address exists.
const DUMMY_HASH = '$2b$10$Lh/TQRSyQWyZp1it1JSpn.x1L5IXkwK3rtOiln/V8/HQavgTmq3ai';

/** Whether `password` matches `hash`; a null hash (no password set) never matches. */
export async function verifyPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    await bcrypt.compare(password, DUMMY_HASH);
    return false;
  }
  return bcrypt.compare(password, hash);
}
