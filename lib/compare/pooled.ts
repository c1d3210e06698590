/**
 * The server's comparison: both sides solved in the solve pool (lib/solve-pool), off the
 * request thread, each within the engine's budget and the pool's hard cut-off. Not re-exported
 * from ./index.ts: it starts worker threads, which only the server may do.
 */
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { cutOffFor, runSolve } from '../solve-pool';
import { COMPARE_SOLVE_BUDGET_MS, type DesignResults } from './results';
import { buildComparison, type CompareRelation, type CompareSideInput, type ComparisonView } from './view';

/** One side's five figures, solved in the pool; a cut-off or a busy pool is the side's reason. */
export async function pooledResultsOf(doc: DesignDocument, budgetMs = COMPARE_SOLVE_BUDGET_MS): Promise<DesignResults> {
  const r = await runSolve('resultsOf', [doc, budgetMs], { timeoutMs: cutOffFor(budgetMs) });
  return r.ok ? r.value : { ok: false, reason: r.reason };
}

/** {@link buildComparison} with both sides solved in the pool. */
export async function solveComparison(a: CompareSideInput, b: CompareSideInput, relation: CompareRelation): Promise<ComparisonView> {
  const [ra, rb] = await Promise.all([pooledResultsOf(a.document), pooledResultsOf(b.document)]);
  return buildComparison(a, b, relation, { a: ra, b: rb });
}
