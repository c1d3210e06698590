'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Notice, Panel, Skeleton } from '@/components/ui/notice';
import { MAIL_KINDS, type MailKind, type NotificationSettingsDto } from '@/lib/api/contract';
import { api, formError } from '@/lib/client/api';

const settingsKey = ['me', 'notifications'] as const;

const KINDS: Record<MailKind, { title: string; description: string }> = {
  review_requested: {
    title: 'Someone asks you to review a design',
    description: 'Sent when a teammate picks you as a reviewer of a revision, with a link to that revision.',
  },
  review_decided: {
    title: 'A review of your design is decided',
    description: 'Sent to whoever asked for the review and to the design\u2019s author when a reviewer approves or asks for changes.',
  },
  mention: {
    title: 'You are mentioned in a comment',
    description: 'Sent when someone writes @ and your name in a comment, with a link to the comment.',
  },
  fork_offered: {
    title: 'A fork is offered back to a design you decide for',
    description: 'Sent to a design\u2019s author and its team\u2019s owners when a fork\u2019s author offers their changes back, for them to compare and accept or decline.',
  },
  invitation: {
    title: 'You are invited to another team',
    description: 'Sent to your address when a team owner invites you. An invitation to an address with no account is always sent.',
  },
};

function Switch({ kind, on, disabled, onChange }: { kind: MailKind; on: boolean; disabled: boolean; onChange: (on: boolean) => void }) {
  const titleId = `mail-${kind}-title`;
  const descId = `mail-${kind}-desc`;
  return (
    <li className="flex items-start justify-between gap-4 py-3">
      <div>
        <p id={titleId} className="text-sm font-medium text-ink-50">
          {KINDS[kind].title}
        </p>
        <p id={descId} className="text-xs text-ink-400">
          {KINDS[kind].description}
        </p>
      </div>
      <button
        type="button"
        role="switch"
        aria-checked={on}
        aria-labelledby={titleId}
        aria-describedby={descId}
        disabled={disabled}
        data-testid="notification-switch"
        data-kind={kind}
        onClick={() => onChange(!on)}
        className={`inline-flex shrink-0 items-center gap-2 rounded-full border px-1 py-0.5 text-xs font-medium disabled:opacity-60 ${on ? 'border-lagoon-600 bg-lagoon-800/40 text-lagoon-100' : 'border-ink-600 bg-ink-900 text-ink-400'}`}
      >
        <span className={`h-4 w-4 rounded-full ${on ? 'order-2 bg-lagoon-400' : 'order-1 bg-ink-600'}`} aria-hidden="true" />
        <span className={`w-7 text-center ${on ? 'order-1' : 'order-2'}`}>{on ? 'On' : 'Off'}</span>
      </button>
    </li>
  );
}

/**
 * Which e-mails Kilorung sends me: one switch per kind, saved the moment it is flipped and shown
 * as the server stored it. The activity feed lists every event whatever the switches say.
 */
export function NotificationSettingsRoot({ email }: { email: string }) {
  const qc = useQueryClient();
  const settings = useQuery({ queryKey: settingsKey, queryFn: ({ signal }) => api('GET /api/me/notifications', { signal }) });
  const [lastSaved, setLastSaved] = useState<{ kind: MailKind; on: boolean } | null>(null);
  const save = useMutation({
    mutationFn: (body: NotificationSettingsDto) => api('PUT /api/me/notifications', { body }),
    onSuccess: (res) => qc.setQueryData(settingsKey, res),
  });

  function flip(kind: MailKind, on: boolean) {
    if (!settings.data) return;
    setLastSaved(null);
    save.mutate({ ...settings.data.settings, [kind]: on }, { onSuccess: (res) => setLastSaved({ kind, on: res.settings[kind] }) });
  }

  return (
    <div className="max-w-2xl space-y-5">
      <div>
        <p className="text-sm text-ink-400">
          <Link href="/account" className="rounded hover:text-lagoon-400">
            ← Account
          </Link>
        </p>
        <h1 className="text-2xl font-semibold text-ink-50">E-mail notifications</h1>
        <p className="text-sm text-ink-400">
          Mail goes to <span className="text-ink-200">{email}</span>. Turning a kind off stops the mail only: the{' '}
          <Link href="/activity" className="rounded text-lagoon-400 hover:underline">
            activity feed
          </Link>{' '}
          still lists every event.
        </p>
      </div>
      <Panel title="Send me an e-mail when…" testId="notification-settings">
        {settings.isPending ? <Skeleton lines={5} /> : null}
        {settings.isError ? <Notice tone="error">{formError(settings.error)}</Notice> : null}
        {settings.data ? (
          <ul className="divide-y divide-ink-800">
            {MAIL_KINDS.map((k) => (
              <Switch key={k} kind={k} on={settings.data.settings[k]} disabled={save.isPending} onChange={(on) => flip(k, on)} />
            ))}
          </ul>
        ) : null}
        <div className="mt-3 min-h-6" aria-live="polite">
          {save.isPending ? <p className="text-xs text-ink-400">Saving…</p> : null}
          {save.error ? <Notice tone="error">{formError(save.error)}</Notice> : null}
          {lastSaved && !save.isPending && !save.error ? (
            <p className="text-xs text-lagoon-100" data-testid="notifications-saved">
              Saved: {KINDS[lastSaved.kind].title.toLowerCase()} — mail {lastSaved.on ? 'on' : 'off'}.
            </p>
          ) : null}
        </div>
      </Panel>
    </div>
  );
}
