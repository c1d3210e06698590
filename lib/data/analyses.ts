/**
 * Analysis runs (sweeps and tolerance spreads) of a design revision, worked in the background
 * by scripts/worker.ts (lib/jobs/analysis-worker.ts).
 *
 * Who may do what: anyone who can read the design — owners, designers, reviewers and viewers —
 * may start a run, list the design's runs and read one: a run reads a revision and never changes
 * the design. Outsiders (and others than the author of a private design) get 404. Cancelling is
 * for the person who started the run or a team owner (others 403). One person may have at most
 * {@link MAX_OPEN_ANALYSES_PER_USER} runs queued or running (429 above).
 *
 * Starting a run: the spec is checked (zod, lib/analyses/spec.ts), then the first and last
 * points' variants are built so a spec the design cannot take (a stage sweep of a drawing with no
 * ladder, a frequency sweep without an AC drive) is refused with 422 on `spec` before anything is
 * queued. The row is inserted, then the job is sent; if the send fails the row stays queued and a
 * worker's reaper sends it again (lib/jobs/analysis-worker.ts).
 */
import 'server-only';
import type { z } from 'zod';
import { pointCount, pointDocument } from '../analyses';
import { ANALYSIS_LIST_LIMIT, MAX_OPEN_ANALYSES_PER_USER, type AnalysisDto, type AnalysisSummaryDto, type createAnalysisSchema } from '../analyses/contract';
import { designDocumentSchema } from '../circuit/document/schema';
import { db } from '../db';
import { env } from '../env';
import { AppError, forbidden, invalid, notFound } from '../errors';
import { sendAnalysisJob, webBoss } from '../jobs/boss';
import type { Analysis } from '../../models';
import { loadCaller, requireMember } from './access';
import { loadReadable } from './designs';

type CreateInput = z.output<typeof createAnalysisSchema>;

function summaryDto(a: Analysis, names: Map<string, string>): AnalysisSummaryDto {
  return {
    id: a.id,
    designId: a.designId,
    revision: a.revision,
    kind: a.kind,
    spec: a.spec,
    status: a.status,
    progress: a.progress,
    donePoints: a.donePoints,
    totalPoints: a.totalPoints,
    error: a.error,
    attempts: a.attempts,
    createdBy: { id: a.createdBy, name: names.get(a.createdBy) ?? 'unknown' },
    createdAt: a.createdAt.toISOString(),
    startedAt: a.startedAt ? a.startedAt.toISOString() : null,
    finishedAt: a.finishedAt ? a.finishedAt.toISOString() : null,
  };
}

async function namesOf(ids: string[]): Promise<Map<string, string>> {
  const users = await db().models.User.findAll({ where: { id: [...new Set(ids)] }, attributes: ['id', 'name', 'email'] });
  return new Map(users.map((u) => [u.id, u.name ?? u.email.split('@')[0]]));
}

async function detailDto(a: Analysis): Promise<AnalysisDto> {
  return { ...summaryDto(a, await namesOf([a.createdBy])), points: a.points, result: a.result ?? null };
}

/** Queue a run of `input.spec` on a revision of the design (202 with the queued run). */
export async function createAnalysis(userId: string, designId: string, input: CreateInput): Promise<AnalysisDto> {
  const caller = await loadCaller(userId);
  const design = await loadReadable(caller, designId);
  const number = input.revision ?? design.latestRevision;
  const rev = await db().models.DesignRevision.findOne({ where: { designId, number } });
  if (!rev) throw invalid(`the design has no revision ${number}`, 'revision');
  const doc = designDocumentSchema.parse(rev.document);
  const total = pointCount(input.spec);
  for (const index of [0, total - 1]) {
    const v = pointDocument(doc, input.spec, index);
    if (!v.ok) throw invalid(`this analysis cannot run on revision ${number}: ${v.reason}`, input.spec.kind === 'sweep' ? 'spec.parameter' : 'spec');
  }
  if (input.spec.kind === 'spread' && !doc.blocks.some((b) => b.kind === 'stage' || b.kind === 'capacitor')) {
    throw invalid('the design has no capacitors to vary', 'spec');
  }
  const { Analysis: A } = db().models;
  const open = await A.count({ where: { createdBy: userId, status: ['queued', 'running'] } });
  if (open >= MAX_OPEN_ANALYSES_PER_USER) {
    throw new AppError('rate_limited', `you already have ${open} analyses queued or running; wait for one to finish or cancel one`);
  }
  const a = await A.create({ designId, revision: number, kind: input.spec.kind, spec: input.spec, totalPoints: total, createdBy: userId });
  try {
    await sendAnalysisJob(await webBoss(env().DATABASE_URL), a.id);
  } catch (e) {
    // The row stays queued; a worker's reaper sends it again (lib/jobs/analysis-worker.ts).
    console.error(`[analyses] could not queue ${a.id} now: ${e instanceof Error ? e.message : String(e)}`);
  }
  return detailDto(a);
}

/** The design's most recent runs (newest first). */
export async function listAnalyses(userId: string, designId: string): Promise<AnalysisSummaryDto[]> {
  const caller = await loadCaller(userId);
  await loadReadable(caller, designId);
  const rows = await db().models.Analysis.findAll({
    where: { designId },
    attributes: { exclude: ['points', 'result'] },
    order: [['createdAt', 'DESC']],
    limit: ANALYSIS_LIST_LIMIT,
  });
  const names = await namesOf(rows.map((r) => r.createdBy));
  return rows.map((r) => summaryDto(r, names));
}

async function loadRun(userId: string, analysisId: string): Promise<{ a: Analysis; teamId: string; caller: Awaited<ReturnType<typeof loadCaller>> }> {
  const a = await db().models.Analysis.findByPk(analysisId);
  if (!a) throw notFound('analysis');
  const caller = await loadCaller(userId);
  try {
    const d = await loadReadable(caller, a.designId);
    return { a, teamId: d.teamId, caller };
  } catch {
    throw notFound('analysis');
  }
}

/** One run: status, progress, its points so far and its result when done. */
export async function getAnalysis(userId: string, analysisId: string): Promise<AnalysisDto> {
  return detailDto((await loadRun(userId, analysisId)).a);
}

/** Cancel a queued or running run (its starter or a team owner); a finished run answers 409. */
export async function cancelAnalysis(userId: string, analysisId: string): Promise<AnalysisDto> {
  const { a, teamId, caller } = await loadRun(userId, analysisId);
  const role = requireMember(caller, teamId, 'analysis');
  if (a.createdBy !== userId && role !== 'owner') throw forbidden('only the person who started this analysis or a team owner can cancel it');
  const [n] = await db().models.Analysis.update(
    { status: 'cancelled', finishedAt: new Date() },
    { where: { id: a.id, status: ['queued', 'running'] } },
  );
  if (n === 0) throw new AppError('conflict', `this analysis is already ${a.status}`);
  await a.reload();
  return detailDto(a);
}
