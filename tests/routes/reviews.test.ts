/**
 * Review requests, decisions and approvals against the real database: every action × role,
 * the status machine, superseded and withdrawn requests, nobody approving their own design, and
 * an approved revision that can only be superseded, never overwritten.
 */
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as revision from '@/app/api/designs/[designId]/revisions/[number]/route';
import * as reviews from '@/app/api/designs/[designId]/reviews/route';
import * as review from '@/app/api/designs/[designId]/reviews/[reviewId]/route';
import * as decision from '@/app/api/designs/[designId]/reviews/[reviewId]/decision/route';
import type { ApprovalDto, DesignDetailDto, ReviewDto, RevisionDto, RevisionSummaryDto } from '@/lib/api/contract';
import { flushMail } from '@/lib/data/activity';
import { db } from '@/lib/db';
import { call, mailFor, sampleDocument, setupFixtures, teardown, WHO, type Fixtures, type FixtureUser, type Who } from './helpers';

let f: Fixtures;

beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

type ErrorBody = { error?: { code: string; message: string; field?: string; latestRevision?: number } };
type ReviewAnswer = { review: ReviewDto; design: DesignDetailDto } & ErrorBody;

async function create(title: string, o: { as?: Who; visibility?: 'team' | 'private' } = {}): Promise<DesignDetailDto> {
  const res = await call<{ design: DesignDetailDto }>(teamDesigns.POST, `/api/teams/${f.teamId}/designs`, {
    method: 'POST',
    params: { teamId: f.teamId },
    as: f.users[o.as ?? 'designer'],
    body: { title, visibility: o.visibility, document: sampleDocument(10e-9), message: 'start' },
  });
  expect(res.status).toBe(201);
  return res.body.design;
}

/** A design authored by someone whose role cannot create designs (written straight to the tables). */
async function createAuthoredBy(title: string, author: FixtureUser): Promise<string> {
  const { Design, DesignRevision } = db().models;
  const d = await Design.create({ teamId: f.teamId, authorId: author.id, title, visibility: 'team', archivedAt: null, forkedFromDesignId: null, forkedFromRevision: null, latestRevision: 1, topology: 'half-wave', stages: 3 });
  await DesignRevision.create({ designId: d.id, number: 1, document: sampleDocument(), authorId: author.id, message: 'start' });
  return d.id;
}

function save(designId: string, baseRevision: number, capacitanceF: number, as: FixtureUser = f.users.designer) {
  return call<{ revision: RevisionSummaryDto } & ErrorBody>(revisions.POST, `/api/designs/${designId}/revisions`, {
    method: 'POST',
    params: { designId },
    as,
    body: { baseRevision, document: sampleDocument(capacitanceF), message: `C = ${capacitanceF}` },
  });
}

function request(designId: string, as: FixtureUser, body: Record<string, unknown>) {
  return call<ReviewAnswer>(reviews.POST, `/api/designs/${designId}/reviews`, { method: 'POST', params: { designId }, as, body });
}

function decide(designId: string, reviewId: string, as: FixtureUser, body: Record<string, unknown>) {
  return call<ReviewAnswer>(decision.POST, `/api/designs/${designId}/reviews/${reviewId}/decision`, { method: 'POST', params: { designId, reviewId }, as, body });
}

function withdraw(designId: string, reviewId: string, as: FixtureUser) {
  return call<ReviewAnswer>(review.DELETE, `/api/designs/${designId}/reviews/${reviewId}`, { method: 'DELETE', params: { designId, reviewId }, as });
}

function list(designId: string, as: FixtureUser) {
  return call<{ reviews: ReviewDto[]; approval: ApprovalDto | null } & ErrorBody>(reviews.GET, `/api/designs/${designId}/reviews`, { params: { designId }, as });
}

async function detail(designId: string, as: FixtureUser = f.users.viewer): Promise<DesignDetailDto> {
  const res = await call<{ design: DesignDetailDto }>(design.GET, `/api/designs/${designId}`, { params: { designId }, as });
  expect(res.status).toBe(200);
  return res.body.design;
}

async function getRev(designId: string, n: number) {
  return (await call<{ revision: RevisionDto }>(revision.GET, `/api/designs/${designId}/revisions/${n}`, { params: { designId, number: String(n) }, as: f.users.viewer })).body.revision;
}

/** A designer-authored design with an open request for r1 from the reviewer. */
async function openRequest(title: string): Promise<{ designId: string; reviewId: string }> {
  const d = await create(title);
  const res = await request(d.id, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id] });
  expect(res.status).toBe(201);
  return { designId: d.id, reviewId: res.body.review.id };
}

