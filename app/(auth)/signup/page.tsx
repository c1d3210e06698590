import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { AuthCard } from '@/components/auth/auth-card';
import { safeCallbackUrl } from '@/components/auth/safe-callback';
import { SignUpForm } from '@/components/auth/sign-up-form';
import { getSessionUser } from '@/lib/auth/session';

export const metadata: Metadata = { title: 'Create an account' };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string | string[] }> }) {
  const sp = await searchParams;
  const callbackUrl = Array.isArray(sp.callbackUrl) ? sp.callbackUrl[0] : sp.callbackUrl;
  const user = await getSessionUser();
  if (user) redirect(safeCallbackUrl(callbackUrl));
  return (
    <AuthCard title="Create your Kilorung account" footer="We e-mail you a link to confirm your address and sign you in.">
      <SignUpForm callbackUrl={callbackUrl} />
    </AuthCard>
  );
}
