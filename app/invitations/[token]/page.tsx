import type { Metadata } from 'next';
import { InvitationRoot } from '@/components/invitations/invitation-root';
import { Wordmark } from '@/components/wordmark';
import { getSessionUser } from '@/lib/auth/session';

export const metadata: Metadata = { title: 'Invitation' };

// Signed-out visitors see the preview too, with links to sign in or sign up and come back here.
export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const user = await getSessionUser();
  return (
    <main id="main" className="mx-auto w-full max-w-xl flex-1 space-y-6 px-6 py-12">
      <Wordmark href={user ? '/teams' : '/'} />
      <InvitationRoot token={token} signedInEmail={user?.email ?? null} />
    </main>
  );
}