describe('requesting a review', () => {
  it('owners and designers may ask; reviewers and viewers 403; outsiders 404; each new request supersedes the open one', async () => {
    const d = await create('Asked ladder');
    const expected: Record<Who, number> = { owner: 201, designer: 201, reviewer: 403, viewer: 403, outsider: 404 };
    const made: string[] = [];
    for (const who of WHO) {
      const res = await request(d.id, f.users[who], { revision: 1, reviewerIds: [f.users.reviewer.id], note: `from ${who}` });
      expect({ who, status: res.status }).toEqual({ who, status: expected[who] });
      if (res.status === 201) {
        made.push(res.body.review.id);
        expect(res.body.review).toMatchObject({ designId: d.id, revision: 1, state: 'open', note: `from ${who}`, requestedBy: { id: f.users[who].id }, decidedBy: null });
        expect(res.body.review.reviewers.map((u) => u.id)).toEqual([f.users.reviewer.id]);
        expect(res.body.design.status).toBe('in_review');
        expect(res.body.design.openReview?.id).toBe(res.body.review.id);
      } else {
        expect(res.body.error?.message).toMatch(/\w/);
      }
    }
    const all = await list(d.id, f.users.viewer);
    expect(all.body.reviews.map((r) => [r.id, r.state])).toEqual([
      [made[1], 'open'],
      [made[0], 'superseded'],
    ]);
  });

  it('names reviewers among members with the reviewer or owner role, never the author (422 reviewerIds)', async () => {
    const d = await create('Picky ladder');
    const before = await detail(d.id);
    const probes: [string, Record<string, unknown>, string][] = [
      ['the author', { revision: 1, reviewerIds: [f.users.designer.id] }, 'reviewerIds'],
      ['a viewer', { revision: 1, reviewerIds: [f.users.viewer.id] }, 'reviewerIds'],
      ['an outsider', { revision: 1, reviewerIds: [f.users.reviewer.id, f.users.outsider.id] }, 'reviewerIds'],
      ['an unknown id', { revision: 1, reviewerIds: [randomUUID()] }, 'reviewerIds'],
      ['nobody', { revision: 1, reviewerIds: [] }, 'reviewerIds'],
      ['a non-uuid', { revision: 1, reviewerIds: ['rue'] }, 'reviewerIds.0'],
      ['a revision that does not exist', { revision: 2, reviewerIds: [f.users.reviewer.id] }, 'revision'],
      ['revision zero', { revision: 0, reviewerIds: [f.users.reviewer.id] }, 'revision'],
    ];
    for (const [name, body, field] of probes) {
      const res = await request(d.id, f.users.designer, body);
      expect({ name, status: res.status, field: res.body.error?.field }).toEqual({ name, status: 422, field });
    }
    expect(await detail(d.id)).toEqual(before);
    expect((await list(d.id, f.users.designer)).body.reviews).toEqual([]);
    // an owner and a reviewer together, duplicates collapsed
    const ok = await request(d.id, f.users.designer, { revision: 1, reviewerIds: [f.users.owner.id, f.users.reviewer.id, f.users.owner.id] });
    expect(ok.status).toBe(201);
    expect(ok.body.review.reviewers.map((u) => u.id).sort()).toEqual([f.users.owner.id, f.users.reviewer.id].sort());
  });

  it('a private design or an archived one cannot be sent for review (409)', async () => {
    const p = await create('Hidden ladder', { visibility: 'private' });
    expect((await request(p.id, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id] })).status).toBe(409);
    const a = await create('Shelved ladder');
    expect((await call(design.PATCH, `/api/designs/${a.id}`, { method: 'PATCH', params: { designId: a.id }, as: f.users.designer, body: { archived: true } })).status).toBe(200);
    expect((await request(a.id, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id] })).status).toBe(409);
    expect(await db().models.ReviewRequest.count({ where: { designId: [p.id, a.id] } })).toBe(0);
  });

  it('mails each reviewer a link to the exact review', async () => {
    const d = await create('Mailed ladder');
    const res = await request(d.id, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id, f.users.owner.id], note: 'check the bleeder' });
    expect(res.status).toBe(201);
    await flushMail();
    const path = `/designs/${d.id}?revision=1&review=${res.body.review.id}`;
    for (const who of ['reviewer', 'owner'] as const) {
      const mails = await mailFor(f.users[who].email);
      const mail = mails.find((m) => m.subject.includes('Mailed ladder'));
      expect(mail, who).toBeDefined();
      expect(mail!.text).toContain(`${process.env.NEXTAUTH_URL}${path}`);
      expect(mail!.text).toContain('check the bleeder');
    }
    // the requester is not mailed about their own request
    expect((await mailFor(f.users.designer.email)).filter((m) => m.subject.includes('Mailed ladder'))).toEqual([]);
  });
});

