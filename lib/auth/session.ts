/**
 * Who is calling. Route handlers use `requireUser(req)` / `optionalUser(req)` (next-auth's
 * getToken on the request's session cookie); server components use `getSessionUser()`. Both
 * confirm the user still exists in the database; roles are checked by lib/data.
 */
import 'server-only';
import type { NextRequest } from 'next/server';
import { getToken } from 'next-auth/jwt';
import { getServerSession } from 'next-auth';
import { QueryTypes } from 'sequelize';
import type { Role } from '../api/contract';
import type { Caller } from '../data/access';
import { db } from '../db';
import { env } from '../env';
import { unauthenticated } from '../errors';
import { authOptions } from './options';

/** The caller, as stored. */
export interface SessionUser {
  id: string;
  name: string;
  email: string;
}

const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

async function loadUser(id: string | undefined | null): Promise<SessionUser | null> {
  return (await loadUserAndRoles(id))?.user ?? null;
}

/** The user and their memberships in one round trip (a request's first authorisation needs both). */
async function loadUserAndRoles(id: string | undefined | null): Promise<{ user: SessionUser; caller: Caller } | null> {
  if (!id || !UUID_RE.test(id)) return null;
  const rows = await db().sequelize.query<{ id: string; name: string | null; email: string; team_id: string | null; role: Role | null }>(
    'SELECT u.id, u.name, u.email, m.team_id, m.role FROM users u LEFT JOIN memberships m ON m.user_id = u.id WHERE u.id = :id',
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  if (rows.length === 0) return null;
  const roles = new Map<string, Role>();
  for (const r of rows) if (r.team_id && r.role) roles.set(r.team_id, r.role);
  return { user: { id: rows[0].id, name: rows[0].name ?? '', email: rows[0].email }, caller: { userId: rows[0].id, roles } };
}

/** The signed-in caller of a route handler, or null. */
export async function optionalUser(req: NextRequest): Promise<SessionUser | null> {
  return (await optionalCaller(req))?.user ?? null;
}

/** The signed-in caller of a route handler with their roles as stored now, or null. */
export async function optionalCaller(req: NextRequest): Promise<{ user: SessionUser; caller: Caller } | null> {
  const token = await getToken({ req, secret: env().NEXTAUTH_SECRET });
  return loadUserAndRoles(token?.sub);
}

/** The signed-in caller of a route handler; throws 401 when there is none. */
export async function requireUser(req: NextRequest): Promise<SessionUser> {
  return (await requireCaller(req)).user;
}

/** The signed-in caller with their roles (the route wrapper hands these to lib/data/access.ts); 401 when there is none. */
export async function requireCaller(req: NextRequest): Promise<{ user: SessionUser; caller: Caller }> {
  const who = await optionalCaller(req);
  if (!who) throw unauthenticated();
  return who;
}

/** The signed-in user for a server component (page/layout), or null. */
export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await getServerSession(authOptions);
  return loadUser(session?.user?.id);
}
