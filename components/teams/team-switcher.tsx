'use client';

import { useRouter } from 'next/navigation';
import { useId } from 'react';
import { useTeams } from '@/lib/client/hooks';

/** A select of my teams; choosing one opens its designs (or the same sub-page in the other team). */
export function TeamSwitcher({ teamId, subPath = '' }: { teamId: string; subPath?: string }) {
  const router = useRouter();
  const teams = useTeams();
  const id = useId();
  const list = teams.data?.teams ?? [];
  return (
    <div className="flex items-center gap-2 text-sm">
      <label htmlFor={id} className="text-ink-400">
        Team
      </label>
      <select
        id={id}
        data-testid="team-switcher"
        className="rounded-md border border-ink-600 bg-ink-900 px-2 py-1 text-ink-50 hover:border-ink-400"
        value={list.some((t) => t.id === teamId) ? teamId : ''}
        disabled={teams.isPending}
        onChange={(e) => {
          if (e.target.value) router.push(`/teams/${e.target.value}${subPath}`);
        }}
      >
        {list.length === 0 ? <option value="">…</option> : null}
        {list.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </select>
    </div>
  );
}