describe('deciding a review', () => {
  it('a reviewer approves; a designer or viewer cannot (403); an outsider gets 404', async () => {
    const { designId, reviewId } = await openRequest('Decided ladder');
    for (const who of ['designer', 'viewer'] as const) {
      const res = await decide(designId, reviewId, f.users[who], { decision: 'approve' });
      expect({ who, status: res.status, code: res.body.error?.code }).toEqual({ who, status: 403, code: 'forbidden' });
    }
    expect((await decide(designId, reviewId, f.users.outsider, { decision: 'approve' })).status).toBe(404);
    expect((await detail(designId)).status).toBe('in_review');
    expect(await db().models.Approval.count({ where: { designId } })).toBe(0);

    const ok = await decide(designId, reviewId, f.users.reviewer, { decision: 'approve', note: 'stress margins fine' });
    expect(ok.status).toBe(200);
    expect(ok.body.review).toMatchObject({ state: 'approved', decidedBy: { id: f.users.reviewer.id }, decisionNote: 'stress margins fine' });
    expect(ok.body.design.status).toBe('approved');
    expect(ok.body.design.openReview).toBeNull();
    expect(ok.body.design.approval).toMatchObject({ reviewId, revision: 1, approvedBy: { id: f.users.reviewer.id }, note: 'stress margins fine' });
    const listed = await list(designId, f.users.viewer);
    expect(listed.body.approval).toEqual(ok.body.design.approval);
    // a decided request cannot be decided again
    expect((await decide(designId, reviewId, f.users.owner, { decision: 'request_changes', note: 'no' })).status).toBe(409);
  });

  it('an owner who did not write the design may decide it', async () => {
    const { designId, reviewId } = await openRequest('Owner-checked ladder');
    const res = await decide(designId, reviewId, f.users.owner, { decision: 'approve' });
    expect(res.status).toBe(200);
    expect(res.body.design.approval?.approvedBy.id).toBe(f.users.owner.id);
  });

  it('nobody approves their own design: an owner-authored design decided by that owner, a reviewer-authored one by that reviewer (403)', async () => {
    const mine = await create('Owner ladder', { as: 'owner' });
    const asked = await request(mine.id, f.users.owner, { revision: 1, reviewerIds: [f.users.reviewer.id] });
    expect(asked.status).toBe(201);
    const self = await decide(mine.id, asked.body.review.id, f.users.owner, { decision: 'approve' });
    expect(self.status).toBe(403);
    expect(self.body.error?.message).toBe('you cannot approve your own design');
    expect((await decide(mine.id, asked.body.review.id, f.users.owner, { decision: 'request_changes', note: 'hmm' })).status).toBe(403);
    expect((await detail(mine.id, f.users.owner)).permissions.decideReview).toBe(false);
    expect((await detail(mine.id, f.users.reviewer)).permissions.decideReview).toBe(true);

    const theirs = await createAuthoredBy('Reviewer ladder', f.users.reviewer);
    // the author cannot be named as a reviewer, so the owner reviews; the author still cannot decide
    expect((await request(theirs, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id] })).body.error?.field).toBe('reviewerIds');
    const req2 = await request(theirs, f.users.designer, { revision: 1, reviewerIds: [f.users.owner.id] });
    expect(req2.status).toBe(201);
    const selfReview = await decide(theirs, req2.body.review.id, f.users.reviewer, { decision: 'approve' });
    expect(selfReview.status).toBe(403);
    expect(selfReview.body.error?.message).toBe('you cannot approve your own design');
    expect(await db().models.Approval.count({ where: { designId: [mine.id, theirs] } })).toBe(0);
  });

  it('changes requested need a note; the design goes changes_requested → in_review → approved', async () => {
    const { designId, reviewId } = await openRequest('Iterated ladder');
    const bare = await decide(designId, reviewId, f.users.reviewer, { decision: 'request_changes' });
    expect(bare.status).toBe(422);
    expect(bare.body.error?.field).toBe('note');
    expect((await decide(designId, reviewId, f.users.reviewer, { decision: 'maybe' })).body.error?.field).toBe('decision');

    const changes = await decide(designId, reviewId, f.users.reviewer, { decision: 'request_changes', note: 'C3 is under-rated' });
    expect(changes.status).toBe(200);
    expect(changes.body.review.state).toBe('changes_requested');
    expect(changes.body.design.status).toBe('changes_requested');
    expect(changes.body.design.approval).toBeNull();

    expect((await save(designId, 1, 22e-9)).status).toBe(201);
    expect((await detail(designId)).status).toBe('changes_requested');
    const again = await request(designId, f.users.designer, { revision: 2, reviewerIds: [f.users.reviewer.id] });
    expect(again.body.design.status).toBe('in_review');
    const approved = await decide(designId, again.body.review.id, f.users.reviewer, { decision: 'approve' });
    expect(approved.body.design.status).toBe('approved');
    expect(approved.body.design.approval?.revision).toBe(2);
  });

  it('a superseded or withdrawn request cannot be decided (409)', async () => {
    const { designId, reviewId } = await openRequest('Superseded ladder');
    const newer = await request(designId, f.users.designer, { revision: 1, reviewerIds: [f.users.owner.id] });
    const stale = await decide(designId, reviewId, f.users.reviewer, { decision: 'approve' });
    expect(stale.status).toBe(409);
    expect(stale.body.error?.message).toMatch(/superseded/);
    expect((await withdraw(designId, newer.body.review.id, f.users.designer)).status).toBe(200);
    expect((await decide(designId, newer.body.review.id, f.users.owner, { decision: 'approve' })).status).toBe(409);
    expect(await db().models.Approval.count({ where: { designId } })).toBe(0);
  });

  it('unknown, malformed or another design\u2019s review ids answer 404', async () => {
    const a = await openRequest('First ladder');
    const b = await openRequest('Second ladder');
    expect((await decide(a.designId, randomUUID(), f.users.reviewer, { decision: 'approve' })).status).toBe(404);
    expect((await decide(a.designId, 'nope', f.users.reviewer, { decision: 'approve' })).status).toBe(404);
    expect((await decide(a.designId, b.reviewId, f.users.reviewer, { decision: 'approve' })).status).toBe(404);
    expect((await withdraw(a.designId, b.reviewId, f.users.designer)).status).toBe(404);
    expect((await detail(b.designId)).status).toBe('in_review');
  });

  it('approving a request for an older revision leaves the design changed since approval', async () => {
    const { designId, reviewId } = await openRequest('Moving ladder');
    expect((await save(designId, 1, 15e-9)).status).toBe(201);
    const res = await decide(designId, reviewId, f.users.reviewer, { decision: 'approve' });
    expect(res.status).toBe(200);
    expect(res.body.design.status).toBe('changed_since_approval');
    expect(res.body.design.approval?.revision).toBe(1);
    expect(res.body.design.latestRevision).toBe(2);
  });
});

