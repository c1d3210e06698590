'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useInfiniteQuery } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { SelectField } from '@/components/ui/field';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import type { ActivityDto } from '@/lib/api/contract';
import { api, formError } from '@/lib/client/api';
import { formatDateTime, personName } from '@/lib/client/format';
import { useMe } from '@/lib/client/hooks';
import { activityKindLabel, appPath, FEED_PAGE_SIZE, flattenPages, olderCursor } from './feed-model';

function useActivity(teamId: string | undefined) {
  return useInfiniteQuery({
    queryKey: ['activity', teamId ?? 'all'] as const,
    queryFn: async ({ pageParam, signal }) =>
      (await api('GET /api/activity', { query: { teamId, before: pageParam, limit: String(FEED_PAGE_SIZE) }, signal })).events,
    initialPageParam: undefined as string | undefined,
    getNextPageParam: (_last, pages) => olderCursor(pages, FEED_PAGE_SIZE),
  });
}

function EventRow({ event, teamName }: { event: ActivityDto; teamName: string | undefined }) {
  const href = appPath(event.path);
  return (
    <li
      className={`rounded-md border px-3 py-2 ${event.forYou ? 'border-copper-600 bg-copper-800/20' : 'border-ink-800'}`}
      data-testid="activity-item"
      data-kind={event.kind}
      data-for-you={event.forYou ? 'true' : 'false'}
    >
      <div className="flex flex-wrap items-center gap-2 text-xs text-ink-400">
        <Badge>{activityKindLabel(event.kind)}</Badge>
        {event.forYou ? (
          <Badge tone="live" testId="activity-for-you">
            for you
          </Badge>
        ) : null}
        <time dateTime={event.createdAt}>{formatDateTime(event.createdAt)}</time>
        {teamName ? <span>· {teamName}</span> : null}
      </div>
      <p className="mt-1 text-sm text-ink-50">
        {href ? (
          <Link href={href} className="rounded hover:text-lagoon-400 hover:underline" data-testid="activity-link">
            {event.summary}
          </Link>
        ) : (
          event.summary
        )}
      </p>
      <p className="text-xs text-ink-400">
        {personName(event.actor)}
        {event.design ? ` · ${event.design.title}` : ''}
      </p>
    </li>
  );
}

/**
 * The activity feed: what happened on the designs of my teams and what was addressed to me,
 * newest first, optionally one team; events addressed to me are marked "for you". Each event
 * links to the exact place (a review, a comment, an offer).
 */
export function ActivityRoot() {
  const me = useMe();
  const [teamId, setTeamId] = useState<string>('');
  const feed = useActivity(teamId || undefined);
  const teams = me.data?.teams ?? [];
  const teamNames = new Map(teams.map((t) => [t.id, t.name]));
  const events = feed.data ? flattenPages(feed.data.pages) : [];
  const forYou = events.filter((e) => e.forYou).length;

  return (
    <div className="max-w-3xl space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold text-ink-50">Activity</h1>
          <p className="text-sm text-ink-400">
            Reviews, comments, offers and invitations across your teams. Choose which of these also reach you by e-mail in{' '}
            <Link href="/settings/notifications" className="rounded text-lagoon-400 hover:underline">
              notification settings
            </Link>
            .
          </p>
        </div>
        {teams.length > 1 ? (
          <SelectField label="Team" value={teamId} onChange={(e) => setTeamId(e.target.value)} className="w-56" data-testid="activity-team">
            <option value="">All my teams</option>
            {teams.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </SelectField>
        ) : null}
      </div>

      <Panel
        title="Newest first"
        actions={events.length > 0 ? <span className="text-xs text-ink-400">{forYou > 0 ? `${forYou} shown for you` : 'nothing shown is addressed to you'}</span> : undefined}
      >
        {feed.isPending ? <Skeleton lines={5} /> : null}
        {feed.isError && !feed.data ? <Notice tone="error">{formError(feed.error)}</Notice> : null}
        {feed.data && events.length === 0 ? (
          <p className="text-sm text-ink-400" data-testid="activity-empty">
            Nothing has happened yet. Asking for a review, commenting or offering a fork back shows up here.
          </p>
        ) : null}
        {events.length > 0 ? (
          <ol className="space-y-2" data-testid="activity-list">
            {events.map((e) => (
              <EventRow key={e.id} event={e} teamName={teams.length > 1 ? teamNames.get(e.teamId) : undefined} />
            ))}
          </ol>
        ) : null}
        {feed.isFetchNextPageError ? (
          <div className="mt-3">
            <Notice tone="error">{formError(feed.error)}</Notice>
          </div>
        ) : null}
        {feed.hasNextPage ? (
          <div className="mt-3">
            <Button variant="secondary" data-testid="activity-load-older" pending={feed.isFetchingNextPage} pendingLabel="Loading…" onClick={() => void feed.fetchNextPage()}>
              Load older
            </Button>
          </div>
        ) : null}
        {feed.data && events.length > 0 && !feed.hasNextPage ? <p className="mt-3 text-xs text-ink-400">That is everything.</p> : null}
      </Panel>
    </div>
  );
}
