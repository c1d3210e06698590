/**
 * Lineage and offers back against the real database: every action × role, the compare link in
 * the offer mail, a stale accept that writes nothing, an accept that makes the fork's document
 * the parent's next revision authored by the offerer, decline, withdraw, one open offer per
 * fork, and the 'forked' feed event.
 */
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as revision from '@/app/api/designs/[designId]/revisions/[number]/route';
import * as forkRoute from '@/app/api/designs/[designId]/fork/route';
import * as reviews from '@/app/api/designs/[designId]/reviews/route';
import * as reviewDecision from '@/app/api/designs/[designId]/reviews/[reviewId]/decision/route';
import * as offers from '@/app/api/designs/[designId]/offers/route';
import * as offer from '@/app/api/offers/[offerId]/route';
import * as decision from '@/app/api/offers/[offerId]/decision/route';
import type { DesignDetailDto, OfferDto, ReviewDto, RevisionDto, RevisionSummaryDto } from '@/lib/api/contract';
import { flushMail } from '@/lib/data/activity';
import { db } from '@/lib/db';
import { addMember, call, mailFor, makeUser, sampleDocument, setupFixtures, teardown, WHO, type Fixtures, type FixtureUser, type Who } from './helpers';

let f: Fixtures;

beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

type ErrorBody = { error?: { code: string; message: string; field?: string; latestRevision?: number } };
type OfferAnswer = { offer: OfferDto } & ErrorBody;
type DecisionAnswer = { offer: OfferDto; revision: RevisionSummaryDto | null } & ErrorBody;

async function create(title: string, as: FixtureUser, capacitanceF = 10e-9, teamId = f.teamId): Promise<DesignDetailDto> {
  const res = await call<{ design: DesignDetailDto }>(teamDesigns.POST, `/api/teams/${teamId}/designs`, {
    method: 'POST',
    params: { teamId },
    as,
    body: { title, document: sampleDocument(capacitanceF), message: 'start' },
  });
  expect(res.status).toBe(201);
  return res.body.design;
}

async function fork(parentId: string, as: FixtureUser, body: Record<string, unknown> = {}): Promise<DesignDetailDto> {
  const res = await call<{ design: DesignDetailDto }>(forkRoute.POST, `/api/designs/${parentId}/fork`, { method: 'POST', params: { designId: parentId }, as, body });
  expect(res.status).toBe(201);
  return res.body.design;
}

async function save(designId: string, baseRevision: number, capacitanceF: number, as: FixtureUser) {
  const res = await call<{ revision: RevisionSummaryDto }>(revisions.POST, `/api/designs/${designId}/revisions`, {
    method: 'POST',
    params: { designId },
    as,
    body: { baseRevision, document: sampleDocument(capacitanceF), message: `C = ${capacitanceF}` },
  });
  expect(res.status).toBe(201);
  return res.body.revision;
}

function offerBack(forkId: string, as: FixtureUser, body: Record<string, unknown> = {}) {
  return call<OfferAnswer>(offers.POST, `/api/designs/${forkId}/offers`, { method: 'POST', params: { designId: forkId }, as, body });
}

function list(designId: string, as: FixtureUser) {
  return call<{ incoming: OfferDto[]; outgoing: OfferDto[] } & ErrorBody>(offers.GET, `/api/designs/${designId}/offers`, { params: { designId }, as });
}

function decide(offerId: string, as: FixtureUser, body: Record<string, unknown>) {
  return call<DecisionAnswer>(decision.POST, `/api/offers/${offerId}/decision`, { method: 'POST', params: { offerId }, as, body });
}

function withdraw(offerId: string, as: FixtureUser) {
  return call<OfferAnswer>(offer.DELETE, `/api/offers/${offerId}`, { method: 'DELETE', params: { offerId }, as });
}

function patch(designId: string, as: FixtureUser, body: Record<string, unknown>) {
  return call<{ design: DesignDetailDto }>(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as, body });
}

async function detail(designId: string, as: FixtureUser = f.users.viewer): Promise<DesignDetailDto> {
  const res = await call<{ design: DesignDetailDto }>(design.GET, `/api/designs/${designId}`, { params: { designId }, as });
  expect(res.status).toBe(200);
  return res.body.design;
}