describe('withdrawing a request', () => {
  it('the requester, the author or an owner withdraws; reviewers and viewers 403; outsiders 404; status returns', async () => {
    const { designId, reviewId } = await openRequest('Withdrawn ladder');
    for (const who of ['reviewer', 'viewer'] as const) expect({ who, status: (await withdraw(designId, reviewId, f.users[who])).status }).toEqual({ who, status: 403 });
    expect((await withdraw(designId, reviewId, f.users.outsider)).status).toBe(404);
    const ok = await withdraw(designId, reviewId, f.users.designer);
    expect(ok.status).toBe(200);
    expect(ok.body.review.state).toBe('withdrawn');
    expect(ok.body.design.status).toBe('draft');
    expect((await withdraw(designId, reviewId, f.users.designer)).status).toBe(409);

    // with an approval on record, withdrawing a later request returns to approved
    const r1 = await request(designId, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id] });
    expect((await decide(designId, r1.body.review.id, f.users.reviewer, { decision: 'approve' })).body.design.status).toBe('approved');
    const r2 = await request(designId, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id], note: 'second look' });
    expect(r2.body.design.status).toBe('in_review');
    const back = await withdraw(designId, r2.body.review.id, f.users.owner);
    expect(back.status).toBe(200);
    expect(back.body.design.status).toBe('approved');
  });
});

