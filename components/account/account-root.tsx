'use client';

import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice, Panel } from '@/components/ui/notice';
import { SignOutButton } from '@/components/shell/sign-out-button';
import { ApiError, fieldError, formError } from '@/lib/client/api';
import { useChangePassword } from '@/lib/client/hooks';

/** Account page: who I am, change password, sign out. */
export function AccountRoot({ name, email }: { name: string; email: string }) {
  const change = useChangePassword();
  const [form, setForm] = useState({ currentPassword: '', newPassword: '', confirm: '' });
  const [mismatch, setMismatch] = useState(false);

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    if (form.newPassword !== form.confirm) {
      setMismatch(true);
      return;
    }
    setMismatch(false);
    change.mutate(
      { currentPassword: form.currentPassword, newPassword: form.newPassword },
      { onSuccess: () => setForm({ currentPassword: '', newPassword: '', confirm: '' }) },
    );
  }

  const wrongCurrent = change.error instanceof ApiError && change.error.status === 403 && !change.error.field ? change.error.message : undefined;

  return (
    <div className="max-w-xl space-y-5">
      <h1 className="text-2xl font-semibold text-ink-50">Account</h1>
      <Panel title="Signed in as">
        <div className="flex items-center justify-between gap-3">
          <p className="text-sm">
            <span className="block text-ink-50" data-testid="account-name">
              {name || email}
            </span>
            <span className="text-ink-400" data-testid="account-email">
              {email}
            </span>
          </p>
          <SignOutButton />
        </div>
      </Panel>
      <Panel title="E-mail notifications">
        <p className="text-sm text-ink-200">
          Choose which events also reach you by e-mail:{' '}
          <Link href="/settings/notifications" className="rounded text-lagoon-400 hover:underline" data-testid="account-notifications-link">
            notification settings
          </Link>
          .
        </p>
      </Panel>
      <Panel title="Change password">
        <form onSubmit={onSubmit} className="space-y-3" data-testid="password-form" noValidate>
          {change.isSuccess ? <Notice tone="success">Password changed.</Notice> : null}
          {formError(change.error, ['currentPassword', 'newPassword']) && !wrongCurrent ? (
            <Notice tone="error">{formError(change.error, ['currentPassword', 'newPassword'])}</Notice>
          ) : null}
          <TextField
            label="Current password"
            type="password"
            autoComplete="current-password"
            value={form.currentPassword}
            onChange={(e) => setForm((f) => ({ ...f, currentPassword: e.target.value }))}
            disabled={change.isPending}
            error={fieldError(change.error, 'currentPassword') ?? wrongCurrent}
          />
          <TextField
            label="New password"
            type="password"
            autoComplete="new-password"
            value={form.newPassword}
            onChange={(e) => setForm((f) => ({ ...f, newPassword: e.target.value }))}
            disabled={change.isPending}
            hint="At least 10 characters."
            error={fieldError(change.error, 'newPassword')}
          />
          <TextField
            label="New password again"
            type="password"
            autoComplete="new-password"
            value={form.confirm}
            onChange={(e) => setForm((f) => ({ ...f, confirm: e.target.value }))}
            disabled={change.isPending}
            error={mismatch ? 'The two new passwords differ.' : undefined}
          />
          <Button type="submit" pending={change.isPending} pendingLabel="Saving…">
            Change password
          </Button>
        </form>
      </Panel>
    </div>
  );
}