async function getRev(designId: string, n: number): Promise<RevisionDto> {
  const res = await call<{ revision: RevisionDto }>(revision.GET, `/api/designs/${designId}/revisions/${n}`, { params: { designId, number: String(n) }, as: f.users.owner });
  expect(res.status).toBe(200);
  return res.body.revision;
}

async function parentState(designId: string) {
  const d = await db().models.Design.findByPk(designId, { raw: true });
  const revs = await db().models.DesignRevision.findAll({ where: { designId }, order: [['number', 'ASC']], raw: true });
  return { d, revs };
}

/** An owner-authored parent and a designer's fork of it, saved once (r2), offered back. */
async function offered(title: string): Promise<{ parentId: string; forkId: string; offer: OfferDto }> {
  const parent = await create(title, f.users.owner);
  const child = await fork(parent.id, f.users.designer, { title: `${title} (bench copy)` });
  await save(child.id, 1, 22e-9, f.users.designer);
  const res = await offerBack(child.id, f.users.designer, { message: 'tighter ripple' });
  expect(res.status).toBe(201);
  return { parentId: parent.id, forkId: child.id, offer: res.body.offer };
}

function comparePath(parentId: string, a: number, b: number, forkId: string, offerId: string): string {
  return `/designs/${parentId}/compare?a=${a}&b=${b}&bDesign=${forkId}&offer=${offerId}`;
}

describe('lineage', () => {
  it('a fork names its parent and the parent lists the fork; the parent\u2019s author gets a "forked" feed event and no mail', async () => {
    const parent = await create('Lineage ladder', f.users.owner);
    const child = await fork(parent.id, f.users.designer, { title: 'Lineage offshoot' });
    expect(child.forkedFrom).toEqual({ designId: parent.id, title: 'Lineage ladder', revision: 1 });
    expect((await detail(parent.id)).forks.map((x) => x.designId)).toEqual([child.id]);

    const { ActivityEvent, ActivityRecipient } = db().models;
    const events = await ActivityEvent.findAll({ where: { kind: 'forked', designId: child.id } });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ teamId: f.teamId, actorId: f.users.designer.id, path: `/designs/${child.id}` });
    expect(events[0].summary).toBe('Designer forked "Lineage ladder" r1 as "Lineage offshoot"');
    const to = await ActivityRecipient.findAll({ where: { eventId: events[0].id } });
    expect(to.map((r) => r.userId)).toEqual([f.users.owner.id]);
    await flushMail();
    expect((await mailFor(f.users.owner.email)).filter((m) => m.text.includes('Lineage'))).toEqual([]);

    // forking one's own design addresses nobody; the event is still in the feed
    const own = await fork(parent.id, f.users.owner, { title: 'Own offshoot' });
    const ownEvent = await ActivityEvent.findOne({ where: { kind: 'forked', designId: own.id } });
    expect(ownEvent).not.toBeNull();
    expect(await ActivityRecipient.count({ where: { eventId: ownEvent!.id } })).toBe(0);
  });

  it('a fork into a team the parent\u2019s author is not in is not addressed to them', async () => {
    const parent = await create('Emigrant ladder', f.users.owner);
    const bench = await db().models.Team.create({ name: 'Far bench' });
    await addMember(bench.id, f.users.designer.id, 'designer');
    const child = await fork(parent.id, f.users.designer, { teamId: bench.id });
    const event = await db().models.ActivityEvent.findOne({ where: { kind: 'forked', designId: child.id } });
    expect(event?.teamId).toBe(bench.id);
    expect(await db().models.ActivityRecipient.count({ where: { eventId: event!.id } })).toBe(0);
  });
});

