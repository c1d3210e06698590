/**
 * The analyses API's request schema and answers, shared by the routes (lib/data/analyses.ts) and
 * the browser hooks (lib/client/analyses.ts).
 */
import { z } from '../circuit/zod';
import { analysisSpecSchema, type AnalysisSpec } from './spec';
import type { AnalysisResult, PointResult } from './run';

/** POST /api/designs/:designId/analyses — `revision` defaults to the latest. */
export const createAnalysisSchema = z.object({
  revision: z.number().int('must be a whole number').min(1, 'must be at least 1').optional(),
  spec: analysisSpecSchema,
});
export type CreateAnalysisInput = z.input<typeof createAnalysisSchema>;

export type AnalysisStatusValue = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';

/** One run as the list shows it. */
export interface AnalysisSummaryDto {
  id: string;
  designId: string;
  revision: number;
  kind: 'sweep' | 'spread';
  spec: AnalysisSpec;
  status: AnalysisStatusValue;
  /** 0…1. */
  progress: number;
  donePoints: number;
  totalPoints: number;
  error: string | null;
  attempts: number;
  createdBy: { id: string; name: string };
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

/** One run with its points so far and, when done, its result. */
export interface AnalysisDto extends AnalysisSummaryDto {
  points: PointResult[];
  result: AnalysisResult | null;
}

/** Unfinished (queued or running) runs one person may have at a time. */
export const MAX_OPEN_ANALYSES_PER_USER = 3;
/** How many recent runs the list returns. */
export const ANALYSIS_LIST_LIMIT = 20;