describe('an approved revision cannot be overwritten, only superseded', () => {
  it('a save after approval makes r+1; r, its document and the approval are unchanged; the status says changed since approval', async () => {
    const { designId, reviewId } = await openRequest('Signed-off ladder');
    await decide(designId, reviewId, f.users.reviewer, { decision: 'approve', note: 'ok for build' });
    const approvalRow = await db().models.Approval.findOne({ where: { designId }, raw: true });
    const r1 = await getRev(designId, 1);

    const saved = await save(designId, 1, 47e-9);
    expect(saved.status).toBe(201);
    expect(saved.body.revision.number).toBe(2);
    // a second save on the approved base is stale, not an overwrite
    const overwrite = await save(designId, 1, 68e-9, f.users.owner);
    expect(overwrite.status).toBe(409);
    expect(overwrite.body.error?.latestRevision).toBe(2);

    expect(await getRev(designId, 1)).toEqual(r1);
    expect(r1.document).toEqual(sampleDocument(10e-9));
    expect(await db().models.Approval.findOne({ where: { designId }, raw: true })).toEqual(approvalRow);
    const d = await detail(designId);
    expect(d.status).toBe('changed_since_approval');
    expect(d.latestRevision).toBe(2);
    expect(d.approval).toMatchObject({ reviewId, revision: 1, note: 'ok for build', approvedBy: { id: f.users.reviewer.id } });

    // the database itself refuses to change or remove the records
    await expect(db().sequelize.query(`UPDATE approvals SET revision = 2 WHERE design_id = '${designId}'`)).rejects.toThrow(/never changed or removed/);
    await expect(db().sequelize.query(`DELETE FROM approvals WHERE design_id = '${designId}'`)).rejects.toThrow(/never changed or removed/);
    await expect(db().sequelize.query(`UPDATE design_revisions SET document = '{}'::jsonb WHERE design_id = '${designId}' AND number = 1`)).rejects.toThrow(/never updated in place/);
    expect(await db().models.Approval.findOne({ where: { designId }, raw: true })).toEqual(approvalRow);

    // a new review of r2 supersedes the approval; the old record stays
    const next = await request(designId, f.users.designer, { revision: 2, reviewerIds: [f.users.reviewer.id] });
    expect(next.body.design.status).toBe('in_review');
    const approved = await decide(designId, next.body.review.id, f.users.reviewer, { decision: 'approve' });
    expect(approved.body.design.status).toBe('approved');
    expect(approved.body.design.approval?.revision).toBe(2);
    expect(await db().models.Approval.count({ where: { designId } })).toBe(2);
  });

  it('deleting the design\u2019s team still removes its approvals with it', async () => {
    const team = await db().models.Team.create({ name: 'Short-lived bench' });
    await db().models.Membership.create({ teamId: team.id, userId: f.users.designer.id, role: 'designer' });
    await db().models.Membership.create({ teamId: team.id, userId: f.users.reviewer.id, role: 'reviewer' });
    const created = await call<{ design: DesignDetailDto }>(teamDesigns.POST, `/api/teams/${team.id}/designs`, {
      method: 'POST',
      params: { teamId: team.id },
      as: f.users.designer,
      body: { title: 'Doomed ladder', document: sampleDocument() },
    });
    const designId = created.body.design.id;
    const asked = await request(designId, f.users.designer, { revision: 1, reviewerIds: [f.users.reviewer.id] });
    expect((await decide(designId, asked.body.review.id, f.users.reviewer, { decision: 'approve' })).status).toBe(200);
    await team.destroy();
    expect(await db().models.Approval.count({ where: { designId } })).toBe(0);
  });
});

describe('reading reviews and permissions', () => {
  it('every reader lists reviews; outsiders 404; the detail DTO says who may request, decide, comment and offer back', async () => {
    const { designId } = await openRequest('Listed ladder');
    for (const who of WHO) {
      const res = await list(designId, f.users[who]);
      expect({ who, status: res.status }).toEqual({ who, status: who === 'outsider' ? 404 : 200 });
      if (who !== 'outsider') expect(res.body.reviews).toHaveLength(1);
    }
    const perms: Record<Exclude<Who, 'outsider'>, [boolean, boolean, boolean]> = {
      owner: [true, true, true],
      designer: [true, false, true], // the author
      reviewer: [false, true, true],
      viewer: [false, false, false],
    };
    for (const [who, [requestReview, decideReview, comment]] of Object.entries(perms) as [Exclude<Who, 'outsider'>, [boolean, boolean, boolean]][]) {
      const p = (await detail(designId, f.users[who])).permissions;
      expect({ who, requestReview: p.requestReview, decideReview: p.decideReview, comment: p.comment, offerBack: p.offerBack }).toEqual({ who, requestReview, decideReview, comment, offerBack: false });
    }
    expect((await detail(designId)).openReview?.reviewers.map((u) => u.id)).toEqual([f.users.reviewer.id]);
  });
});
