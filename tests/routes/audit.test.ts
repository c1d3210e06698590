/**
 * The audit log against the real database: each audited action writes exactly one row naming
 * its actor, target and a secret-free summary; an action that fails or rolls back writes none;
 * only owners read the log (403 for other roles, 404 for outsiders, 401 signed out), in pages;
 * and the table refuses UPDATE, DELETE and TRUNCATE.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as forkRoute from '@/app/api/designs/[designId]/fork/route';
import * as reviews from '@/app/api/designs/[designId]/reviews/route';
import * as decision from '@/app/api/designs/[designId]/reviews/[reviewId]/decision/route';
import * as member from '@/app/api/teams/[teamId]/members/[userId]/route';
import * as invitations from '@/app/api/teams/[teamId]/invitations/route';
import * as accept from '@/app/api/invitations/[token]/accept/route';
import * as offers from '@/app/api/designs/[designId]/offers/route';
import * as offerDecision from '@/app/api/offers/[offerId]/decision/route';
import * as audit from '@/app/api/teams/[teamId]/audit/route';
import type { AuditEventDto } from '@/lib/data/audit';
import { db } from '@/lib/db';
import { addMember, call, freshEmail, makeUser, sampleDocument, setupFixtures, teardown, type Fixtures, type FixtureUser } from './helpers';

let f: Fixtures;
beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

interface Row {
  id: string;
  team_id: string;
  actor_id: string;
  action: string;
  target_type: string;
  target_id: string;
  summary: Record<string, unknown>;
}

let mark = '0';
/** Rows written since the last call (and move the mark). */
async function newRows(): Promise<Row[]> {
  const [rows] = (await db().sequelize.query('SELECT * FROM audit_events WHERE id > :mark ORDER BY id', { replacements: { mark } })) as [Row[], unknown];
  if (rows.length) mark = String(rows[rows.length - 1].id);
  return rows;
}

function expectOne(rows: Row[], action: string, actor: FixtureUser, targetType: string, targetId?: string): Row {
  expect(rows.map((r) => r.action)).toEqual([action]);
  const r = rows[0];
  expect(r.actor_id).toBe(actor.id);
  expect(r.team_id).toBe(f.teamId);
  expect(r.target_type).toBe(targetType);
  if (targetId) expect(r.target_id).toBe(targetId);
  expect(JSON.stringify(r.summary)).not.toMatch(/token|hash|password|"document"/i);
  return r;
}

async function createDesign(as: FixtureUser, title = 'Audited ladder'): Promise<string> {
  const res = await call<{ design: { id: string } }>(teamDesigns.POST, `/api/teams/${f.teamId}/designs`, { method: 'POST', params: { teamId: f.teamId }, as, body: { title, document: sampleDocument() } });
  expect(res.status).toBe(201);
  return res.body.design.id;
}

