/**
 * Who is calling. Route handlers use `requireUser(req)` / `optionalUser(req)` (next-auth's
 * getToken on the request's session cookie); server components use `getSessionUser()`. Both
 * confirm the user still exists in the database; roles are checked by lib/data.
 */
import 'server-only';
import type { NextRequest } from 'next/server';
import { getToken } from 'next-auth/jwt';
import { getServerSession } from 'next-auth';
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
  if (!id || !UUID_RE.test(id)) return null;
  const user = await db().models.User.findByPk(id);
  return user ? { id: user.id, name: user.name ?? '', email: user.email } : null;
}

/** The signed-in caller of a route handler, or null. */
export async function optionalUser(req: NextRequest): Promise<SessionUser | null> {
  const token = await getToken({ req, secret: env().NEXTAUTH_SECRET });
  return loadUser(token?.sub);
}

/** The signed-in caller of a route handler; throws 401 when there is none. */
export async function requireUser(req: NextRequest): Promise<SessionUser> {
  const user = await optionalUser(req);
  if (!user) throw unauthenticated();
  return user;
}

/** The signed-in user for a server component (page/layout), or null. */
export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await getServerSession(authOptions);
  return loadUser(session?.user?.id);
}
