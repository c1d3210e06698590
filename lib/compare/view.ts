/**
 * Everything the compare page shows, as one plain serialisable value built from the two sides'
 * documents: the change list, both sides' solved figures and the metric rows, and which blocks
 * each drawing highlights. The page loads the two revisions (with the caller's access checked
 * in lib/data) and hands them here; nothing here touches the database.
 */
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { diffDesigns, type ChangeKind, type DesignDiff } from './diff';
import { diffResults, resultsOf, type DesignResults, type MetricRow } from './results';

export { compareHref } from './href';

/** One revision in a picker. */
export interface RevisionOption {
  number: number;
  message: string;
  author: string;
  createdAt: string;
}

/** One side of the comparison as loaded: which design and revision, and its document. */
export interface CompareSideInput {
  designId: string;
  title: string;
  revision: number;
  latestRevision: number;
  revisions: RevisionOption[];
  document: DesignDocument;
}

/** One side as shown: the input plus its solved figures and the blocks to highlight on its drawing. */
export interface CompareSide extends CompareSideInput {
  results: DesignResults;
  /** blockId → how it differs, for this side's drawing (added ones only on b, removed only on a). */
  highlight: Record<string, ChangeKind>;
  /** Ids of this side's wires the other side does not have (a: removed wires, b: added wires). */
  wiresOnlyHere: string[];
}

/** How the two sides relate: two revisions of one design, or a fork and its parent. */
export type CompareRelation = 'revisions' | 'fork-of-a' | 'parent-of-a' | 'designs';

export interface ComparisonView {
  relation: CompareRelation;
  a: CompareSide;
  b: CompareSide;
  diff: DesignDiff;
  metrics: MetricRow[];
}

/** Blocks each drawing highlights: a shows removed and changed blocks, b added and changed. */
export function highlights(diff: DesignDiff): { a: Record<string, ChangeKind>; b: Record<string, ChangeKind> } {
  const a: Record<string, ChangeKind> = {};
  const b: Record<string, ChangeKind> = {};
  for (const c of diff.changes) {
    if (c.kind !== 'added') a[c.blockId] = c.kind;
    if (c.kind !== 'removed') b[c.blockId] = c.kind;
  }
  return { a, b };
}

/** A wire by its two ends, either way round (as lib/editor/compare.ts matches wires). */
function wireKey(w: DesignDocument['wires'][number]): string {
  const x = `${w.source}:${w.sourcePort}`;
  const y = `${w.target}:${w.targetPort}`;
  return x < y ? `${x}|${y}` : `${y}|${x}`;
}

/** Ids of the wires of `here` whose two ends are not joined by a wire in `there`. */
export function wiresOnlyIn(here: DesignDocument, there: DesignDocument): string[] {
  const keys = new Set(there.wires.map(wireKey));
  return here.wires.filter((w) => !keys.has(wireKey(w))).map((w) => w.id);
}

/**
 * Diff the two documents and solve both (each with the engine's wall-clock budget; a side that
 * does not compile or solve carries its reason). `relation` only words the header. `solved`: the
 * two sides' results when the caller solved them already (the server solves them in the solve
 * pool, lib/compare/pooled.ts); without it both are solved here, on the calling thread.
 */
export function buildComparison(a: CompareSideInput, b: CompareSideInput, relation: CompareRelation, solved?: { a: DesignResults; b: DesignResults }): ComparisonView {
  const diff = diffDesigns(a.document, b.document);
  const ra = solved ? solved.a : resultsOf(a.document);
  const rb = solved ? solved.b : resultsOf(b.document);
  const h = highlights(diff);
  return {
    relation,
    a: { ...a, results: ra, highlight: h.a, wiresOnlyHere: wiresOnlyIn(a.document, b.document) },
    b: { ...b, results: rb, highlight: h.b, wiresOnlyHere: wiresOnlyIn(b.document, a.document) },
    diff,
    metrics: diffResults(ra, rb),
  };
}

/** The header text: `r3 → r4` for revisions, `Parent r5 → Fork r2` with titles otherwise. */
export function comparisonTitle(view: Pick<ComparisonView, 'relation' | 'a' | 'b'>): string {
  if (view.relation === 'revisions') return `r${view.a.revision} → r${view.b.revision}`;
  return `${view.a.title} r${view.a.revision} → ${view.b.title} r${view.b.revision}`;
}

/**
 * Which revisions to compare when the address names none: two revisions of one design default
 * to the one before the latest and the latest (r1 → r1 when there is only one); a parent and a
 * fork default to both latest revisions. An address value must be a revision number (digits);
 * anything else is returned as is, so the loader answers it with not found.
 */
export function defaultRevisions(q: { a?: string; b?: string }, latestA: number, latestB: number, sameDesign: boolean): { a: string; b: string } {
  return {
    a: q.a ?? String(sameDesign ? Math.max(1, latestA - 1) : latestA),
    b: q.b ?? String(latestB),
  };
}
