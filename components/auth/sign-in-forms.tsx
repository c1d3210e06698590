'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { safeCallbackUrl } from './safe-callback';

/** Text for the error codes next-auth puts in `?error=` (and those our own authorize throws). */
export function signInErrorText(code: string | null | undefined): string | null {
  if (!code) return null;
  switch (code) {
    case 'CredentialsSignin':
      return 'That e-mail and password do not match an account.';
    case 'Verification':
      return 'That sign-in link has expired or was already used. Ask for a new one.';
    case 'EmailSignin':
      return 'We could not send the sign-in e-mail. Try again in a moment.';
    case 'SessionRequired':
      return 'Please sign in to continue.';
    case 'AccessDenied':
      return 'This account may not sign in.';
    case 'Callback':
    case 'OAuthCallback':
    case 'EmailCreateAccount':
    case 'Configuration':
    case 'Default':
      return 'Sign-in failed. Try again.';
    default:
      if (/too many|rate|locked/i.test(code)) return 'Too many attempts, try again later.';
      return code;
  }
}

/** Password sign-in and "e-mail me a link", side by side on one screen. */
export function SignInForms({ callbackUrl: rawCallback, initialError }: { callbackUrl?: string; initialError?: string }) {
  const router = useRouter();
  const callbackUrl = safeCallbackUrl(rawCallback);
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(signInErrorText(initialError));

  const [linkEmail, setLinkEmail] = useState('');
  const [linkPending, setLinkPending] = useState(false);
  const [linkError, setLinkError] = useState<string | null>(null);

  async function onPassword(e: FormEvent) {
    e.preventDefault();
    setPending(true);
    setError(null);
    const res = await signIn<'credentials'>('credentials', { email, password, redirect: false, callbackUrl }).catch(() => undefined);
    if (res?.ok && !res.error) {
      router.push(callbackUrl);
      router.refresh();
      return;
    }
    setPending(false);
    setError(signInErrorText(res?.error ?? 'Default'));
  }

  async function onLink(e: FormEvent) {
    e.preventDefault();
    setLinkPending(true);
    setLinkError(null);
    const res = await signIn<'email'>('email', { email: linkEmail, redirect: false, callbackUrl }).catch(() => undefined);
    if (res?.ok && !res.error) {
      router.push(`/check-email?email=${encodeURIComponent(linkEmail)}`);
      return;
    }
    setLinkPending(false);
    setLinkError(signInErrorText(res?.error ?? 'EmailSignin'));
  }

  return (
    <div className="space-y-6">
      <form onSubmit={onPassword} className="space-y-3" data-testid="password-signin-form" noValidate>
        {error ? (
          <Notice tone="error" testId="signin-error">
            {error}
          </Notice>
        ) : null}
        <TextField label="E-mail" type="email" name="email" autoComplete="email" required value={email} onChange={(e) => setEmail(e.target.value)} disabled={pending} />
        <TextField label="Password" type="password" name="password" autoComplete="current-password" required value={password} onChange={(e) => setPassword(e.target.value)} disabled={pending} />
        <Button type="submit" pending={pending} pendingLabel="Signing in…" className="w-full" data-testid="password-signin-submit">
          Sign in
        </Button>
      </form>

      <div className="flex items-center gap-3 text-xs uppercase tracking-wide text-ink-400" aria-hidden="true">
        <span className="h-px flex-1 bg-ink-600" /> or <span className="h-px flex-1 bg-ink-600" />
      </div>

      <form onSubmit={onLink} className="space-y-3" data-testid="link-signin-form" noValidate>
        {linkError ? <Notice tone="error">{linkError}</Notice> : null}
        <TextField
          label="E-mail me a sign-in link"
          type="email"
          name="link-email"
          autoComplete="email"
          required
          value={linkEmail}
          onChange={(e) => setLinkEmail(e.target.value)}
          disabled={linkPending}
          hint="The link signs you in once and expires after a while."
        />
        <Button type="submit" variant="secondary" pending={linkPending} pendingLabel="Sending…" className="w-full" data-testid="link-signin-submit">
          Send link
        </Button>
      </form>

      <p className="text-center text-sm text-ink-400">
        New here?{' '}
        <Link className="rounded text-lagoon-400 underline-offset-2 hover:underline" href={`/signup${rawCallback ? `?callbackUrl=${encodeURIComponent(callbackUrl)}` : ''}`}>
          Create an account
        </Link>
      </p>
    </div>
  );
}
