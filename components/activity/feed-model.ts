/**
 * Paging and labels for the activity feed. The server pages by time (`before`: events strictly
 * older than it), so two events stamped with the same millisecond across a page boundary would
 * be skipped by a strict cursor. The next page therefore starts one millisecond after the oldest
 * event seen (it may repeat a few events, dropped by id); only if a whole page repeats, i.e. more
 * events share that millisecond than a page holds, does it step strictly past it.
 */
import type { ActivityDto, ActivityKind } from '@/lib/api/contract';

/** Events per page asked of `GET /api/activity`. */
export const FEED_PAGE_SIZE = 30;

/** The pages in order, flattened, each event once (first seen wins), newest first as served. */
export function flattenPages(pages: readonly (readonly ActivityDto[])[]): ActivityDto[] {
  const seen = new Set<string>();
  const out: ActivityDto[] = [];
  for (const page of pages)
    for (const e of page) {
      if (seen.has(e.id)) continue;
      seen.add(e.id);
      out.push(e);
    }
  return out;
}

/**
 * The `before` value for the page after `pages`, or undefined when the last page was short
 * (nothing older). `pageSize` is the limit the pages were asked with.
 */
export function olderCursor(pages: readonly (readonly ActivityDto[])[], pageSize: number): string | undefined {
  const last = pages[pages.length - 1];
  if (!last || last.length < pageSize) return undefined;
  const oldest = Date.parse(last[last.length - 1].createdAt);
  if (Number.isNaN(oldest)) return undefined;
  const earlier = new Set(pages.slice(0, -1).flatMap((p) => p.map((e) => e.id)));
  const progressed = last.some((e) => !earlier.has(e.id));
  return new Date(progressed ? oldest + 1 : oldest).toISOString();
}

const KIND_LABELS: Record<ActivityKind, string> = {
  review_requested: 'Review asked',
  review_decided: 'Review decided',
  review_withdrawn: 'Review withdrawn',
  comment: 'Comment',
  mention: 'Mention',
  comment_resolved: 'Comment resolved',
  fork_offered: 'Offered back',
  offer_decided: 'Offer decided',
  invitation: 'Invitation',
  forked: 'Forked',
};

/** Short label of an event kind. */
export function activityKindLabel(kind: string): string {
  return KIND_LABELS[kind as ActivityKind] ?? kind;
}

/** The event's path when it is an app path (one leading slash), else null: never a link off the site. */
export function appPath(path: string): string | null {
  return path.startsWith('/') && !path.startsWith('//') && !path.startsWith('/\\') ? path : null;
}
