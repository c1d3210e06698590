/**
 * The activity feed and the mail switches against the real database: a team's events newest
 * first with `forYou` on the ones addressed to the caller, nothing for outsiders, private
 * designs' events only for their author, an invitation only for the person invited (and no mail
 * when they turned invitation mail off), paging with `before`/`limit`, and GET/PUT of the
 * notification settings.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as reviews from '@/app/api/designs/[designId]/reviews/route';
import * as comments from '@/app/api/designs/[designId]/comments/route';
import * as comment from '@/app/api/comments/[commentId]/route';
import * as invitations from '@/app/api/teams/[teamId]/invitations/route';
import * as activity from '@/app/api/activity/route';
import * as notifications from '@/app/api/me/notifications/route';
import type { ActivityDto, CommentDto, DesignDetailDto, InvitationDto, NotificationSettingsDto } from '@/lib/api/contract';
import { flushMail } from '@/lib/data/activity';
import { db } from '@/lib/db';
import { call, freshEmail, mailFor, makeUser, sampleDocument, setupFixtures, teardown, type Fixtures, type FixtureUser } from './helpers';

/** Set to make the next sendMail call fail as an unreachable SMTP server would. */
const mailFailure = vi.hoisted(() => ({ next: false }));
vi.mock('@/lib/mail', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/lib/mail')>();
  return {
    ...real,
    sendMail: async (...args: Parameters<typeof real.sendMail>) => {
      if (mailFailure.next) {
        mailFailure.next = false;
        throw new Error('connect ECONNREFUSED 127.0.0.1:2525');
      }
      return real.sendMail(...args);
    },
  };
});

let f: Fixtures;

beforeAll(async () => {
  f = await setupFixtures();
});
beforeEach(() => {
  mailFailure.next = false;
});
afterAll(teardown);

type ErrorBody = { error?: { code: string; message: string; field?: string } };
type FeedAnswer = { events: ActivityDto[] } & ErrorBody;

function feed(as: FixtureUser | null, query: Record<string, string> = {}) {
  return call<FeedAnswer>(activity.GET, '/api/activity', { as, query });
}

async function events(as: FixtureUser, query: Record<string, string> = {}): Promise<ActivityDto[]> {
  const res = await feed(as, query);
  expect(res.status).toBe(200);
  return res.body.events;
}

async function create(title: string, o: { as?: FixtureUser; visibility?: 'team' | 'private' } = {}): Promise<DesignDetailDto> {
  const res = await call<{ design: DesignDetailDto }>(teamDesigns.POST, `/api/teams/${f.teamId}/designs`, {
    method: 'POST',
    params: { teamId: f.teamId },
    as: o.as ?? f.users.designer,
    body: { title, visibility: o.visibility, document: sampleDocument(), message: 'start' },
  });
  expect(res.status).toBe(201);
  return res.body.design;
}

async function say(designId: string, as: FixtureUser, body: string): Promise<CommentDto> {
  const res = await call<{ comment: CommentDto }>(comments.POST, `/api/designs/${designId}/comments`, { method: 'POST', params: { designId }, as, body: { revision: 1, body, anchor: { kind: 'design' } } });
  expect(res.status).toBe(201);
  return res.body.comment;
}

function invite(email: string, role = 'designer') {
  return call<{ invitation: InvitationDto } & ErrorBody>(invitations.POST, `/api/teams/${f.teamId}/invitations`, { method: 'POST', params: { teamId: f.teamId }, as: f.users.owner, body: { email, role } });
}

const ALL_ON: NotificationSettingsDto = { review_requested: true, review_decided: true, mention: true, fork_offered: true, invitation: true };

function putSettings(as: FixtureUser | null, body: unknown) {
  return call<{ settings: NotificationSettingsDto } & ErrorBody>(notifications.PUT, '/api/me/notifications', { method: 'PUT', as, body });
}

