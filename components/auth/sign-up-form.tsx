'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useState, type ChangeEvent, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { fieldError, formError } from '@/lib/client/api';
import { useSignUp } from '@/lib/client/hooks';
import { safeCallbackUrl } from './safe-callback';
import { signInErrorText } from './sign-in-forms';

const FIELDS = ['email', 'name', 'password'] as const;

/** Creates the account, then asks next-auth to e-mail a sign-in link (which also verifies the address). */
export function SignUpForm({ callbackUrl: rawCallback }: { callbackUrl?: string }) {
  const router = useRouter();
  const callbackUrl = safeCallbackUrl(rawCallback);
  const signUp = useSignUp();
  const [form, setForm] = useState({ email: '', name: '', password: '' });
  const [linkError, setLinkError] = useState<string | null>(null);
  const [sending, setSending] = useState(false);
  const pending = signUp.isPending || sending;

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    setLinkError(null);
    try {
      await signUp.mutateAsync(form);
    } catch {
      return; // shown from signUp.error
    }
    setSending(true);
    const res = await signIn<'email'>('email', { email: form.email, redirect: false, callbackUrl }).catch(() => undefined);
    if (res?.ok && !res.error) {
      router.push(`/check-email?email=${encodeURIComponent(form.email)}&new=1`);
      return;
    }
    setSending(false);
    setLinkError(`Your account exists, but ${signInErrorText(res?.error ?? 'EmailSignin')?.toLowerCase()} You can sign in with your password.`);
  }

  const set = (k: keyof typeof form) => (e: ChangeEvent<HTMLInputElement>) => setForm((f) => ({ ...f, [k]: e.target.value }));
  const topError = formError(signUp.error, FIELDS) ?? linkError;

  return (
    <form onSubmit={onSubmit} className="space-y-3" data-testid="signup-form" noValidate>
      {topError ? (
        <Notice tone="error" testId="signup-error">
          {topError}
        </Notice>
      ) : null}
      <TextField label="Name" name="name" autoComplete="name" required value={form.name} onChange={set('name')} disabled={pending} error={fieldError(signUp.error, 'name')} />
      <TextField label="E-mail" type="email" name="email" autoComplete="email" required value={form.email} onChange={set('email')} disabled={pending} error={fieldError(signUp.error, 'email')} />
      <TextField
        label="Password"
        type="password"
        name="password"
        autoComplete="new-password"
        required
        minLength={10}
        value={form.password}
        onChange={set('password')}
        disabled={pending}
        hint="At least 10 characters."
        error={fieldError(signUp.error, 'password')}
      />
      <Button type="submit" pending={pending} pendingLabel="Creating account…" className="w-full" data-testid="signup-submit">
        Create account
      </Button>
      <p className="text-center text-sm text-ink-400">
        Already have an account?{' '}
        <Link className="rounded text-lagoon-400 underline-offset-2 hover:underline" href={`/signin${rawCallback ? `?callbackUrl=${encodeURIComponent(callbackUrl)}` : ''}`}>
          Sign in
        </Link>
      </p>
    </form>
  );
}
