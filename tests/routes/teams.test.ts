/**
 * Teams, members and invitations against the real database and the local mail catcher: the
 * invite mail carries a working accept link, acceptance checks the address, expired and used
 * tokens are refused, and a team never loses its last owner.
 */
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as teams from '@/app/api/teams/route';
import * as team from '@/app/api/teams/[teamId]/route';
import * as members from '@/app/api/teams/[teamId]/members/route';
import * as member from '@/app/api/teams/[teamId]/members/[userId]/route';
import * as invitations from '@/app/api/teams/[teamId]/invitations/route';
import * as invitation from '@/app/api/teams/[teamId]/invitations/[invitationId]/route';
import * as preview from '@/app/api/invitations/[token]/route';
import * as accept from '@/app/api/invitations/[token]/accept/route';
import type { InvitationDto, InvitationPreviewDto, MemberDto, TeamDto } from '@/lib/api/contract';
import { db } from '@/lib/db';
import { hashInvitationToken } from '@/lib/data/invitations';
import { addMember, call, freshEmail, mailFor, makeUser, setupFixtures, teardown, type Fixtures, type FixtureUser } from './helpers';

let f: Fixtures;

beforeAll(async () => {
  f = await setupFixtures();
});
afterAll(teardown);

async function invite(email: string, role = 'designer') {
  return call<{ invitation: InvitationDto }>(invitations.POST, `/api/teams/${f.teamId}/invitations`, { method: 'POST', params: { teamId: f.teamId }, as: f.users.owner, body: { email, role } });
}

