/**
 * Authorisation, read from the database on every call: which teams the caller belongs to and
 * with which role. Outsiders get 404 (existence must not leak); members whose role does not
 * allow an action get 403.
 */
import 'server-only';
import type { Transaction } from 'sequelize';
import type { Role } from '../api/contract';
import { db } from '../db';
import { forbidden, notFound } from '../errors';

/** The caller and their roles, by team id, as stored right now. */
export interface Caller {
  userId: string;
  roles: Map<string, Role>;
}

/** Load the caller's memberships. */
export async function loadCaller(userId: string, transaction?: Transaction): Promise<Caller> {
  const rows = await db().models.Membership.findAll({ where: { userId }, attributes: ['teamId', 'role'], transaction });
  return { userId, roles: new Map(rows.map((m) => [m.teamId, m.role])) };
}

/** Roles that may create and change designs. */
export const WRITER_ROLES: readonly Role[] = ['owner', 'designer'];

/** True when `role` may create designs, save revisions and fork. */
export function canWrite(role: Role | undefined): boolean {
  return role !== undefined && WRITER_ROLES.includes(role);
}

/** The caller's role in `teamId`; 404 when they are not a member. */
export function requireMember(caller: Caller, teamId: string, what = 'team'): Role {
  const role = caller.roles.get(teamId);
  if (!role) throw notFound(what);
  return role;
}

/** The caller's role in `teamId` if it is one of `allowed`; 404 for outsiders, 403 otherwise. */
export function requireRole(caller: Caller, teamId: string, allowed: readonly Role[], what = 'team'): Role {
  const role = requireMember(caller, teamId, what);
  if (!allowed.includes(role)) throw forbidden(`a ${role} cannot do this; it needs ${allowed.join(' or ')}`);
  return role;
}