describe('offering back', () => {
  it('only the fork\u2019s author offers: owner, reviewer and viewer 403, outsider 404; the offer records the parent\u2019s latest as its base', async () => {
    const parent = await create('Offered ladder', f.users.owner);
    await save(parent.id, 1, 15e-9, f.users.owner);
    const child = await fork(parent.id, f.users.designer, { revision: 1 });
    await save(child.id, 1, 33e-9, f.users.designer);
    const expected: Record<Who, number> = { owner: 403, designer: 201, reviewer: 403, viewer: 403, outsider: 404 };
    for (const who of WHO) {
      const res = await offerBack(child.id, f.users[who], { message: `from ${who}` });
      expect({ who, status: res.status }).toEqual({ who, status: expected[who] });
      if (res.status !== 201) expect(res.body.error?.message).toMatch(/\w/);
    }
    const rows = await db().models.ForkOffer.findAll({ where: { forkDesignId: child.id } });
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ forkRevision: 2, parentDesignId: parent.id, parentBaseRevision: 2, offeredById: f.users.designer.id, message: 'from designer', state: 'open' });
    // the parent is untouched by an offer
    expect((await detail(parent.id)).latestRevision).toBe(2);
  });

  it('names an older revision of the fork; a revision that does not exist is 422', async () => {
    const parent = await create('Picked ladder', f.users.owner);
    const child = await fork(parent.id, f.users.designer);
    await save(child.id, 1, 33e-9, f.users.designer);
    const missing = await offerBack(child.id, f.users.designer, { revision: 3 });
    expect({ status: missing.status, field: missing.body.error?.field }).toEqual({ status: 422, field: 'revision' });
    expect((await offerBack(child.id, f.users.designer, { revision: 0 })).body.error?.field).toBe('revision');
    const ok = await offerBack(child.id, f.users.designer, { revision: 1 });
    expect(ok.status).toBe(201);
    expect(ok.body.offer).toMatchObject({
      fork: { designId: child.id, title: 'Picked ladder (fork)', revision: 1 },
      parent: { designId: parent.id, title: 'Picked ladder', baseRevision: 1 },
      offeredBy: { id: f.users.designer.id },
      message: '',
      state: 'open',
      decidedBy: null,
      resultingRevision: null,
      canDecide: false,
    });
  });

  it('one open offer per fork (409) until it is withdrawn', async () => {
    const { forkId, offer: first } = await offered('Doubled ladder');
    const again = await offerBack(forkId, f.users.designer, { revision: 1 });
    expect(again.status).toBe(409);
    expect(again.body.error?.message).toMatch(/already offered back/);
    expect(await db().models.ForkOffer.count({ where: { forkDesignId: forkId } })).toBe(1);
    expect((await withdraw(first.id, f.users.designer)).status).toBe(200);
    const next = await offerBack(forkId, f.users.designer, { revision: 1 });
    expect(next.status).toBe(201);
    expect(next.body.offer.fork.revision).toBe(1);
  });

  it('refuses (409) a design that is no fork, an archived or private fork, an archived parent or one the offerer can no longer open', async () => {
    const plain = await create('Unforked ladder', f.users.designer);
    expect((await offerBack(plain.id, f.users.designer)).status).toBe(409);

    const parent = await create('Guarded ladder', f.users.owner);
    const archivedFork = await fork(parent.id, f.users.designer);
    expect((await patch(archivedFork.id, f.users.designer, { archived: true })).status).toBe(200);
    expect((await offerBack(archivedFork.id, f.users.designer)).status).toBe(409);

    const privateFork = await fork(parent.id, f.users.designer);
    expect((await patch(privateFork.id, f.users.designer, { visibility: 'private' })).status).toBe(200);
    expect((await offerBack(privateFork.id, f.users.designer)).status).toBe(409);
    // the detail's permission agrees with the server, so the page never offers a button that fails
    expect((await detail(archivedFork.id, f.users.designer)).permissions.offerBack).toBe(false);
    expect((await detail(privateFork.id, f.users.designer)).permissions.offerBack).toBe(false);

    const openFork = await fork(parent.id, f.users.designer);
    expect((await patch(parent.id, f.users.owner, { archived: true })).status).toBe(200);
    expect((await offerBack(openFork.id, f.users.designer)).status).toBe(409);
    expect((await detail(openFork.id, f.users.designer)).permissions.offerBack).toBe(false);
    expect((await patch(parent.id, f.users.owner, { archived: false })).status).toBe(200);
    expect((await patch(parent.id, f.users.owner, { visibility: 'private' })).status).toBe(200);
    const hidden = await offerBack(openFork.id, f.users.designer);
    expect(hidden.status).toBe(409);
    expect(hidden.body.error?.message).toMatch(/can no longer open/);
    expect((await detail(openFork.id, f.users.designer)).permissions.offerBack).toBe(false);
    expect((await patch(parent.id, f.users.owner, { visibility: 'team' })).status).toBe(200);
    expect((await detail(openFork.id, f.users.designer)).permissions.offerBack).toBe(true);
    expect((await offerBack(openFork.id, f.users.designer)).status).toBe(201);

    expect(await db().models.ForkOffer.count({ where: { forkDesignId: [plain.id, archivedFork.id, privateFork.id] } })).toBe(0);
  });

  it('a fork author who is now only a reviewer cannot offer (403)', async () => {
    const parent = await create('Demoted ladder', f.users.owner);
    const former = await makeUser('Former');
    await addMember(f.teamId, former.id, 'designer');
    const child = await fork(parent.id, former);
    await db().models.Membership.update({ role: 'reviewer' }, { where: { teamId: f.teamId, userId: former.id } });
    expect((await offerBack(child.id, former)).status).toBe(403);
  });

  it('a fork in a team nobody deciding for the parent belongs to cannot be offered (409)', async () => {
    const parent = await create('Stranded ladder', f.users.owner);
    const bench = await db().models.Team.create({ name: 'Lonely bench' });
    await addMember(bench.id, f.users.designer.id, 'designer');
    const child = await fork(parent.id, f.users.designer, { teamId: bench.id });
    const res = await offerBack(child.id, f.users.designer);
    expect(res.status).toBe(409);
    expect(res.body.error?.message).toMatch(/nobody who decides/);
    // once the parent's owner joins that team, the offer goes through
    await addMember(bench.id, f.users.owner.id, 'viewer');
    expect((await offerBack(child.id, f.users.designer)).status).toBe(201);
  });

  it('mails the parent\u2019s author and its team\u2019s owners the exact compare link; the offerer and others get nothing; the feed has it too', async () => {
    // a designer's parent: its author (designer) and the owner are told; the owner offers
    const parent = await create('Mailed offer ladder', f.users.designer);
    await save(parent.id, 1, 15e-9, f.users.designer);
    const coOwner = await makeUser('Coowner');
    await addMember(f.teamId, coOwner.id, 'owner');
    const child = await fork(parent.id, f.users.owner, { title: 'Mailed offer bench' });
    await save(child.id, 1, 47e-9, f.users.owner);
    const res = await offerBack(child.id, f.users.owner, { message: 'bleeder doubled' });
    expect(res.status).toBe(201);
    const o = res.body.offer;
    await flushMail();
    const url = `${process.env.NEXTAUTH_URL}${comparePath(parent.id, 2, 2, child.id, o.id)}`;
    for (const u of [f.users.designer, coOwner]) {
      const mail = (await mailFor(u.email)).find((m) => m.subject.includes('Mailed offer ladder'));
      expect(mail, u.name).toBeDefined();
      expect(mail!.subject).toBe('Offered back to "Mailed offer ladder": "Mailed offer bench" r2');
      expect(mail!.text).toContain(url);
      expect(mail!.text).toContain('bleeder doubled');
      expect(mail!.text).toContain('does not certify that the supply is safe');
    }
    for (const who of ['owner', 'reviewer', 'viewer', 'outsider'] as const) {
      expect({ who, mails: (await mailFor(f.users[who].email)).filter((m) => m.subject.includes('Mailed offer ladder')) }).toEqual({ who, mails: [] });
    }
    const { ActivityEvent, ActivityRecipient } = db().models;
    const event = await ActivityEvent.findOne({ where: { kind: 'fork_offered', designId: parent.id } });
    expect(event).toMatchObject({ teamId: f.teamId, actorId: f.users.owner.id, path: comparePath(parent.id, 2, 2, child.id, o.id) });
    const to = (await ActivityRecipient.findAll({ where: { eventId: event!.id } })).map((r) => r.userId).sort();
    expect(to).toEqual([f.users.designer.id, coOwner.id].sort());
    await db().models.Membership.destroy({ where: { teamId: f.teamId, userId: coOwner.id } });
  });

  it('a reader who turned offer mails off gets none', async () => {
    const parent = await create('Quiet offer ladder', f.users.owner);
    const child = await fork(parent.id, f.users.designer);
    await db().models.NotificationSetting.upsert({ userId: f.users.owner.id, muted: ['fork_offered'] });
    try {
      expect((await offerBack(child.id, f.users.designer)).status).toBe(201);
      await flushMail();
      expect((await mailFor(f.users.owner.email)).filter((m) => m.subject.includes('Quiet offer ladder'))).toEqual([]);
    } finally {
      await db().models.NotificationSetting.upsert({ userId: f.users.owner.id, muted: [] });
    }
  });
});

