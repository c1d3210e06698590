import type { Metadata } from 'next';
import { getServerSession } from 'next-auth';
import { InvitationRoot } from '@/components/invitations/invitation-root';
import { Wordmark } from '@/components/wordmark';
import { authOptions } from '@/lib/auth/options';

export const metadata: Metadata = { title: 'Invitation' };

// Signed-out visitors see the preview too, with links to sign in or sign up and come back here.
export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const session = await getServerSession(authOptions);
  return (
    <main id="main" className="mx-auto w-full max-w-xl flex-1 space-y-6 px-6 py-12">
      <Wordmark href={session?.user ? '/teams' : '/'} />
      <InvitationRoot token={token} signedInEmail={session?.user?.email ?? null} />
    </main>
  );
}
