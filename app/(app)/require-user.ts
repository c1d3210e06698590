import 'server-only';
import { redirect } from 'next/navigation';
import { getSessionUser, type SessionUser } from '@/lib/auth/session';

/**
 * The signed-in user of a page request (confirmed against the database), or a redirect to the
 * sign-in page that comes back to `returnTo`. Pages call this themselves: a layout is not re-run
 * on every navigation.
 */
export async function requireUser(returnTo: string): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) redirect(`/signin?callbackUrl=${encodeURIComponent(returnTo)}`);
  return user;
}