describe('listing offers', () => {
  it('every reader sees incoming on the parent and outgoing on the fork, newest first; outsiders 404; only deciders may decide', async () => {
    const parent = await create('Listed offer ladder', f.users.owner);
    const a = await fork(parent.id, f.users.designer, { title: 'Listed bench A' });
    const b = await fork(parent.id, f.users.owner, { title: 'Listed bench B' });
    const first = await offerBack(a.id, f.users.designer);
    const second = await offerBack(b.id, f.users.owner);
    for (const who of WHO) {
      const res = await list(parent.id, f.users[who]);
      expect({ who, status: res.status }).toEqual({ who, status: who === 'outsider' ? 404 : 200 });
      if (res.status !== 200) continue;
      expect(res.body.incoming.map((o) => o.id)).toEqual([second.body.offer.id, first.body.offer.id]);
      expect(res.body.outgoing).toEqual([]);
      expect({ who, canDecide: res.body.incoming.map((o) => o.canDecide) }).toEqual({ who, canDecide: who === 'owner' ? [true, true] : [false, false] });
    }
    const out = await list(a.id, f.users.reviewer);
    expect(out.body.incoming).toEqual([]);
    expect(out.body.outgoing).toEqual([first.body.offer]);
    expect(out.body.outgoing[0]).toMatchObject({ fork: { title: 'Listed bench A' }, parent: { title: 'Listed offer ladder' } });
    expect((await list(a.id, f.users.outsider)).status).toBe(404);
  });
});

