import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { AuthCard } from '@/components/auth/auth-card';
import { safeCallbackUrl } from '@/components/auth/safe-callback';
import { SignInForms } from '@/components/auth/sign-in-forms';
import { getSessionUser } from '@/lib/auth/session';

export const metadata: Metadata = { title: 'Sign in' };

type Search = Promise<{ callbackUrl?: string | string[]; error?: string | string[] }>;

function one(v: string | string[] | undefined): string | undefined {
  return Array.isArray(v) ? v[0] : v;
}

export default async function SignInPage({ searchParams }: { searchParams: Search }) {
  const sp = await searchParams;
  const callbackUrl = one(sp.callbackUrl);
  const user = await getSessionUser();
  if (user) redirect(safeCallbackUrl(callbackUrl));
  return (
    <AuthCard title="Sign in to Kilorung">
      <SignInForms callbackUrl={callbackUrl} initialError={one(sp.error)} />
    </AuthCard>
  );
}
