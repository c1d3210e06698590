'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import { ROLES, type MemberDto, type Role } from '@/lib/api/contract';
import { ApiError, fieldError, formError } from '@/lib/client/api';
import { formatDateTime } from '@/lib/client/format';
import { useChangeRole, useInvitations, useInvite, useMe, useMembers, useRemoveMember, useRevokeInvitation, useTeam } from '@/lib/client/hooks';
import { TeamSwitcher } from './team-switcher';

const ROLE_NOTES: Record<Role, string> = {
  owner: 'everything, including members and invitations',
  designer: 'creates, saves, forks and shares designs',
  reviewer: 'reads designs (review tools come later)',
  viewer: 'reads designs',
};

function MemberRow({ m, teamId, isOwner, isMe }: { m: MemberDto; teamId: string; isOwner: boolean; isMe: boolean }) {
  const changeRole = useChangeRole(teamId);
  const remove = useRemoveMember(teamId);
  const error = changeRole.error ?? remove.error;
  return (
    <tr className="border-t border-ink-800 align-top" data-testid="member-row">
      <td className="px-3 py-2">
        <span className="font-medium text-ink-50">{m.name || m.email}</span>
        {isMe ? <span className="ml-2 text-xs text-ink-400">(you)</span> : null}
        <span className="block text-xs text-ink-400">{m.email}</span>
        {error ? (
          <p className="mt-1 text-xs text-hazard-100" role="alert">
            {formError(error)}
          </p>
        ) : null}
      </td>
      <td className="px-3 py-2">
        {isOwner ? (
          <select
            aria-label={`Role of ${m.name || m.email}`}
            value={m.role}
            disabled={changeRole.isPending}
            data-testid="member-role"
            onChange={(e) => changeRole.mutate({ userId: m.userId, role: e.target.value as Role })}
            className="rounded-md border border-ink-600 bg-ink-900 px-2 py-1 text-sm text-ink-50 hover:border-ink-400"
          >
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </select>
        ) : (
          <Badge>{m.role}</Badge>
        )}
      </td>
      <td className="whitespace-nowrap px-3 py-2 text-ink-400">{formatDateTime(m.joinedAt)}</td>
      <td className="px-3 py-2 text-right">
        {isOwner && !isMe ? (
          <Button
            variant="danger"
            pending={remove.isPending}
            pendingLabel="Removing…"
            data-testid="member-remove"
            onClick={() => {
              if (window.confirm(`Remove ${m.name || m.email} from the team?`)) remove.mutate(m.userId);
            }}
          >
            Remove
          </Button>
        ) : null}
      </td>
    </tr>
  );
}

function InviteForm({ teamId }: { teamId: string }) {
  const invite = useInvite(teamId);
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<Role>('designer');
  const [sentTo, setSentTo] = useState<string | null>(null);

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    setSentTo(null);
    invite.mutate(
      { email, role },
      {
        onSuccess: (res) => {
          setSentTo(res.invitation.email);
          setEmail('');
        },
      },
    );
  }

  return (
    <form onSubmit={onSubmit} className="space-y-3" data-testid="invite-form" noValidate>
      {formError(invite.error, ['email', 'role']) ? <Notice tone="error">{formError(invite.error, ['email', 'role'])}</Notice> : null}
      {sentTo ? (
        <Notice tone="success" testId="invite-sent">
          Invitation sent to {sentTo}.
        </Notice>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-[1fr_12rem_auto] sm:items-start">
        <TextField label="E-mail" type="email" name="invite-email" required value={email} onChange={(e) => setEmail(e.target.value)} disabled={invite.isPending} error={fieldError(invite.error, 'email')} />
        <SelectField label="Role" name="invite-role" value={role} onChange={(e) => setRole(e.target.value as Role)} disabled={invite.isPending} error={fieldError(invite.error, 'role')} hint={ROLE_NOTES[role]}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {r}
            </option>
          ))}
        </SelectField>
        <Button type="submit" className="sm:mt-6" pending={invite.isPending} pendingLabel="Sending…" data-testid="invite-submit">
          Send invitation
        </Button>
      </div>
    </form>
  );
}

