/**
 * The solve behind the exports: the document's netlist as `npm run solve` reads it (the exported
 * text read back, `prepareNetlist`), its periodic steady state with one-period waveforms, and the
 * warm-up from power-on, within a wall-clock budget. A drawing that does not compile or a solve
 * that fails (or runs out of budget) is a reason, not an exception: the BOM then leaves out the
 * stress columns and the report says why it has no results.
 *
 * Part stress is judged with the editor's own rules (lib/editor/engine/view-model.ts
 * `partStress`) at the stricter of the design's and the team's derating (lib/parts/derating.ts).
 * Pure: runs in node (server, tests) or a worker.
 */
import { solveNetlist, type CompileResult, type DesignDocument, type SolveResult } from '../circuit';
import { prepareNetlist } from '../editor/engine/netlist-text';
import { partStress } from '../editor/engine/view-model';
import type { PartStress } from '../editor/types';

/** Wall-clock budget of an export's solve (ms), warm-up included. */
export const EXPORT_SOLVE_BUDGET_MS = 15_000;

/** Waveform points per node over one period (the report's waveform plot). */
const WAVEFORM_POINTS = 200;

export type ExportSolve =
  | { ok: true; compiled: CompileResult & { ok: true }; solved: SolveResult & { ok: true }; stress: PartStress[] }
  | { ok: false; reason: string; compiled: CompileResult | null };

/** Solve `doc` for an export (see the file comment). `teamFraction` is the team's derating policy, when it has one. */
export function solveForExport(doc: DesignDocument, teamFraction: number | null, options: { budgetMs?: number; warmup?: boolean } = {}): ExportSolve {
  const prepared = prepareNetlist(doc);
  if (!prepared.ok) return { ok: false, reason: `the drawing does not compile: ${prepared.reason}`, compiled: prepared.compiled };
  const outputs = prepared.topology.outputs.map((o) => o.node);
  const solved = solveNetlist(prepared.netlist, {
    warmup: options.warmup ?? true,
    outputNodes: outputs.length > 0 ? outputs : undefined,
    waveformPoints: WAVEFORM_POINTS,
    budgetMs: options.budgetMs ?? EXPORT_SOLVE_BUDGET_MS,
  });
  if (!solved.ok) return { ok: false, reason: `the solve did not reach a steady state: ${solved.reason}`, compiled: prepared.compiled };
  return { ok: true, compiled: prepared.compiled, solved, stress: partStress(doc, prepared.compiled, solved, teamFraction) };
}