describe('each audited action writes exactly one row with its actor', () => {
  it('design created, revision saved, shared, archived, restored, forked', async () => {
    await newRows();
    const designId = await createDesign(f.users.designer);
    expectOne(await newRows(), 'design.created', f.users.designer, 'design', designId);

    const saved = await call<{ revision: { number: number } }>(revisions.POST, `/api/designs/${designId}/revisions`, {
      method: 'POST',
      params: { designId },
      as: f.users.owner,
      body: { baseRevision: 1, document: sampleDocument(22e-9), message: 'bigger caps' },
    });
    expect(saved.status).toBe(201);
    const r = expectOne(await newRows(), 'revision.saved', f.users.owner, 'revision');
    expect(r.summary).toMatchObject({ designId, number: 2, baseRevision: 1 });

    // a stale save is refused and leaves no row
    const stale = await call(revisions.POST, `/api/designs/${designId}/revisions`, { method: 'POST', params: { designId }, as: f.users.owner, body: { baseRevision: 1, document: sampleDocument(33e-9) } });
    expect(stale.status).toBe(409);
    expect(await newRows()).toEqual([]);

    const shared = await call(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as: f.users.designer, body: { visibility: 'private' } });
    expect(shared.status).toBe(200);
    expect(expectOne(await newRows(), 'design.shared', f.users.designer, 'design', designId).summary).toMatchObject({ from: 'team', to: 'private' });

    // a PATCH that changes nothing audits nothing
    expect((await call(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as: f.users.designer, body: { visibility: 'private' } })).status).toBe(200);
    expect(await newRows()).toEqual([]);
    await call(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as: f.users.designer, body: { visibility: 'team' } });
    await newRows();

    expect((await call(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as: f.users.owner, body: { archived: true } })).status).toBe(200);
    expectOne(await newRows(), 'design.archived', f.users.owner, 'design', designId);
    expect((await call(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as: f.users.owner, body: { archived: false } })).status).toBe(200);
    expectOne(await newRows(), 'design.restored', f.users.owner, 'design', designId);

    // a refused change (a reviewer may not rename) writes nothing
    expect((await call(design.PATCH, `/api/designs/${designId}`, { method: 'PATCH', params: { designId }, as: f.users.reviewer, body: { title: 'Nope' } })).status).toBe(403);
    expect(await newRows()).toEqual([]);

    const forked = await call<{ design: { id: string } }>(forkRoute.POST, `/api/designs/${designId}/fork`, { method: 'POST', params: { designId }, as: f.users.owner, body: {} });
    expect(forked.status).toBe(201);
    const fr = expectOne(await newRows(), 'design.forked', f.users.owner, 'design', forked.body.design.id);
    expect(fr.summary).toMatchObject({ fromDesignId: designId, fromRevision: 2 });
  });

  it('review requested, approved, changes requested', async () => {
    const designId = await createDesign(f.users.designer, 'Reviewed ladder');
    await newRows();
    const asked = await call<{ review: { id: string } }>(reviews.POST, `/api/designs/${designId}/reviews`, { method: 'POST', params: { designId }, as: f.users.designer, body: { revision: 1, reviewerIds: [f.users.reviewer.id] } });
    expect(asked.status).toBe(201);
    expectOne(await newRows(), 'review.requested', f.users.designer, 'review', asked.body.review.id);
    const approved = await call(decision.POST, `/api/designs/${designId}/reviews/${asked.body.review.id}/decision`, {
      method: 'POST',
      params: { designId, reviewId: asked.body.review.id },
      as: f.users.reviewer,
      body: { decision: 'approve' },
    });
    expect(approved.status).toBe(200);
    expectOne(await newRows(), 'review.approved', f.users.reviewer, 'review', asked.body.review.id);

    const again = await call<{ review: { id: string } }>(reviews.POST, `/api/designs/${designId}/reviews`, { method: 'POST', params: { designId }, as: f.users.designer, body: { revision: 1, reviewerIds: [f.users.owner.id] } });
    await newRows();
    const changes = await call(decision.POST, `/api/designs/${designId}/reviews/${again.body.review.id}/decision`, {
      method: 'POST',
      params: { designId, reviewId: again.body.review.id },
      as: f.users.owner,
      body: { decision: 'request_changes', note: 'derate C3' },
    });
    expect(changes.status).toBe(200);
    expectOne(await newRows(), 'review.changes_requested', f.users.owner, 'review', again.body.review.id);
  });

  it('member role changed, member removed, invitation sent, member joined', async () => {
    const extra = await makeUser('Audited');
    await addMember(f.teamId, extra.id, 'viewer');
    await newRows();
    expect((await call(member.PATCH, `/api/teams/${f.teamId}/members/${extra.id}`, { method: 'PATCH', params: { teamId: f.teamId, userId: extra.id }, as: f.users.owner, body: { role: 'designer' } })).status).toBe(200);
    expect(expectOne(await newRows(), 'member.role_changed', f.users.owner, 'member', extra.id).summary).toMatchObject({ from: 'viewer', to: 'designer' });
    expect((await call(member.DELETE, `/api/teams/${f.teamId}/members/${extra.id}`, { method: 'DELETE', params: { teamId: f.teamId, userId: extra.id }, as: f.users.owner })).status).toBe(200);
    expectOne(await newRows(), 'member.removed', f.users.owner, 'member', extra.id);

    const invitee = await makeUser('Invitee', freshEmail('invitee'));
    const sent = await call<{ invitation: { id: string } }>(invitations.POST, `/api/teams/${f.teamId}/invitations`, { method: 'POST', params: { teamId: f.teamId }, as: f.users.owner, body: { email: invitee.email, role: 'reviewer' } });
    expect(sent.status).toBe(201);
    const row = expectOne(await newRows(), 'invitation.sent', f.users.owner, 'invitation', sent.body.invitation.id);
    expect(row.summary).toEqual({ email: invitee.email, role: 'reviewer' });
    // the token is only in the mail; accept with one minted directly (its hash is what is stored)
    const token = `audit${Date.now().toString(36)}xxxxxxxxxxxxxxxxxxxx`;
    const { hashInvitationToken } = await import('@/lib/data/invitations');
    await db().models.Invitation.update({ tokenHash: hashInvitationToken(token) }, { where: { id: sent.body.invitation.id } });
    expect((await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token }, as: invitee })).status).toBe(200);
    expectOne(await newRows(), 'member.joined', invitee, 'member', invitee.id);
  });

  it('offer accepted', async () => {
    const parentId = await createDesign(f.users.owner, 'Parent ladder');
    const fork = await call<{ design: { id: string } }>(forkRoute.POST, `/api/designs/${parentId}/fork`, { method: 'POST', params: { designId: parentId }, as: f.users.designer, body: {} });
    const o = await call<{ offer: { id: string } }>(offers.POST, `/api/designs/${fork.body.design.id}/offers`, { method: 'POST', params: { designId: fork.body.design.id }, as: f.users.designer, body: { message: 'try this' } });
    expect(o.status).toBe(201);
    await newRows();
    const res = await call(offerDecision.POST, `/api/offers/${o.body.offer.id}/decision`, { method: 'POST', params: { offerId: o.body.offer.id }, as: f.users.owner, body: { decision: 'accept', parentBaseRevision: 1 } });
    expect(res.status).toBe(200);
    expect(expectOne(await newRows(), 'offer.accepted', f.users.owner, 'offer', o.body.offer.id).summary).toMatchObject({ designId: parentId, resultingRevision: 2 });
  });
});

