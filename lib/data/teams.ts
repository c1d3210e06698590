/**
 * Teams and members. Any member reads the team and its members; only owners change roles and
 * remove others; anyone may leave. A team always keeps at least one owner (409 `last_owner`),
 * checked under a row lock on the team's owner memberships so two demotions cannot race past it.
 */
import 'server-only';
import { fn, col, type Transaction } from 'sequelize';
import type { MemberDto, Role, TeamDto } from '../api/contract';
import { db } from '../db';
import { AppError, notFound } from '../errors';
import { loadCaller, requireMember, requireRole } from './access';
import { recordAudit } from './audit';
import { memberDto } from './dto';

async function memberCounts(teamIds: string[]): Promise<Map<string, number>> {
  if (teamIds.length === 0) return new Map();
  const rows = (await db().models.Membership.findAll({
    where: { teamId: teamIds },
    attributes: ['teamId', [fn('COUNT', col('id')), 'count']],
    group: ['teamId'],
    raw: true,
  })) as unknown as { teamId: string; count: string }[];
  return new Map(rows.map((r) => [r.teamId, Number(r.count)]));
}

/** The caller's teams, by name. */
export async function listTeams(userId: string): Promise<TeamDto[]> {
  const { Membership, Team } = db().models;
  const rows = await Membership.findAll({ where: { userId }, include: [{ model: Team, as: 'team' }] });
  const counts = await memberCounts(rows.map((m) => m.teamId));
  return rows
    .filter((m) => m.team)
    .map((m) => ({ id: m.teamId, name: m.team!.name, role: m.role, memberCount: counts.get(m.teamId) ?? 1 }))
    .sort((a, b) => a.name.localeCompare(b.name));
}

/** Create a team with the caller as its owner. */
export async function createTeam(userId: string, name: string): Promise<TeamDto> {
  const { sequelize, models } = db();
  const team = await sequelize.transaction(async (transaction) => {
    const t = await models.Team.create({ name }, { transaction });
    await models.Membership.create({ teamId: t.id, userId, role: 'owner' }, { transaction });
    return t;
  });
  return { id: team.id, name: team.name, role: 'owner', memberCount: 1 };
}

/** One team as the caller sees it (404 for outsiders). */
export async function getTeam(userId: string, teamId: string): Promise<TeamDto> {
  const caller = await loadCaller(userId);
  const role = requireMember(caller, teamId);
  const team = await db().models.Team.findByPk(teamId);
  if (!team) throw notFound('team');
  const counts = await memberCounts([teamId]);
  return { id: team.id, name: team.name, role, memberCount: counts.get(teamId) ?? 1 };
}

/** The team's members (any member may read them). */
export async function listMembers(userId: string, teamId: string): Promise<MemberDto[]> {
  requireMember(await loadCaller(userId), teamId);
  const { Membership, User } = db().models;
  const rows = await Membership.findAll({ where: { teamId }, include: [{ model: User, as: 'user' }], order: [['createdAt', 'ASC']] });
  return rows.map(memberDto);
}

async function lockOwners(teamId: string, transaction: Transaction): Promise<string[]> {
  // a fixed lock order, so two concurrent role changes queue instead of deadlocking
  const rows = await db().models.Membership.findAll({ where: { teamId, role: 'owner' }, order: [['userId', 'ASC']], lock: transaction.LOCK.UPDATE, transaction });
  return rows.map((m) => m.userId);
}

/** Change a member's role (owner only; the last owner cannot be demoted). */
export async function changeMemberRole(userId: string, teamId: string, memberId: string, role: Role): Promise<MemberDto> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    // lock first, then read the caller's role: a concurrent demotion of the caller is then seen
    const owners = await lockOwners(teamId, transaction);
    requireRole(await loadCaller(userId, transaction), teamId, ['owner']);
    const member = await models.Membership.findOne({ where: { teamId, userId: memberId }, include: [{ model: models.User, as: 'user' }], transaction });
    if (!member) throw notFound('member');
    if (member.role === 'owner' && role !== 'owner' && owners.length <= 1) {
      throw new AppError('last_owner', 'a team needs at least one owner; make someone else owner first');
    }
    const from = member.role;
    member.role = role;
    await member.save({ transaction });
    if (from !== role) await recordAudit({ teamId, actorId: userId, action: 'member.role_changed', targetType: 'member', targetId: memberId, summary: { from, to: role } }, transaction);
    return memberDto(member);
  });
}

/**
 * Remove a member. Owners may remove anyone; every member may remove themselves (leave). The
 * last owner can neither leave nor be removed.
 */
export async function removeMember(userId: string, teamId: string, memberId: string): Promise<void> {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const owners = await lockOwners(teamId, transaction);
    const caller = await loadCaller(userId, transaction);
    if (memberId === userId) requireMember(caller, teamId);
    else requireRole(caller, teamId, ['owner']);
    const member = await models.Membership.findOne({ where: { teamId, userId: memberId }, transaction });
    if (!member) throw notFound('member');
    if (member.role === 'owner' && owners.length <= 1) {
      throw new AppError('last_owner', 'the last owner cannot leave; make someone else owner first');
    }
    await member.destroy({ transaction });
    await recordAudit({ teamId, actorId: userId, action: 'member.removed', targetType: 'member', targetId: memberId, summary: { role: member.role, left: memberId === userId } }, transaction);
  });
}
