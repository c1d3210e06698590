/**
 * Messages between the editor and its engine workers. Requests are validated with zod inside
 * the worker (a worker must not trust its inbox); replies are plain structured-clone values.
 *
 * Two workers run the same script: a compile worker that answers `compile` (compile view and the
 * closed-form estimate, a few ms) and a solve worker that answers `solve` (steady state, then
 * warm-up). The solver is synchronous, so a newer document is not queued behind a running solve:
 * the editor terminates the solve worker and starts a fresh one.
 */
import { z } from '../../circuit/zod';
import { designDocumentSchema } from '@/lib/circuit';
import type { CompileView, EstimateView, SolveView } from '../types';

/** Wall-clock budget of the steady-state solve in the worker (ms). */
export const SOLVE_BUDGET_MS = 15_000;
/** Wall-clock budget of the warm-up run in the worker (ms). */
export const WARMUP_BUDGET_MS = 30_000;
/** Waveform points per node sent with the solve (one period). */
export const WAVEFORM_POINTS = 200;

const version = z.int().nonnegative();

export const engineRequestSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('compile'), version, document: designDocumentSchema }),
  z.object({ type: z.literal('solve'), version, document: designDocumentSchema, warmup: z.boolean().default(true) }),
  /** Run one small solve so the engine's code is compiled by the JavaScript engine before a real job arrives. */
  z.object({ type: z.literal('prime'), version }),
]);
export type EngineRequest = z.input<typeof engineRequestSchema>;
export type ParsedEngineRequest = z.output<typeof engineRequestSchema>;

/** Worker compute times (ms), measured inside the worker. */
export interface WorkerTimings {
  compileMs?: number;
  estimateMs?: number;
  solveMs?: number;
  warmupMs?: number;
}

export type EngineReply =
  | { type: 'compiled'; version: number; compile: CompileView; estimate: EstimateView | null; timings: WorkerTimings }
  | { type: 'solved'; version: number; solve: SolveView; timings: WorkerTimings }
  | { type: 'warmup'; version: number; warmup: NonNullable<SolveView['warmup']> | null; reason?: string; timings: WorkerTimings }
  | { type: 'cannot-solve'; version: number; reason: string; timings: WorkerTimings }
  | { type: 'primed'; version: number; timings: WorkerTimings }
  /** The request itself was malformed (names the first bad field). */
  | { type: 'invalid'; version: number | null; reason: string };

/** The first zod issue as "path: message" (what an `invalid` reply carries). */
export function firstIssue(error: z.ZodError): string {
  const issue = error.issues[0];
  if (!issue) return 'invalid request';
  return `${issue.path.join('.') || '(root)'}: ${issue.message}`;
}
