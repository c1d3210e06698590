import { describe, expect, it } from 'vitest';
import type { ActivityDto } from '@/lib/api/contract';
import { activityKindLabel, appPath, flattenPages, olderCursor } from '@/components/activity/feed-model';

function ev(id: string, createdAt: string): ActivityDto {
  return { id, kind: 'comment', teamId: 't', design: null, actor: { id: 'u', name: 'U', email: 'u@tallgrass.test' }, summary: id, path: '/designs/x', forYou: false, createdAt };
}

describe('olderCursor', () => {
  it('stops after a short page', () => {
    expect(olderCursor([[ev('a', '2026-01-01T00:00:02.000Z')]], 2)).toBeUndefined();
    expect(olderCursor([], 2)).toBeUndefined();
  });

  it('starts the next page one millisecond after the oldest event, so same-millisecond events are not skipped', () => {
    const page = [ev('a', '2026-01-01T00:00:02.000Z'), ev('b', '2026-01-01T00:00:01.500Z')];
    expect(olderCursor([page], 2)).toBe('2026-01-01T00:00:01.501Z');
  });

  it('steps strictly past a millisecond when a whole page only repeated events already seen', () => {
    const first = [ev('a', '2026-01-01T00:00:02.000Z'), ev('b', '2026-01-01T00:00:01.000Z')];
    const repeat = [ev('b', '2026-01-01T00:00:01.000Z'), ev('b', '2026-01-01T00:00:01.000Z')];
    expect(olderCursor([first, repeat], 2)).toBe('2026-01-01T00:00:01.000Z');
    const progressed = [ev('b', '2026-01-01T00:00:01.000Z'), ev('c', '2026-01-01T00:00:00.500Z')];
    expect(olderCursor([first, progressed], 2)).toBe('2026-01-01T00:00:00.501Z');
  });
});

describe('flattenPages', () => {
  it('keeps order and drops repeats across pages', () => {
    const out = flattenPages([[ev('a', '2026-01-01T00:00:02.000Z'), ev('b', '2026-01-01T00:00:01.000Z')], [ev('b', '2026-01-01T00:00:01.000Z'), ev('c', '2026-01-01T00:00:00.000Z')]]);
    expect(out.map((e) => e.id)).toEqual(['a', 'b', 'c']);
  });
});

describe('labels and links', () => {
  it('labels kinds and keeps links inside the app', () => {
    expect(activityKindLabel('fork_offered')).toBe('Offered back');
    expect(activityKindLabel('something_new')).toBe('something_new');
    expect(appPath('/designs/a?review=b')).toBe('/designs/a?review=b');
    expect(appPath('//evil.test/x')).toBeNull();
    expect(appPath('/\\evil.test')).toBeNull();
    expect(appPath('https://evil.test/')).toBeNull();
  });
});
