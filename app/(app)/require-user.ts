import 'server-only';
import { getServerSession } from 'next-auth';
import { redirect } from 'next/navigation';
import { authOptions } from '@/lib/auth/options';

/**
 * The signed-in user of a page request, or a redirect to the sign-in page that comes back to
 * `returnTo`. Pages call this themselves (a layout is not re-run on every navigation).
 */
export async function requireUser(returnTo: string): Promise<{ name: string; email: string }> {
  const session = await getServerSession(authOptions);
  if (!session?.user) redirect(`/signin?callbackUrl=${encodeURIComponent(returnTo)}`);
  return { name: session.user.name ?? '', email: session.user.email ?? '' };
}
