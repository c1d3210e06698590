/**
 * Authorisation, read from the database for every request: which teams the caller belongs to and
 * with which role. Outsiders get 404 (existence must not leak); members whose role does not
 * allow an action get 403.
 */
import 'server-only';
import { AsyncLocalStorage } from 'node:async_hooks';
import type { Transaction } from 'sequelize';
import type { Role } from '../api/contract';
import { db } from '../db';
import { forbidden, notFound } from '../errors';

/** The caller and their roles, by team id, as stored right now. */
export interface Caller {
  userId: string;
  roles: Map<string, Role>;
}

const preloaded = new AsyncLocalStorage<{ caller: Caller | null }>();

/**
 * Run `fn` (one API request) with the caller's roles as the route wrapper read them, in the same
 * query as the session's user (lib/auth/session.ts): the first {@link loadCaller} of the request
 * takes them instead of asking the database again. Only the first: any later call, or one inside
 * a transaction, reads the memberships anew, so a request that changes a membership and then looks
 * again sees the change.
 */
export function withPreloadedCaller<T>(caller: Caller, fn: () => Promise<T>): Promise<T> {
  return preloaded.run({ caller }, fn);
}

/** Load the caller's memberships (see {@link withPreloadedCaller} for the one read a request saves). */
export async function loadCaller(userId: string, transaction?: Transaction): Promise<Caller> {
  const slot = transaction ? undefined : preloaded.getStore();
  if (slot?.caller && slot.caller.userId === userId) {
    const caller = slot.caller;
    slot.caller = null;
    return caller;
  }
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