describe('the feed', () => {
  it('shows the team’s events newest first, forYou on those addressed to the caller, none to an outsider', async () => {
    const d = await create('Fed ladder');
    const asked = await call(reviews.POST, `/api/designs/${d.id}/reviews`, { method: 'POST', params: { designId: d.id }, as: f.users.designer, body: { revision: 1, reviewerIds: [f.users.reviewer.id] } });
    expect(asked.status).toBe(201);
    const c = await say(d.id, f.users.reviewer, 'the load line is fine');
    const resolved = await call(comment.PATCH, `/api/comments/${c.id}`, { method: 'PATCH', params: { commentId: c.id }, as: f.users.owner, body: { resolved: true } });
    expect(resolved.status).toBe(200);

    const kinds = ['comment_resolved', 'comment', 'review_requested'];
    const forYou: Record<'owner' | 'designer' | 'reviewer' | 'viewer', boolean[]> = {
      owner: [false, false, false],
      designer: [false, true, false],
      reviewer: [true, false, true],
      viewer: [false, false, false],
    };
    for (const who of ['owner', 'designer', 'reviewer', 'viewer'] as const) {
      const mine = (await events(f.users[who])).filter((e) => e.design?.id === d.id);
      expect({ who, kinds: mine.map((e) => e.kind), forYou: mine.map((e) => e.forYou) }).toEqual({ who, kinds, forYou: forYou[who] });
      for (let i = 1; i < mine.length; i++) expect(Date.parse(mine[i - 1].createdAt)).toBeGreaterThanOrEqual(Date.parse(mine[i].createdAt));
      expect(mine.every((e) => e.teamId === f.teamId && e.design?.title === 'Fed ladder')).toBe(true);
    }
    const [res, com, req] = (await events(f.users.viewer)).filter((e) => e.design?.id === d.id);
    expect(res).toMatchObject({ actor: { id: f.users.owner.id, name: 'Owner' }, path: `/designs/${d.id}?revision=1&comment=${c.id}`, summary: expect.stringContaining('Owner resolved a comment on "Fed ladder"') });
    expect(com).toMatchObject({ actor: { id: f.users.reviewer.id }, path: `/designs/${d.id}?revision=1&comment=${c.id}` });
    expect(req.path).toMatch(new RegExp(`^/designs/${d.id}\\?revision=1&review=`));
    // the outsider belongs to another team, where nothing happened
    expect(await events(f.users.outsider)).toEqual([]);
  });

  it('?teamId narrows to one team the caller belongs to; another team is 404; a bad query is 422; signed out is 401', async () => {
    const d = await create('Filtered ladder');
    await say(d.id, f.users.owner, 'filter me');
    const narrowed = await events(f.users.owner, { teamId: f.teamId });
    expect(narrowed.length).toBeGreaterThan(0);
    expect(narrowed.every((e) => e.teamId === f.teamId)).toBe(true);
    expect(narrowed.some((e) => e.design?.id === d.id)).toBe(true);
    const other = await feed(f.users.owner, { teamId: f.otherTeamId });
    expect({ status: other.status, code: other.body.error?.code }).toEqual({ status: 404, code: 'not_found' });
    expect((await feed(f.users.outsider, { teamId: f.teamId })).status).toBe(404);
    for (const [query, field] of [
      [{ teamId: 'nope' }, 'teamId'],
      [{ limit: '0' }, 'limit'],
      [{ limit: '101' }, 'limit'],
      [{ before: 'yesterday' }, 'before'],
    ] as const) {
      const res = await feed(f.users.owner, query);
      expect({ query, status: res.status, field: res.body.error?.field }).toEqual({ query, status: 422, field });
    }
    expect((await feed(null)).status).toBe(401);
  });

  it('hides a private design’s events from everyone but its author', async () => {
    const priv = await create('Private fed ladder', { as: f.users.designer, visibility: 'private' });
    await say(priv.id, f.users.designer, 'thinking aloud');
    expect((await events(f.users.designer)).filter((e) => e.design?.id === priv.id).map((e) => e.kind)).toEqual(['comment']);
    for (const who of ['owner', 'reviewer', 'viewer', 'outsider'] as const) {
      expect((await events(f.users[who])).filter((e) => e.design?.id === priv.id), who).toEqual([]);
    }
  });

  it('pages with before and limit, newest first, without gaps or repeats', async () => {
    const d = await create('Paged ladder');
    for (let i = 1; i <= 5; i++) {
      await say(d.id, f.users.reviewer, `point ${i}`);
      await new Promise((r) => setTimeout(r, 5));
    }
    const all = (await events(f.users.viewer, { teamId: f.teamId })).filter((e) => e.design?.id === d.id);
    expect(all.map((e) => e.summary.includes('Reviewer commented'))).toEqual([true, true, true, true, true]);
    const first = await events(f.users.viewer, { limit: '2' });
    expect(first).toHaveLength(2);
    expect(first.map((e) => e.id)).toEqual(all.slice(0, 2).map((e) => e.id));
    const second = await events(f.users.viewer, { limit: '2', before: first[1].createdAt });
    expect(second.map((e) => e.id)).toEqual(all.slice(2, 4).map((e) => e.id));
    const rest = await events(f.users.viewer, { before: second[1].createdAt });
    expect(rest[0].id).toBe(all[4].id);
    expect(rest.every((e) => Date.parse(e.createdAt) < Date.parse(second[1].createdAt))).toBe(true);
  });
});