describe('deciding an offer', () => {
  it('on an owner\u2019s design only that owner decides: the offering designer, reviewer and viewer 403, outsider 404', async () => {
    const { parentId, offer: o } = await offered('Guarded offer ladder');
    const before = await parentState(parentId);
    const expected: Record<Exclude<Who, 'owner'>, number> = { designer: 403, reviewer: 403, viewer: 403, outsider: 404 };
    for (const who of ['designer', 'reviewer', 'viewer', 'outsider'] as const) {
      for (const body of [{ decision: 'accept', parentBaseRevision: 1 }, { decision: 'decline', note: 'no' }]) {
        const res = await decide(o.id, f.users[who], body);
        expect({ who, decision: body.decision, status: res.status }).toEqual({ who, decision: body.decision, status: expected[who] });
      }
    }
    expect(await parentState(parentId)).toEqual(before);
    expect((await db().models.ForkOffer.findByPk(o.id))?.state).toBe('open');
  });

  it('on a designer\u2019s design its author and any owner decide, another designer cannot; an owner accepting their own offer is fine', async () => {
    const parent = await create('Shared offer ladder', f.users.designer);
    const otherDesigner = await makeUser('Otherdesigner');
    await addMember(f.teamId, otherDesigner.id, 'designer');
    const byOther = await fork(parent.id, otherDesigner);
    const o1 = (await offerBack(byOther.id, otherDesigner)).body.offer;
    expect(o1.canDecide).toBe(false);
    expect((await decide(o1.id, otherDesigner, { decision: 'decline' })).status).toBe(403);
    expect((await list(parent.id, f.users.designer)).body.incoming[0].canDecide).toBe(true);
    const declined = await decide(o1.id, f.users.designer, { decision: 'decline', note: 'keep the 3-stage layout' });
    expect(declined.status).toBe(200);

    const byOwner = await fork(parent.id, f.users.owner);
    await save(byOwner.id, 1, 68e-9, f.users.owner);
    const o2 = (await offerBack(byOwner.id, f.users.owner)).body.offer;
    expect(o2.canDecide).toBe(true);
    const accepted = await decide(o2.id, f.users.owner, { decision: 'accept', parentBaseRevision: 1 });
    expect(accepted.status).toBe(200);
    expect(accepted.body.revision?.author.id).toBe(f.users.owner.id);

    // the parent's author who is now a reviewer no longer decides
    const byOther2 = await fork(parent.id, otherDesigner);
    const o3 = (await offerBack(byOther2.id, otherDesigner)).body.offer;
    await db().models.Membership.update({ role: 'reviewer' }, { where: { teamId: f.teamId, userId: f.users.designer.id } });
    try {
      expect((await decide(o3.id, f.users.designer, { decision: 'decline' })).status).toBe(403);
    } finally {
      await db().models.Membership.update({ role: 'designer' }, { where: { teamId: f.teamId, userId: f.users.designer.id } });
    }
  });

  it('accepting against a stale base answers 409 with the latest revision and writes nothing', async () => {
    const { parentId, offer: o } = await offered('Stale offer ladder');
    await save(parentId, 1, 15e-9, f.users.owner); // the parent moves on after the offer
    const before = await parentState(parentId);
    const stale = await decide(o.id, f.users.owner, { decision: 'accept', parentBaseRevision: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error?.code).toBe('conflict');
    expect(stale.body.error?.latestRevision).toBe(2);
    expect(await parentState(parentId)).toEqual(before);
    expect(await db().models.ForkOffer.findByPk(o.id, { raw: true })).toMatchObject({ state: 'open', resultingRevision: null, decidedById: null });
    expect(await db().models.ActivityEvent.count({ where: { kind: 'offer_decided', designId: parentId } })).toBe(0);
    // without a base there is nothing to compare against (422)
    expect((await decide(o.id, f.users.owner, { decision: 'accept' })).body.error?.field).toBe('parentBaseRevision');
    // a base that is ahead of the parent is stale too
    expect((await decide(o.id, f.users.owner, { decision: 'accept', parentBaseRevision: 9 })).status).toBe(409);
    // compared against the latest, it goes in as r3
    const ok = await decide(o.id, f.users.owner, { decision: 'accept', parentBaseRevision: 2 });
    expect(ok.status).toBe(200);
    expect(ok.body.revision?.number).toBe(3);
  });

  it('accepting makes the fork revision\u2019s document the parent\u2019s next revision, authored by the offerer; an approved parent becomes changed since approval', async () => {
    const { parentId, forkId, offer: o } = await offered('Accepted offer ladder');
    // approve the parent's r1 first
    const asked = await call<{ review: ReviewDto }>(reviews.POST, `/api/designs/${parentId}/reviews`, {
      method: 'POST',
      params: { designId: parentId },
      as: f.users.owner,
      body: { revision: 1, reviewerIds: [f.users.reviewer.id] },
    });
    const reviewId = asked.body.review.id;
    const approved = await call<{ design: DesignDetailDto }>(reviewDecision.POST, `/api/designs/${parentId}/reviews/${reviewId}/decision`, {
      method: 'POST',
      params: { designId: parentId, reviewId },
      as: f.users.reviewer,
      body: { decision: 'approve' },
    });
    expect(approved.body.design.status).toBe('approved');
    const r1 = await getRev(parentId, 1);

    const res = await decide(o.id, f.users.owner, { decision: 'accept', parentBaseRevision: 1, note: 'good change' });
    expect(res.status).toBe(200);
    expect(res.body.revision).toMatchObject({
      number: 2,
      author: { id: f.users.designer.id },
      message: 'Offered back from "Accepted offer ladder (bench copy)" r2 by Designer; accepted by Owner',
    });
    expect(res.body.offer).toMatchObject({ state: 'accepted', resultingRevision: 2, decidedBy: { id: f.users.owner.id }, decisionNote: 'good change', canDecide: false });
    expect(res.body.offer.decidedAt).not.toBeNull();

    const forkRev = await getRev(forkId, 2);
    const parentRev = await getRev(parentId, 2);
    expect(parentRev.document).toEqual(forkRev.document);
    expect(parentRev.document).toEqual(sampleDocument(22e-9));
    expect(parentRev.author.id).toBe(f.users.designer.id);
    expect(await getRev(parentId, 1)).toEqual(r1);
    const d = await detail(parentId);
    expect(d.latestRevision).toBe(2);
    expect(d.status).toBe('changed_since_approval');
    expect(d.approval?.revision).toBe(1);
    expect(d.author.id).toBe(f.users.owner.id);

    // the offerer hears of it in the feed (no mail kind exists for decisions)
    const event = await db().models.ActivityEvent.findOne({ where: { kind: 'offer_decided', designId: parentId } });
    expect(event).toMatchObject({ actorId: f.users.owner.id, path: `/designs/${parentId}?revision=2` });
    expect((await db().models.ActivityRecipient.findAll({ where: { eventId: event!.id } })).map((r) => r.userId)).toEqual([f.users.designer.id]);

    // a decided offer cannot be decided again or withdrawn
    expect((await decide(o.id, f.users.owner, { decision: 'accept', parentBaseRevision: 2 })).status).toBe(409);
    expect((await decide(o.id, f.users.owner, { decision: 'decline' })).status).toBe(409);
    expect((await withdraw(o.id, f.users.designer)).status).toBe(409);
    expect((await detail(parentId)).latestRevision).toBe(2);
    // the fork may offer again now
    expect((await offerBack(forkId, f.users.designer)).status).toBe(201);
  });

  it('declining records the note and leaves the parent alone', async () => {
    const { parentId, offer: o } = await offered('Declined offer ladder');
    const before = await parentState(parentId);
    const res = await decide(o.id, f.users.owner, { decision: 'decline', note: 'the ripple target changed' });
    expect(res.status).toBe(200);
    expect(res.body.revision).toBeNull();
    expect(res.body.offer).toMatchObject({ state: 'declined', decisionNote: 'the ripple target changed', decidedBy: { id: f.users.owner.id }, resultingRevision: null });
    expect(await parentState(parentId)).toEqual(before);
    const event = await db().models.ActivityEvent.findOne({ where: { kind: 'offer_decided', designId: parentId } });
    expect(event?.summary).toMatch(/declined/);
    expect((await db().models.ActivityRecipient.findAll({ where: { eventId: event!.id } })).map((r) => r.userId)).toEqual([f.users.designer.id]);
  });

  it('unknown or malformed offer ids answer 404', async () => {
    expect((await decide(randomUUID(), f.users.owner, { decision: 'decline' })).status).toBe(404);
    expect((await decide('nope', f.users.owner, { decision: 'decline' })).status).toBe(404);
    expect((await withdraw(randomUUID(), f.users.designer)).status).toBe(404);
    expect((await withdraw('nope', f.users.designer)).status).toBe(404);
  });
});

describe('withdrawing an offer', () => {
  it('only the offerer withdraws: owner, reviewer and viewer 403, outsider 404; then it cannot be decided', async () => {
    const { parentId, offer: o } = await offered('Withdrawn offer ladder');
    const expected: Record<Who, number> = { owner: 403, designer: 200, reviewer: 403, viewer: 403, outsider: 404 };
    for (const who of WHO.filter((w) => w !== 'designer')) {
      expect({ who, status: (await withdraw(o.id, f.users[who])).status }).toEqual({ who, status: expected[who] });
    }
    const ok = await withdraw(o.id, f.users.designer);
    expect(ok.status).toBe(200);
    expect(ok.body.offer.state).toBe('withdrawn');
    expect((await withdraw(o.id, f.users.designer)).status).toBe(409);
    const late = await decide(o.id, f.users.owner, { decision: 'accept', parentBaseRevision: 1 });
    expect(late.status).toBe(409);
    expect((await detail(parentId)).latestRevision).toBe(1);
    expect((await list(parentId, f.users.owner)).body.incoming.map((x) => [x.id, x.state, x.canDecide])).toEqual([[o.id, 'withdrawn', false]]);
  });
});
