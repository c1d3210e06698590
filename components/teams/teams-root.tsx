'use client';

import Link from 'next/link';
import { ButtonLink } from '@/components/ui/button';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import { formError } from '@/lib/client/api';
import { useTeams } from '@/lib/client/hooks';

/** The teams I belong to, with my role in each. */
export function TeamsRoot() {
  const teams = useTeams();
  return (
    <div className="space-y-6">
      <div className="flex items-center justify-between gap-4">
        <h1 className="text-2xl font-semibold text-ink-50">Your teams</h1>
        <ButtonLink href="/teams/new" data-testid="new-team-link">
          New team
        </ButtonLink>
      </div>
      <Panel>
        {teams.isPending ? (
          <Skeleton />
        ) : teams.isError ? (
          <Notice tone="error">{formError(teams.error)}</Notice>
        ) : teams.data.teams.length === 0 ? (
          <div className="space-y-2 text-sm text-ink-200" data-testid="no-teams">
            <p>You are not in a team yet.</p>
            <p className="text-ink-400">
              Create one, or open the invitation link a colleague sent you.{' '}
              <Link href="/teams/new" className="rounded text-lagoon-400 underline-offset-2 hover:underline">
                Create a team
              </Link>
            </p>
          </div>
        ) : (
          <ul className="divide-y divide-ink-800" data-testid="team-list">
            {teams.data.teams.map((t) => (
              <li key={t.id} className="flex items-center justify-between gap-4 py-3">
                <Link href={`/teams/${t.id}`} className="rounded font-medium text-ink-50 hover:text-lagoon-400" data-testid="team-link">
                  {t.name}
                </Link>
                <span className="flex items-center gap-3 text-sm text-ink-400">
                  <span>
                    {t.memberCount} {t.memberCount === 1 ? 'member' : 'members'}
                  </span>
                  <Badge>{t.role}</Badge>
                </span>
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