describe('invitations in the feed', () => {
  it('an invited existing user sees the invitation with its link; the team does not; invitation mail can be turned off', async () => {
    const invitee = await makeUser('Invitee', freshEmail('invitee'));
    const created = await invite(invitee.email, 'reviewer');
    expect(created.status).toBe(201);
    await flushMail();
    const mail = (await mailFor(invitee.email))[0];
    const token = mail?.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)?.[1];
    expect(token).toBeDefined();
    const theirs = await events(invitee);
    expect(theirs).toHaveLength(1);
    expect(theirs[0]).toMatchObject({ kind: 'invitation', forYou: true, teamId: f.teamId, design: null, path: `/invitations/${token}`, actor: { id: f.users.owner.id } });
    expect(theirs[0].summary).toContain('Fixture Team');
    for (const who of ['owner', 'designer', 'reviewer', 'viewer', 'outsider'] as const) {
      expect((await events(f.users[who])).filter((e) => e.kind === 'invitation'), who).toEqual([]);
    }
    // a new invitation replaces the old one, and its event too (the old link no longer works)
    const again = await invite(invitee.email, 'viewer');
    expect(again.status).toBe(201);
    await flushMail();
    const token2 = (await mailFor(invitee.email))[0]?.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)?.[1];
    expect(token2).not.toBe(token);
    expect((await events(invitee)).map((e) => e.path)).toEqual([`/invitations/${token2}`]);

    // muted: the invitation and its event are made, but no mail goes out
    const quiet = await makeUser('Quiet Invitee', freshEmail('quietinvitee'));
    expect((await putSettings(quiet, { ...ALL_ON, invitation: false })).status).toBe(200);
    const muted = await invite(quiet.email);
    expect(muted.status).toBe(201);
    await flushMail();
    expect(await mailFor(quiet.email)).toEqual([]);
    expect(await db().models.Invitation.count({ where: { email: quiet.email } })).toBe(1);
    expect((await events(quiet)).map((e) => [e.kind, e.forYou])).toEqual([['invitation', true]]);
  });

  it('an address with no account gets the mail and there is nobody to show an event to', async () => {
    const email = freshEmail('stranger');
    const before = await db().models.ActivityEvent.count({ where: { kind: 'invitation' } });
    expect((await invite(email)).status).toBe(201);
    await flushMail();
    expect(await mailFor(email)).toHaveLength(1);
    expect(await db().models.ActivityEvent.count({ where: { kind: 'invitation' } })).toBe(before);
  });

  it('when the mail cannot be sent, the invitation and its event are taken back', async () => {
    const invitee = await makeUser('Unlucky', freshEmail('unlucky'));
    mailFailure.next = true;
    const res = await invite(invitee.email);
    expect(res.status).toBe(500);
    expect(await db().models.Invitation.count({ where: { email: invitee.email } })).toBe(0);
    expect(await events(invitee)).toEqual([]);
    // the next try goes through
    expect((await invite(invitee.email)).status).toBe(201);
    expect((await events(invitee)).map((e) => e.kind)).toEqual(['invitation']);
  });
});

describe('notification settings', () => {
  it('every kind is on at first; PUT replaces them and GET reads them back', async () => {
    const u = await makeUser('Switcher', freshEmail('switcher'));
    const get = () => call<{ settings: NotificationSettingsDto } & ErrorBody>(notifications.GET, '/api/me/notifications', { as: u });
    expect((await get()).body.settings).toEqual(ALL_ON);
    const some = { ...ALL_ON, mention: false, fork_offered: false };
    const put = await putSettings(u, some);
    expect(put.status).toBe(200);
    expect(put.body.settings).toEqual(some);
    expect((await get()).body.settings).toEqual(some);
    expect((await db().models.NotificationSetting.findByPk(u.id))?.muted.sort()).toEqual(['fork_offered', 'mention']);
    // another user's switches are their own
    expect((await call<{ settings: NotificationSettingsDto }>(notifications.GET, '/api/me/notifications', { as: f.users.viewer })).body.settings).toEqual(ALL_ON);
    expect((await putSettings(u, ALL_ON)).body.settings).toEqual(ALL_ON);
    expect((await get()).body.settings).toEqual(ALL_ON);
  });

  it('a body missing a kind or with a non-boolean is 422 and changes nothing; signed out is 401', async () => {
    const u = await makeUser('Careful', freshEmail('careful'));
    const { invitation: _dropped, ...missing } = ALL_ON;
    for (const [body, field] of [
      [missing, 'invitation'],
      [{ ...ALL_ON, mention: 'off' }, 'mention'],
    ] as const) {
      const res = await putSettings(u, body);
      expect({ status: res.status, field: res.body.error?.field }).toEqual({ status: 422, field });
    }
    expect(await db().models.NotificationSetting.findByPk(u.id)).toBeNull();
    expect((await call(notifications.GET, '/api/me/notifications', { as: null })).status).toBe(401);
    expect((await putSettings(null, ALL_ON)).status).toBe(401);
  });
});
