'use client';

import { useRouter } from 'next/navigation';
import { Button, ButtonLink } from '@/components/ui/button';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import { ApiError, formError } from '@/lib/client/api';
import { formatDateTime } from '@/lib/client/format';
import { useAcceptInvitation, useInvitationPreview } from '@/lib/client/hooks';

/** An invitation's preview and, for the invited address when signed in, the Accept button. */
export function InvitationRoot({ token, signedInEmail }: { token: string; signedInEmail: string | null }) {
  const router = useRouter();
  const preview = useInvitationPreview(token);
  const accept = useAcceptInvitation(token);
  const here = `/invitations/${encodeURIComponent(token)}`;

  if (preview.isPending) return <Skeleton lines={3} />;
  if (preview.isError) {
    const gone = preview.error instanceof ApiError && (preview.error.status === 404 || preview.error.status === 410);
    return (
      <Notice tone="error" testId="invitation-error">
        {gone ? 'This invitation does not exist or has expired. Ask the team owner for a new one.' : formError(preview.error)}
      </Notice>
    );
  }
  const inv = preview.data.invitation;
  const wrongUser = signedInEmail !== null && signedInEmail.toLowerCase() !== inv.email.toLowerCase();

  return (
    <Panel testId="invitation">
      <div className="space-y-4">
        <h1 className="text-xl font-semibold text-ink-50">
          Join <span data-testid="invitation-team">{inv.teamName}</span>
        </h1>
        <p className="text-sm text-ink-200">
          {inv.invitedBy} invited <strong className="text-ink-50">{inv.email}</strong> to join as <Badge>{inv.role}</Badge>.
        </p>
        <p className="text-xs text-ink-400">Expires {formatDateTime(inv.expiresAt)}.</p>

        {inv.accepted ? (
          <Notice tone="success" testId="invitation-accepted">
            This invitation has been accepted.{' '}
            <a href={`/teams/${inv.teamId}`} className="underline">
              Open the team
            </a>
          </Notice>
        ) : signedInEmail === null ? (
          <div className="flex flex-wrap gap-2">
            <ButtonLink href={`/signin?callbackUrl=${encodeURIComponent(here)}`} data-testid="invitation-signin">
              Sign in to accept
            </ButtonLink>
            <ButtonLink href={`/signup?callbackUrl=${encodeURIComponent(here)}`} variant="secondary" data-testid="invitation-signup">
              Create an account
            </ButtonLink>
          </div>
        ) : wrongUser ? (
          <Notice tone="caution">
            You are signed in as {signedInEmail}. This invitation is for {inv.email}: sign out and sign in with that address to
            accept it.
          </Notice>
        ) : (
          <div className="space-y-2">
            {accept.error ? <Notice tone="error">{formError(accept.error)}</Notice> : null}
            <Button
              data-testid="invitation-accept"
              pending={accept.isPending}
              pendingLabel="Joining…"
              onClick={() => accept.mutate(undefined, { onSuccess: (res) => router.push(`/teams/${res.teamId}`) })}
            >
              Accept and join
            </Button>
          </div>
        )}
      </div>
    </Panel>
  );
}