async function tokenFromMail(email: string): Promise<string> {
  for (let attempt = 0; attempt < 20; attempt++) {
    const mails = await mailFor(email);
    const m = mails[0]?.text.match(/\/invitations\/([A-Za-z0-9_-]+)/);
    if (m) return m[1];
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no invitation mail for ${email} in the catcher`);
}

describe('invitations', () => {
  it('invite → mail with accept link → preview → wrong address 403 → accept → used 409', async () => {
    const email = freshEmail('colleague');
    const created = await invite(email.toUpperCase());
    expect(created.status).toBe(201);
    expect(created.body.invitation).toMatchObject({ email, role: 'designer', invitedBy: 'Owner', acceptedAt: null });
    const mail = (await mailFor(email))[0];
    expect(mail.subject).toContain('Fixture Team');
    const token = await tokenFromMail(email);
    expect(mail.text).toContain(`${process.env.NEXTAUTH_URL}/invitations/${token}`);
    // only the hash is stored
    const row = await db().models.Invitation.findByPk(created.body.invitation.id);
    expect(row?.tokenHash).toBe(hashInvitationToken(token));
    expect(JSON.stringify(row?.get())).not.toContain(token);

    const p = await call<{ invitation: InvitationPreviewDto }>(preview.GET, `/api/invitations/${token}`, { params: { token } });
    expect(p.status).toBe(200);
    expect(p.body.invitation).toMatchObject({ teamId: f.teamId, teamName: 'Fixture Team', email, role: 'designer', accepted: false });

    const invitee = await makeUser('Colleague', email);
    expect((await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token }, as: f.users.outsider })).status).toBe(403);
    expect((await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token } })).status).toBe(401);
    const ok = await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token }, as: invitee });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ teamId: f.teamId, role: 'designer' });
    const t = await call<{ team: TeamDto }>(team.GET, `/api/teams/${f.teamId}`, { params: { teamId: f.teamId }, as: invitee });
    expect(t.body.team.role).toBe('designer');

    const again = await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token }, as: invitee });
    expect(again.status).toBe(409);
    const after = await call<{ invitation: InvitationPreviewDto }>(preview.GET, `/api/invitations/${token}`, { params: { token } });
    expect(after.body.invitation.accepted).toBe(true);
    expect(await db().models.Membership.count({ where: { teamId: f.teamId, userId: invitee.id } })).toBe(1);
  });

  it('an expired invitation answers 410 and adds nobody', async () => {
    const email = freshEmail('late');
    const created = await invite(email, 'viewer');
    const token = await tokenFromMail(email);
    await db().models.Invitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: created.body.invitation.id } });
    const late = await makeUser('Late', email);
    expect((await call(preview.GET, `/api/invitations/${token}`, { params: { token } })).status).toBe(410);
    const res = await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token }, as: late });
    expect(res.status).toBe(410);
    expect(await db().models.Membership.count({ where: { userId: late.id } })).toBe(0);
  });

  it('unknown and malformed tokens answer 404; inviting a member answers 409', async () => {
    for (const token of ['a'.repeat(43), 'short', '../../etc']) {
      expect((await call(preview.GET, `/api/invitations/${token}`, { params: { token } })).status).toBe(404);
      expect((await call(accept.POST, `/api/invitations/${token}/accept`, { method: 'POST', params: { token }, as: f.users.viewer })).status).toBe(404);
    }
    const dup = await invite(f.users.viewer.email);
    expect(dup.status).toBe(409);
    expect((dup.body as unknown as { error: { code: string } }).error.code).toBe('exists');
    const bad = await invite('not-an-address');
    expect(bad.status).toBe(422);
    expect((bad.body as unknown as { error: { field: string } }).error.field).toBe('email');
  });

  it('owner lists and revokes; a revoked link stops working', async () => {
    const email = freshEmail('revoked');
    const created = await invite(email, 'reviewer');
    const token = await tokenFromMail(email);
    const list = await call<{ invitations: InvitationDto[] }>(invitations.GET, `/api/teams/${f.teamId}/invitations`, { params: { teamId: f.teamId }, as: f.users.owner });
    expect(list.body.invitations.map((i) => i.id)).toContain(created.body.invitation.id);
    const id = created.body.invitation.id;
    expect((await call(invitation.DELETE, `/api/teams/${f.teamId}/invitations/${id}`, { method: 'DELETE', params: { teamId: f.teamId, invitationId: id }, as: f.users.owner })).status).toBe(200);
    expect((await call(preview.GET, `/api/invitations/${token}`, { params: { token } })).status).toBe(404);
    expect((await call(invitation.DELETE, `/api/teams/${f.teamId}/invitations/${id}`, { method: 'DELETE', params: { teamId: f.teamId, invitationId: id }, as: f.users.owner })).status).toBe(404);
  });
});

describe('teams and members', () => {
  async function newTeam(owner: FixtureUser): Promise<string> {
    const res = await call<{ team: TeamDto }>(teams.POST, '/api/teams', { method: 'POST', as: owner, body: { name: '  Night shift  ' } });
    expect(res.status).toBe(201);
    expect(res.body.team).toMatchObject({ name: 'Night shift', role: 'owner', memberCount: 1 });
    return res.body.team.id;
  }

  it('the last owner can neither leave nor be demoted; after handing over they can leave', async () => {
    const founder = await makeUser('Founder');
    const teamId = await newTeam(founder);
    const helper = await makeUser('Helper');
    await addMember(teamId, helper.id, 'designer');
    const del = (as: FixtureUser, userId: string) => call(member.DELETE, `/api/teams/${teamId}/members/${userId}`, { method: 'DELETE', params: { teamId, userId }, as });
    const patch = (as: FixtureUser, userId: string, role: string) =>
      call<{ member: MemberDto }>(member.PATCH, `/api/teams/${teamId}/members/${userId}`, { method: 'PATCH', params: { teamId, userId }, as, body: { role } });

    const leave = await del(founder, founder.id);
    expect(leave.status).toBe(409);
    expect((leave.body as { error: { code: string } }).error.code).toBe('last_owner');
    expect((await patch(founder, founder.id, 'designer')).status).toBe(409);
    expect((await del(helper, founder.id)).status).toBe(403);

    const promoted = await patch(founder, helper.id, 'owner');
    expect(promoted.status).toBe(200);
    expect(promoted.body.member).toMatchObject({ userId: helper.id, role: 'owner' });
    expect((await del(founder, founder.id)).status).toBe(200);
    expect((await call(team.GET, `/api/teams/${teamId}`, { params: { teamId }, as: founder })).status).toBe(404);
    const left = await call<{ members: MemberDto[] }>(members.GET, `/api/teams/${teamId}/members`, { params: { teamId }, as: helper });
    expect(left.body.members.map((m) => [m.userId, m.role])).toEqual([[helper.id, 'owner']]);
  });

  it('two owners demoting each other at once leave one owner', async () => {
    const a = await makeUser('Anna');
    const teamId = await newTeam(a);
    const b = await makeUser('Bo');
    await addMember(teamId, b.id, 'owner');
    const results = await Promise.all([
      call(member.PATCH, `/api/teams/${teamId}/members/${a.id}`, { method: 'PATCH', params: { teamId, userId: a.id }, as: b, body: { role: 'viewer' } }),
      call(member.PATCH, `/api/teams/${teamId}/members/${b.id}`, { method: 'PATCH', params: { teamId, userId: b.id }, as: a, body: { role: 'viewer' } }),
    ]);
    expect(await db().models.Membership.count({ where: { teamId, role: 'owner' } })).toBe(1);
    // the second waits for the first's lock, then finds its caller no longer an owner
    expect(results.map((r) => r.status).sort()).toEqual([200, 403]);
  });

  it('any member may leave; unknown members answer 404; bad roles 422', async () => {
    const leaver = await makeUser('Leaver');
    await addMember(f.teamId, leaver.id, 'viewer');
    const ghost = randomUUID();
    expect((await call(member.PATCH, `/api/teams/${f.teamId}/members/${ghost}`, { method: 'PATCH', params: { teamId: f.teamId, userId: ghost }, as: f.users.owner, body: { role: 'viewer' } })).status).toBe(404);
    const bad = await call(member.PATCH, `/api/teams/${f.teamId}/members/${leaver.id}`, { method: 'PATCH', params: { teamId: f.teamId, userId: leaver.id }, as: f.users.owner, body: { role: 'admin' } });
    expect(bad.status).toBe(422);
    expect((await call(member.DELETE, `/api/teams/${f.teamId}/members/${leaver.id}`, { method: 'DELETE', params: { teamId: f.teamId, userId: leaver.id }, as: leaver })).status).toBe(200);
    expect(await db().models.Membership.count({ where: { userId: leaver.id } })).toBe(0);
  });

  it('lists my teams with role and member count; a blank name is refused', async () => {
    const list = await call<{ teams: TeamDto[] }>(teams.GET, '/api/teams', { as: f.users.reviewer });
    expect(list.body.teams).toContainEqual(expect.objectContaining({ id: f.teamId, name: 'Fixture Team', role: 'reviewer' }));
    expect(list.body.teams.find((t) => t.id === f.teamId)!.memberCount).toBeGreaterThanOrEqual(4);
    const blank = await call(teams.POST, '/api/teams', { method: 'POST', as: f.users.reviewer, body: { name: '   ' } });
    expect(blank.status).toBe(422);
    expect((blank.body as { error: { field: string } }).error.field).toBe('name');
  });
});