describe('a rolled-back action leaves no audit row', () => {
  it('an approval whose transaction fails after the audit insert writes neither approval nor audit row', async () => {
    const designId = await createDesign(f.users.designer, 'Doomed approval');
    const asked = await call<{ review: { id: string } }>(reviews.POST, `/api/designs/${designId}/reviews`, { method: 'POST', params: { designId }, as: f.users.designer, body: { revision: 1, reviewerIds: [f.users.reviewer.id] } });
    await newRows();
    // the feed insert comes after the audit insert in the same transaction: make it fail
    await db().sequelize.query(`
      CREATE FUNCTION fail_decided() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RAISE EXCEPTION 'injected failure'; END $$;
      CREATE TRIGGER fail_decided BEFORE INSERT ON activity_events FOR EACH ROW WHEN (NEW.kind = 'review_decided') EXECUTE FUNCTION fail_decided();`);
    const spy = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    try {
      const res = await call(decision.POST, `/api/designs/${designId}/reviews/${asked.body.review.id}/decision`, {
        method: 'POST',
        params: { designId, reviewId: asked.body.review.id },
        as: f.users.reviewer,
        body: { decision: 'approve' },
      });
      expect(res.status).toBe(500);
    } finally {
      spy.mockRestore();
      await db().sequelize.query('DROP TRIGGER fail_decided ON activity_events; DROP FUNCTION fail_decided();');
    }
    expect(await newRows()).toEqual([]);
    expect(await db().models.Approval.count({ where: { designId } })).toBe(0);
  });
});

describe('GET /api/teams/:teamId/audit', () => {
  it('owners read the log newest first, in pages; others are refused', async () => {
    const all: AuditEventDto[] = [];
    let before: string | null = null;
    for (let page = 0; page < 50; page++) {
      const res: { status: number; body: { events: AuditEventDto[]; nextBefore: string | null } } = await call(audit.GET, `/api/teams/${f.teamId}/audit`, {
        params: { teamId: f.teamId },
        as: f.users.owner,
        query: before ? { limit: '3', before } : { limit: '3' },
      });
      expect(res.status).toBe(200);
      expect(res.body.events.length).toBeLessThanOrEqual(3);
      all.push(...res.body.events);
      before = res.body.nextBefore;
      if (!before) break;
    }
    const [[{ n }]] = (await db().sequelize.query('SELECT count(*)::int AS n FROM audit_events WHERE team_id = :t', { replacements: { t: f.teamId } })) as [[{ n: number }], unknown];
    expect(all.length).toBe(n);
    const ids = all.map((e) => BigInt(e.id));
    expect(ids).toEqual([...ids].sort((a, b) => (a > b ? -1 : a < b ? 1 : 0)));
    expect(all.find((e) => e.action === 'design.created')?.actor.name).toBeTruthy();

    const filtered = await call<{ events: AuditEventDto[] }>(audit.GET, `/api/teams/${f.teamId}/audit`, { params: { teamId: f.teamId }, as: f.users.owner, query: { action: 'review' } });
    expect(filtered.body.events.length).toBeGreaterThan(0);
    expect(filtered.body.events.every((e) => e.action.startsWith('review.'))).toBe(true);

    for (const who of ['designer', 'reviewer', 'viewer'] as const) {
      const res = await call<{ error: { code: string } }>(audit.GET, `/api/teams/${f.teamId}/audit`, { params: { teamId: f.teamId }, as: f.users[who] });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
    expect((await call(audit.GET, `/api/teams/${f.teamId}/audit`, { params: { teamId: f.teamId }, as: f.users.outsider })).status).toBe(404);
    expect((await call(audit.GET, `/api/teams/${f.teamId}/audit`, { params: { teamId: f.teamId } })).status).toBe(401);
    expect((await call(audit.GET, `/api/teams/${f.teamId}/audit`, { params: { teamId: f.teamId }, as: f.users.owner, query: { before: '-1' } })).status).toBe(422);
  });
});

describe('the audit table is append-only', () => {
  it('refuses UPDATE, DELETE and TRUNCATE', async () => {
    const [[row]] = (await db().sequelize.query('SELECT id FROM audit_events LIMIT 1')) as [[{ id: string }], unknown];
    expect(row).toBeDefined();
    await expect(db().sequelize.query(`UPDATE audit_events SET action = 'design.deleted' WHERE id = :id`, { replacements: { id: row.id } })).rejects.toThrow(/never changed or removed/);
    await expect(db().sequelize.query('DELETE FROM audit_events WHERE id = :id', { replacements: { id: row.id } })).rejects.toThrow(/never changed or removed/);
    await expect(db().sequelize.query('TRUNCATE audit_events')).rejects.toThrow(/never changed or removed/);
    const [[still]] = (await db().sequelize.query('SELECT action FROM audit_events WHERE id = :id', { replacements: { id: row.id } })) as [[{ action: string }], unknown];
    expect(still.action).not.toBe('design.deleted');
  });
});