function Invitations({ teamId }: { teamId: string }) {
  const invitations = useInvitations(teamId, true);
  const revoke = useRevokeInvitation(teamId);
  if (invitations.isPending) return <Skeleton lines={2} />;
  if (invitations.isError) return <Notice tone="error">{formError(invitations.error)}</Notice>;
  const pending = invitations.data.invitations.filter((i) => !i.acceptedAt);
  if (pending.length === 0) return <p className="text-sm text-ink-400">No pending invitations.</p>;
  return (
    <>
      {revoke.error ? <Notice tone="error">{formError(revoke.error)}</Notice> : null}
      <ul className="divide-y divide-ink-800" data-testid="invitation-list">
        {pending.map((i) => (
          <li key={i.id} className="flex flex-wrap items-center justify-between gap-3 py-2 text-sm" data-testid="invitation-row">
            <span>
              <span className="text-ink-50">{i.email}</span> <Badge>{i.role}</Badge>
              <span className="block text-xs text-ink-400">
                invited by {i.invitedBy}, expires {formatDateTime(i.expiresAt)}
              </span>
            </span>
            <Button variant="danger" onClick={() => revoke.mutate(i.id)} disabled={revoke.isPending} data-testid="invitation-revoke">
              Revoke
            </Button>
          </li>
        ))}
      </ul>
    </>
  );
}

/** Team settings: members (owners change roles and remove), invitations (owners), and leaving the team. */
export function TeamSettingsRoot({ teamId }: { teamId: string }) {
  const router = useRouter();
  const team = useTeam(teamId);
  const members = useMembers(teamId);
  const me = useMe();
  const leave = useRemoveMember(teamId);

  if (team.isError) {
    const missing = team.error instanceof ApiError && team.error.status === 404;
    return <Notice tone="error">{missing ? 'This team does not exist, or you are not a member.' : formError(team.error)}</Notice>;
  }
  const isOwner = team.data?.team.role === 'owner';
  const myId = me.data?.user.id;

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-center justify-between gap-4">
        <div>
          <p className="text-sm text-ink-400">
            <Link href={`/teams/${teamId}`} className="rounded hover:text-lagoon-400">
              ← Designs
            </Link>
          </p>
          <h1 className="text-2xl font-semibold text-ink-50">{team.data ? `${team.data.team.name}: members & settings` : ' '}</h1>
        </div>
        <TeamSwitcher teamId={teamId} subPath="/settings" />
      </div>

      <Panel title="Members" testId="members-panel">
        {members.isPending ? (
          <Skeleton />
        ) : members.isError ? (
          <Notice tone="error">{formError(members.error)}</Notice>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <caption className="sr-only">Team members</caption>
              <thead>
                <tr className="text-left text-ink-400">
                  <th scope="col" className="px-3 py-2 font-medium">
                    Member
                  </th>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Role
                  </th>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Joined
                  </th>
                  <th scope="col" className="px-3 py-2">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {members.data.members.map((m) => (
                  <MemberRow key={m.userId} m={m} teamId={teamId} isOwner={isOwner} isMe={m.userId === myId} />
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      {isOwner ? (
        <>
          <Panel title="Invite a colleague">
            <InviteForm teamId={teamId} />
          </Panel>
          <Panel title="Pending invitations">
            <Invitations teamId={teamId} />
          </Panel>
        </>
      ) : null}

      <Panel title="Leave team">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <p className="text-sm text-ink-400">You lose access to this team&apos;s designs. A team always keeps at least one owner.</p>
          <Button
            variant="danger"
            disabled={!myId}
            pending={leave.isPending}
            pendingLabel="Leaving…"
            data-testid="leave-team"
            onClick={() => {
              if (myId && window.confirm('Leave this team?')) leave.mutate(myId, { onSuccess: () => router.push('/teams') });
            }}
          >
            Leave team
          </Button>
        </div>
        {leave.error ? (
          <div className="mt-3">
            <Notice tone="error" testId="leave-error">
              {leave.error instanceof ApiError && leave.error.code === 'last_owner'
                ? 'You are the last owner. Make someone else an owner first.'
                : formError(leave.error)}
            </Notice>
          </div>
        ) : null}
      </Panel>
    </div>
  );
}
