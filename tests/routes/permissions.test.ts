/**
 * Every route × every caller (owner, designer, reviewer, viewer, outsider, signed out) against
 * the real database. Each case prepares its own fresh target so that a mutation in one row
 * cannot change the answer of another.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as me from '@/app/api/me/route';
import * as teams from '@/app/api/teams/route';
import * as team from '@/app/api/teams/[teamId]/route';
import * as members from '@/app/api/teams/[teamId]/members/route';
import * as member from '@/app/api/teams/[teamId]/members/[userId]/route';
import * as invitations from '@/app/api/teams/[teamId]/invitations/route';
import * as invitation from '@/app/api/teams/[teamId]/invitations/[invitationId]/route';
import * as preview from '@/app/api/invitations/[token]/route';
import * as accept from '@/app/api/invitations/[token]/accept/route';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as revision from '@/app/api/designs/[designId]/revisions/[number]/route';
import * as fork from '@/app/api/designs/[designId]/fork/route';
import * as signup from '@/app/api/account/signup/route';
import * as password from '@/app/api/account/password/route';
import * as health from '@/app/api/health/route';
import * as reviews from '@/app/api/designs/[designId]/reviews/route';
import * as review from '@/app/api/designs/[designId]/reviews/[reviewId]/route';
import * as decision from '@/app/api/designs/[designId]/reviews/[reviewId]/decision/route';
import * as activity from '@/app/api/activity/route';
import * as notifications from '@/app/api/me/notifications/route';
import * as designComments from '@/app/api/designs/[designId]/comments/route';
import * as comment from '@/app/api/comments/[commentId]/route';
import { createComment } from '@/lib/data/comments';
import * as offers from '@/app/api/designs/[designId]/offers/route';
import * as offer from '@/app/api/offers/[offerId]/route';
import * as offerDecision from '@/app/api/offers/[offerId]/decision/route';
import { requestReview } from '@/lib/data/reviews';
import { createOffer } from '@/lib/data/offers';
import { forkDesign } from '@/lib/data/designs';
import { hashInvitationToken } from '@/lib/data/invitations';
import { db } from '@/lib/db';
import { addMember, call, freshEmail, makeUser, PASSWORD, sampleDocument, setupFixtures, teardown, type AnyHandler, type Fixtures, type Who } from './helpers';

import { ALL_OK, CALLERS, MEMBERS_READ, OWNER_ONLY, WRITERS, newDesignFor, type Case } from './permissions/shared';
import { partsCases } from './permissions/parts';
import { exportsCases } from './permissions/exports';
import { benchCases } from './permissions/bench';
import { analysesCases } from './permissions/analyses';
import { hardeningCases } from './permissions/hardening';

let f: Fixtures;

function newDesign(author: Who = 'designer', visibility: 'team' | 'private' = 'team'): Promise<string> {
  return newDesignFor(f, author, visibility);
}

/** A designer's design with an open review request naming the reviewer. */
async function newOpenReview(): Promise<{ designId: string; reviewId: string }> {
  const designId = await newDesign('designer');
  const { review: r } = await requestReview(f.users.designer.id, designId, { revision: 1, reviewerIds: [f.users.reviewer.id] });
  return { designId, reviewId: r.id };
}

/** An owner's design, the designer's fork of it, and the designer's open offer back. */
async function newOffer(): Promise<{ parentId: string; forkId: string; offerId: string }> {
  const parentId = await newDesign('owner');
  const forkId = (await forkDesign(f.users.designer.id, parentId, {})).id;
  const { offer: o } = await createOffer(f.users.designer.id, forkId, {});
  return { parentId, forkId, offerId: o.id };
}

async function newInvitation(): Promise<{ id: string; token: string }> {
  const token = `tok${Math.random().toString(36).slice(2)}${Date.now().toString(36)}xxxxxxxxxxxx`;
  const i = await db().models.Invitation.create({
    teamId: f.teamId,
    email: freshEmail('invitee'),
    role: 'viewer',
    tokenHash: hashInvitationToken(token),
    invitedById: f.users.owner.id,
    expiresAt: new Date(Date.now() + 86_400_000),
    acceptedAt: null,
    acceptedById: null,
  });
  return { id: i.id, token };
}

async function newMember(): Promise<string> {
  const u = await makeUser('Extra');
  await addMember(f.teamId, u.id, 'viewer');
  return u.id;
}

