import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';

export const metadata: Metadata = { title: 'Check your e-mail' };

export default async function CheckEmailPage({ searchParams }: { searchParams: Promise<{ email?: string | string[]; new?: string }> }) {
  const sp = await searchParams;
  const email = Array.isArray(sp.email) ? sp.email[0] : sp.email;
  return (
    <AuthCard title="Check your e-mail">
      <div className="space-y-3 text-sm text-ink-200" data-testid="check-email">
        {sp.new ? <p>Your account is ready.</p> : null}
        <p>
          We sent a sign-in link to <strong className="text-ink-50">{email || 'your address'}</strong>. Open it on this
          device to sign in. The link works once.
        </p>
        <p className="text-ink-400">
          Nothing arrived? Check the address, then{' '}
          <Link href="/signin" className="rounded text-lagoon-400 underline-offset-2 hover:underline">
            ask for another link
          </Link>
          .
        </p>
      </div>
    </AuthCard>
  );
}
