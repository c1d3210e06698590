import 'server-only';
import { solveComparison } from '@/lib/compare/pooled';
import { defaultRevisions, type CompareRelation, type CompareSideInput, type ComparisonView } from '@/lib/compare';
import { getDesign, getRevision, listRevisions } from '@/lib/data/designs';
import type { DesignDetailDto } from '@/lib/api/contract';
import { notFound } from '@/lib/errors';

/** Design ids are UUIDs; anything else is not found (as the API routes answer, lib/api/handler.ts). */
const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The compare page's address parameters (each the first value when repeated). */
export interface CompareQuery {
  a?: string;
  b?: string;
  bDesign?: string;
  offer?: string;
}

async function side(userId: string, design: DesignDetailDto, number: string): Promise<CompareSideInput> {
  const [revision, revisions] = await Promise.all([getRevision(userId, design.id, number), listRevisions(userId, design.id)]);
  return {
    designId: design.id,
    title: design.title,
    revision: revision.number,
    latestRevision: design.latestRevision,
    revisions: revisions.map((r) => ({ number: r.number, message: r.message, author: r.author.name || r.author.email, createdAt: r.createdAt })),
    document: revision.document,
  };
}

function relationOf(a: DesignDetailDto, b: DesignDetailDto): CompareRelation {
  if (a.id === b.id) return 'revisions';
  if (b.forkedFrom?.designId === a.id) return 'fork-of-a';
  if (a.forkedFrom?.designId === b.id) return 'parent-of-a';
  return 'designs';
}

/**
 * Load and compare two revisions for the signed-in user: side a is `designId` at `a`, side b is
 * `bDesign` (default the same design) at `b`. Every read goes through lib/data, so a design the
 * caller may not read, or a revision that does not exist, throws the app's not-found AppError.
 */
export async function loadComparison(userId: string, designId: string, q: CompareQuery): Promise<ComparisonView> {
  if (!UUID_RE.test(designId) || (q.bDesign !== undefined && !UUID_RE.test(q.bDesign))) throw notFound('design');
  const { design: da } = await getDesign(userId, designId);
  const db = q.bDesign && q.bDesign !== designId ? (await getDesign(userId, q.bDesign)).design : da;
  const wanted = defaultRevisions(q, da.latestRevision, db.latestRevision, da.id === db.id);
  const [a, b] = await Promise.all([side(userId, da, wanted.a), side(userId, db, wanted.b)]);
  return solveComparison(a, b, relationOf(da, db));
}