const coreCases: Case[] = [
  { name: 'GET /api/health', handler: health.GET as AnyHandler, method: 'GET', expect: [200, 200, 200, 200, 200, 200], prepare: async () => ({ path: '/api/health', params: {} }) },
  { name: 'GET /api/me', handler: me.GET, method: 'GET', expect: ALL_OK(200), prepare: async () => ({ path: '/api/me', params: {} }) },
  { name: 'GET /api/teams', handler: teams.GET, method: 'GET', expect: ALL_OK(200), prepare: async () => ({ path: '/api/teams', params: {} }) },
  { name: 'POST /api/teams', handler: teams.POST, method: 'POST', expect: ALL_OK(201), prepare: async () => ({ path: '/api/teams', params: {}, body: { name: 'Another bench' } }) },
  { name: 'GET /api/teams/:teamId', handler: team.GET, method: 'GET', expect: MEMBERS_READ, prepare: async () => ({ path: `/api/teams/${f.teamId}`, params: { teamId: f.teamId } }) },
  { name: 'GET members', handler: members.GET, method: 'GET', expect: MEMBERS_READ, prepare: async () => ({ path: `/api/teams/${f.teamId}/members`, params: { teamId: f.teamId } }) },
  {
    name: 'PATCH member role',
    handler: member.PATCH,
    method: 'PATCH',
    expect: OWNER_ONLY(200),
    prepare: async () => {
      const userId = await newMember();
      return { path: `/api/teams/${f.teamId}/members/${userId}`, params: { teamId: f.teamId, userId }, body: { role: 'reviewer' } };
    },
  },
  {
    name: 'DELETE member',
    handler: member.DELETE,
    method: 'DELETE',
    expect: OWNER_ONLY(200),
    prepare: async () => {
      const userId = await newMember();
      return { path: `/api/teams/${f.teamId}/members/${userId}`, params: { teamId: f.teamId, userId } };
    },
  },
  { name: 'GET invitations', handler: invitations.GET, method: 'GET', expect: OWNER_ONLY(200), prepare: async () => ({ path: `/api/teams/${f.teamId}/invitations`, params: { teamId: f.teamId } }) },
  {
    name: 'POST invitation',
    handler: invitations.POST,
    method: 'POST',
    expect: OWNER_ONLY(201),
    prepare: async () => ({ path: `/api/teams/${f.teamId}/invitations`, params: { teamId: f.teamId }, body: { email: freshEmail('invited'), role: 'viewer' } }),
  },
  {
    name: 'DELETE invitation',
    handler: invitation.DELETE,
    method: 'DELETE',
    expect: OWNER_ONLY(200),
    prepare: async () => {
      const { id } = await newInvitation();
      return { path: `/api/teams/${f.teamId}/invitations/${id}`, params: { teamId: f.teamId, invitationId: id } };
    },
  },
  {
    name: 'GET invitation preview (public: the token is the secret)',
    handler: preview.GET,
    method: 'GET',
    expect: [200, 200, 200, 200, 200, 200],
    prepare: async () => {
      const { token } = await newInvitation();
      return { path: `/api/invitations/${token}`, params: { token } };
    },
  },
  {
    name: 'POST accept of an invitation for someone else',
    handler: accept.POST,
    method: 'POST',
    expect: [403, 403, 403, 403, 403, 401],
    prepare: async () => {
      const { token } = await newInvitation();
      return { path: `/api/invitations/${token}/accept`, params: { token } };
    },
  },
  { name: 'GET team designs', handler: teamDesigns.GET, method: 'GET', expect: MEMBERS_READ, prepare: async () => ({ path: `/api/teams/${f.teamId}/designs`, params: { teamId: f.teamId } }) },
  {
    name: 'POST team design',
    handler: teamDesigns.POST,
    method: 'POST',
    expect: WRITERS(201),
    prepare: async () => ({ path: `/api/teams/${f.teamId}/designs`, params: { teamId: f.teamId }, body: { title: 'New ladder', document: sampleDocument() } }),
  },
  {
    name: 'GET design',
    handler: design.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async () => {
      const designId = await newDesign();
      return { path: `/api/designs/${designId}`, params: { designId } };
    },
  },
  {
    name: "GET someone else's private design",
    handler: design.GET,
    method: 'GET',
    expect: [404, 200, 404, 404, 404, 401],
    prepare: async () => {
      const designId = await newDesign('designer', 'private');
      return { path: `/api/designs/${designId}`, params: { designId } };
    },
  },
  {
    name: 'PATCH design title',
    handler: design.PATCH,
    method: 'PATCH',
    expect: WRITERS(200),
    prepare: async () => {
      const designId = await newDesign();
      return { path: `/api/designs/${designId}`, params: { designId }, body: { title: 'Renamed' } };
    },
  },
  {
    name: "PATCH visibility of the designer's own design (only its author)",
    handler: design.PATCH,
    method: 'PATCH',
    expect: [403, 200, 403, 403, 404, 401],
    prepare: async () => {
      const designId = await newDesign('designer');
      return { path: `/api/designs/${designId}`, params: { designId }, body: { visibility: 'private' } };
    },
  },
  {
    name: "PATCH archive of the owner's design (designer may not)",
    handler: design.PATCH,
    method: 'PATCH',
    expect: [200, 403, 403, 403, 404, 401],
    prepare: async () => {
      const designId = await newDesign('owner');
      return { path: `/api/designs/${designId}`, params: { designId }, body: { archived: true } };
    },
  },
  {
    name: 'GET revisions',
    handler: revisions.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async () => {
      const designId = await newDesign();
      return { path: `/api/designs/${designId}/revisions`, params: { designId } };
    },
  },
  {
    name: 'POST revision',
    handler: revisions.POST,
    method: 'POST',
    expect: WRITERS(201),
    prepare: async () => {
      const designId = await newDesign();
      return { path: `/api/designs/${designId}/revisions`, params: { designId }, body: { baseRevision: 1, document: sampleDocument(22e-9), message: 'bigger caps' } };
    },
  },
  {
    name: 'GET revision 1',
    handler: revision.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async () => {
      const designId = await newDesign();
      return { path: `/api/designs/${designId}/revisions/1`, params: { designId, number: '1' } };
    },
  },
  {
    name: 'POST fork',
    handler: fork.POST,
    method: 'POST',
    expect: WRITERS(201),
    prepare: async () => {
      const designId = await newDesign();
      return { path: `/api/designs/${designId}/fork`, params: { designId }, body: {} };
    },
  },
  {
    name: 'GET reviews',
    handler: reviews.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async () => {
      const { designId } = await newOpenReview();
      return { path: `/api/designs/${designId}/reviews`, params: { designId } };
    },
  },
  {
    name: 'POST review request',
    handler: reviews.POST,
    method: 'POST',
    expect: WRITERS(201),
    prepare: async () => {
      const designId = await newDesign('designer');
      return { path: `/api/designs/${designId}/reviews`, params: { designId }, body: { revision: 1, reviewerIds: [f.users.reviewer.id] } };
    },
  },
  {
    name: "DELETE (withdraw) a designer's review request (requester/author or an owner)",
    handler: review.DELETE,
    method: 'DELETE',
    expect: [200, 200, 403, 403, 404, 401],
    prepare: async () => {
      const { designId, reviewId } = await newOpenReview();
      return { path: `/api/designs/${designId}/reviews/${reviewId}`, params: { designId, reviewId } };
    },
  },
  {
    name: "POST approve a designer's design (reviewers and owners, not the author)",
    handler: decision.POST,
    method: 'POST',
    expect: [200, 403, 200, 403, 404, 401],
    prepare: async () => {
      const { designId, reviewId } = await newOpenReview();
      return { path: `/api/designs/${designId}/reviews/${reviewId}/decision`, params: { designId, reviewId }, body: { decision: 'approve' } };
    },
  },
  {
    name: "POST offer back of the designer's fork (its author only)",
    handler: offers.POST,
    method: 'POST',
    expect: [403, 201, 403, 403, 404, 401],
    prepare: async () => {
      const designId = (await forkDesign(f.users.designer.id, await newDesign('owner'), {})).id;
      return { path: `/api/designs/${designId}/offers`, params: { designId }, body: { message: 'bigger capacitors' } };
    },
  },
  {
    name: 'GET offers',
    handler: offers.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async () => {
      const { parentId } = await newOffer();
      return { path: `/api/designs/${parentId}/offers`, params: { designId: parentId } };
    },
  },
  {
    name: "POST accept an offer to the owner's design (its author or an owner)",
    handler: offerDecision.POST,
    method: 'POST',
    expect: [200, 403, 403, 403, 404, 401],
    prepare: async () => {
      const { offerId } = await newOffer();
      return { path: `/api/offers/${offerId}/decision`, params: { offerId }, body: { decision: 'accept', parentBaseRevision: 1 } };
    },
  },
  {
    name: 'DELETE (withdraw) an offer (the offerer only)',
    handler: offer.DELETE,
    method: 'DELETE',
    expect: [403, 200, 403, 403, 404, 401],
    prepare: async () => {
      const { offerId } = await newOffer();
      return { path: `/api/offers/${offerId}`, params: { offerId } };
    },
  },
  { name: 'GET activity', handler: activity.GET, method: 'GET', expect: ALL_OK(200), prepare: async () => ({ path: '/api/activity', params: {} }) },
  {
    name: "GET activity of a team (members only)",
    handler: activity.GET,
    method: 'GET',
    expect: [200, 200, 200, 200, 404, 401],
    prepare: async () => ({ path: `/api/activity?teamId=${f.teamId}`, params: {} }),
  },
  {
    name: 'GET comments of a design (readers)',
    handler: designComments.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async () => {
      const designId = await newDesign('designer');
      return { path: `/api/designs/${designId}/comments`, params: { designId } };
    },
  },
  {
    name: 'POST comment (owners, designers, reviewers)',
    handler: designComments.POST,
    method: 'POST',
    expect: [201, 201, 201, 403, 404, 401],
    prepare: async () => {
      const designId = await newDesign('designer');
      return { path: `/api/designs/${designId}/comments`, params: { designId }, body: { revision: 1, body: 'check C2', anchor: { kind: 'part', blockId: 's2', part: 'pumpC' } } };
    },
  },
  {
    name: 'PATCH comment resolved (owners, designers, reviewers)',
    handler: comment.PATCH,
    method: 'PATCH',
    expect: [200, 200, 200, 403, 404, 401],
    prepare: async () => {
      const designId = await newDesign('designer');
      const c = await createComment(f.users.reviewer.id, designId, { revision: 1, body: 'open point', anchor: { kind: 'design' } });
      return { path: `/api/comments/${c.id}`, params: { commentId: c.id }, body: { resolved: true } };
    },
  },
  { name: 'GET notification settings', handler: notifications.GET, method: 'GET', expect: ALL_OK(200), prepare: async () => ({ path: '/api/me/notifications', params: {} }) },
  {
    name: 'PUT notification settings',
    handler: notifications.PUT,
    method: 'PUT',
    expect: ALL_OK(200),
    prepare: async () => ({ path: '/api/me/notifications', params: {}, body: { review_requested: true, review_decided: true, mention: false, fork_offered: true, invitation: true } }),
  },
  {
    name: 'POST signup (public)',
    handler: signup.POST,
    method: 'POST',
    expect: [201, 201, 201, 201, 201, 201],
    prepare: async () => ({ path: '/api/account/signup', params: {}, body: { email: freshEmail('signup'), name: 'Newcomer', password: 'long-enough-password' } }),
  },
  {
    name: 'POST password change',
    handler: password.POST,
    method: 'POST',
    expect: ALL_OK(200),
    prepare: async () => ({ path: '/api/account/password', params: {}, body: { currentPassword: PASSWORD, newPassword: PASSWORD } }),
  },
];

