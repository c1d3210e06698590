/**
 * Shared pieces of the route × role matrix (tests/routes/permissions.test.ts). Each feature keeps
 * its own case list in this folder (parts.ts, exports.ts, bench.ts, analyses.ts) and the matrix
 * runs them all; the coverage check fails if any route handler under app/api is in none.
 */
import { createDesign } from '@/lib/data/designs';
import { sampleDocument, type AnyHandler, type Fixtures, type Who } from '../helpers';

export type Caller = Who | 'signedOut';
export const CALLERS: Caller[] = ['owner', 'designer', 'reviewer', 'viewer', 'outsider', 'signedOut'];

export interface Prepared {
  path: string;
  params: Record<string, string>;
  /** JSON body, or a FormData / string sent as is (with `contentType`). */
  body?: unknown;
  contentType?: string;
}

export interface Case {
  name: string;
  handler: AnyHandler;
  method: string;
  /** Expected status for owner, designer, reviewer, viewer, outsider, signed out. */
  expect: [number, number, number, number, number, number];
  prepare: (f: Fixtures) => Promise<Prepared>;
}

export const ALL_OK = (s: number): Case['expect'] => [s, s, s, s, s, 401];
export const MEMBERS_READ: Case['expect'] = [200, 200, 200, 200, 404, 401];
export const OWNER_ONLY = (s: number): Case['expect'] => [s, 403, 403, 403, 404, 401];
export const WRITERS = (s: number): Case['expect'] => [s, s, 403, 403, 404, 401];

/** A fresh design in the fixture team. */
export async function newDesignFor(f: Fixtures, author: Who = 'designer', visibility: 'team' | 'private' = 'team'): Promise<string> {
  const { design: d } = await createDesign(f.users[author].id, f.teamId, { title: `Case design ${Math.random().toString(36).slice(2, 7)}`, visibility, document: sampleDocument() });
  return d.id;
}