const cases: Case[] = [...coreCases, ...partsCases, ...exportsCases, ...benchCases, ...analysesCases, ...hardeningCases];

beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

describe('every route × every role', () => {
  const rows = cases.flatMap((c) => CALLERS.map((who, i) => ({ c, who, expected: c.expect[i] })));
  it.each(rows.map((r) => [r.c.name, r.who, r.expected, r] as const))('%s as %s → %i', async (_n, who, expected, r) => {
    const p = await r.c.prepare(f);
    const res = await call(r.c.handler, p.path, { method: r.c.method, params: p.params, body: p.body, contentType: p.contentType, as: who === 'signedOut' ? null : f.users[who] });
    if (res.status !== expected) throw new Error(`expected ${expected}, got ${res.status}: ${JSON.stringify(res.body)}`);
    if (expected >= 400) {
      const err = (res.body as { error?: { code?: string; message?: string } }).error;
      expect(err?.code).toBeTypeOf('string');
      expect(err?.message).toBeTypeOf('string');
    }
  });

  it('covers every exported handler under app/api', async () => {
    const root = path.resolve(import.meta.dirname, '../../app/api');
    const files = fs.readdirSync(root, { recursive: true, encoding: 'utf8' }).filter((p) => p.endsWith('route.ts') && !p.includes('[...nextauth]'));
    const tested = new Set<unknown>(cases.map((c) => c.handler));
    const missing: string[] = [];
    for (const file of files) {
      const mod = (await import(path.join(root, file))) as Record<string, unknown>;
      for (const method of ['GET', 'POST', 'PATCH', 'PUT', 'DELETE']) {
        if (typeof mod[method] === 'function' && !tested.has(mod[method])) missing.push(`${method} ${file}`);
      }
    }
    expect(files.length).toBeGreaterThanOrEqual(17);
    expect(missing).toEqual([]);
  });
});
