/**
 * Bench data: measurements taken on a built supply, uploaded as CSV and compared with a design
 * revision's model (lib/bench). Who may do what: every member who can read the design lists and
 * reads its datasets and their comparisons; owners and designers inspect, upload and delete
 * (reviewers and viewers 403, outsiders 404). An archived design takes no new datasets (409).
 *
 * Limits: a file of at most 2 MiB (413) and 20 000 data rows (422 with the line), multipart only
 * (415), a CSV/text type (415 otherwise). An upload that fails anywhere stores nothing: the file
 * is parsed and checked before anything is written; the raw file goes to S3 first and is removed
 * again if the database insert fails.
 *
 * Comparisons are solved per request in the solve pool (lib/solve-pool: off the request thread;
 * lib/bench/model.ts, one 30 s budget for all solves, plus the pool's hard cut-off) and kept in a
 * small in-process cache by dataset and revision (both immutable: revisions are append-only and a
 * dataset's points never change). A comparison the pool cut off or was too busy for is not
 * cached, so the next look tries again.
 */
import 'server-only';
import { randomUUID } from 'node:crypto';
import type { Role } from '../api/contract';
import { json } from '../api/handler';
import type { Upload } from '../api/upload';
import { looksLikePdf } from '../api/upload';
import { BENCH_SOLVE_BUDGET_MS } from '../bench/model';
import { cutOffFor, runSolve } from '../solve-pool';
import { benchMappingSchema, benchNameSchema, benchNotesSchema, MAX_BENCH_FILE_BYTES, type BenchMapping } from '../bench/mapping';
import { inspectCsv, readPoints, type BenchPoint, type CsvError } from '../bench/parse';
import type { BenchDatasetDto, BenchDetailDto, BenchInspectDto } from '../bench/types';
import { designDocumentSchema } from '../circuit/document/schema';
import { db } from '../db';
import { AppError, conflict, invalid, notFound } from '../errors';
import { deleteObject, getObject, putObject } from '../storage';
import type { BenchDataset, Design } from '../../models';
import type { StoredPoint } from '../../models/bench-dataset';
import { canWrite, loadCaller, requireRole, WRITER_ROLES, type Caller } from './access';
import { loadReadable } from './designs';
import { userDto } from './dto';

export { MAX_BENCH_FILE_BYTES };

/** A file that does not read: the 422 carries every problem with its line. */
export class CsvRejectedError extends AppError {
  readonly lines: CsvError[];
  constructor(lines: CsvError[]) {
    const first = lines[0];
    super('invalid', first ? `line ${first.line}: ${first.reason}` : 'the file could not be read', { field: 'file' });
    this.lines = lines;
  }
}

/** Types a browser may declare for a CSV file (it is not trusted: the bytes are checked too). */
const TEXT_TYPES = new Set(['', 'text/csv', 'text/plain', 'text/tab-separated-values', 'application/csv', 'application/vnd.ms-excel', 'application/octet-stream', 'text/x-csv']);

/** The upload's text: UTF-8 (a BOM allowed), else Windows-1252; 415 for anything that is not text. */
export function uploadText(upload: Upload): string {
  const declared = upload.declaredType.split(';')[0].trim().toLowerCase();
  if (!TEXT_TYPES.has(declared)) throw new AppError('unsupported_media_type', `upload a CSV text file (got ${declared})`);
  if (looksLikePdf(upload.bytes) || upload.bytes.includes(0)) throw new AppError('unsupported_media_type', 'this is not a CSV text file');
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(upload.bytes);
  } catch {
    return new TextDecoder('windows-1252').decode(upload.bytes);
  }
}

async function loadForWrite(userId: string, designId: string): Promise<{ caller: Caller; design: Design }> {
  const caller = await loadCaller(userId);
  const design = await loadReadable(caller, designId);
  requireRole(caller, design.teamId, WRITER_ROLES, 'design');
  return { caller, design };
}

/**
 * Check the caller may add bench data to the design (404 / 403 / 409), before the upload is read.
 */
export async function requireBenchWriter(userId: string, designId: string): Promise<void> {
  const { design } = await loadForWrite(userId, designId);
  if (design.archivedAt) throw conflict('this design is archived; restore it before adding bench data');
}

/** POST …/bench/inspect: the file's layout and a suggested mapping. Stores nothing. */
export async function inspectBenchFile(userId: string, designId: string, upload: Upload): Promise<BenchInspectDto> {
  await requireBenchWriter(userId, designId);
  const r = inspectCsv(uploadText(upload));
  if (!r.ok) throw new CsvRejectedError(r.errors);
  const { ok: _ok, ...layout } = r;
  void _ok;
  return { fileName: upload.fileName, ...layout };
}

/** The form fields of an upload besides the file, as strings (or absent). */
export interface BenchFields {
  mapping?: string | null;
  name?: string | null;
  notes?: string | null;
  revision?: string | null;
}

function parseFields(f: BenchFields, latestRevision: number): { mapping: BenchMapping; name: string; notes: string | null; revision: number } {
  if (!f.mapping) throw invalid('give the column mapping (form field "mapping", JSON)', 'mapping');
  let raw: unknown;
  try {
    raw = JSON.parse(f.mapping);
  } catch {
    throw invalid('mapping: not valid JSON', 'mapping');
  }
  const m = benchMappingSchema.safeParse(raw);
  if (!m.success) {
    const issue = m.error.issues[0];
    const at = issue?.path.length ? `.${issue.path.join('.')}` : '';
    throw invalid(`mapping${at}: ${issue?.message ?? 'invalid'}`, 'mapping');
  }
  const name = benchNameSchema.safeParse(f.name ?? '');
  if (!name.success) throw invalid(`name: ${name.error.issues[0]?.message}`, 'name');
  const notes = benchNotesSchema.safeParse(f.notes ?? undefined);
  if (!notes.success) throw invalid(`notes: ${notes.error.issues[0]?.message}`, 'notes');
  let revision = latestRevision;
  if (f.revision !== undefined && f.revision !== null && f.revision !== '') {
    revision = Number(f.revision);
    if (!Number.isInteger(revision) || revision < 1 || revision > latestRevision) throw invalid(`revision: this design has revisions 1 to ${latestRevision}`, 'revision');
  }
  return { mapping: m.data, name: name.data, notes: notes.data ? notes.data : null, revision };
}

function datasetDto(d: BenchDataset, role: Role | undefined): BenchDatasetDto {
  return {
    id: d.id,
    designId: d.designId,
    revision: d.revision,
    kind: d.kind,
    name: d.name,
    notes: d.notes,
    mapping: d.mapping,
    pointCount: d.pointCount,
    fileName: d.fileName,
    fileBytes: d.fileBytes,
    uploadedBy: userDto(d.uploadedBy),
    createdAt: d.createdAt.toISOString(),
    canDelete: canWrite(role),
  };
}

/** S3 key of a dataset's raw file. */
export function benchFileKey(designId: string, datasetId: string, fileName: string): string {
  return `bench/${designId}/${datasetId}/${fileName}`;
}

/**
 * POST …/bench: read the file with `fields.mapping`, store the raw file and the points (201).
 * Nothing is stored on any error.
 */
export async function createBenchDataset(userId: string, designId: string, upload: Upload, fields: BenchFields): Promise<BenchDatasetDto> {
  const { caller, design } = await loadForWrite(userId, designId);
  if (design.archivedAt) throw conflict('this design is archived; restore it before adding bench data');
  const input = parseFields(fields, design.latestRevision);
  const read = readPoints(uploadText(upload), input.mapping);
  if (!read.ok) throw new CsvRejectedError(read.errors);
  const id = randomUUID();
  const fileKey = benchFileKey(design.id, id, upload.fileName);
  await putObject(fileKey, upload.bytes, 'text/csv');
  const { BenchDataset: B, User } = db().models;
  let row: BenchDataset;
  try {
    row = await B.create({
      id,
      designId: design.id,
      revision: input.revision,
      kind: input.mapping.kind,
      name: input.name,
      notes: input.notes,
      mapping: input.mapping,
      points: read.points.map((p): StoredPoint => [p.x, p.y, p.line]),
      pointCount: read.points.length,
      fileKey,
      fileName: upload.fileName,
      fileBytes: upload.bytes.byteLength,
      uploadedById: userId,
    });
  } catch (e) {
    await deleteObject(fileKey).catch(() => undefined);
    throw e;
  }
  row.uploadedBy = (await User.findByPk(userId)) ?? undefined;
  return datasetDto(row, caller.roles.get(design.teamId));
}

/** GET …/bench: the design's datasets, newest first. */
export async function listBenchDatasets(userId: string, designId: string): Promise<BenchDatasetDto[]> {
  const caller = await loadCaller(userId);
  const design = await loadReadable(caller, designId);
  const { BenchDataset: B, User } = db().models;
  const rows = await B.findAll({
    where: { designId: design.id },
    attributes: { exclude: ['points'] },
    include: [{ model: User, as: 'uploadedBy' }],
    order: [['createdAt', 'DESC']],
  });
  return rows.map((r) => datasetDto(r, caller.roles.get(design.teamId)));
}

/** A dataset and its design, for a caller who may read the design (404 otherwise). */
async function loadDataset(userId: string, datasetId: string, withPoints: boolean): Promise<{ caller: Caller; design: Design; dataset: BenchDataset }> {
  const { BenchDataset: B, User } = db().models;
  const dataset = await B.findByPk(datasetId, { include: [{ model: User, as: 'uploadedBy' }], attributes: withPoints ? undefined : { exclude: ['points'] } });
  if (!dataset) throw notFound('dataset');
  const caller = await loadCaller(userId);
  let design: Design;
  try {
    design = await loadReadable(caller, dataset.designId);
  } catch {
    throw notFound('dataset');
  }
  return { caller, design, dataset };
}

const CACHE_SIZE = 32;
const comparisons = new Map<string, BenchDetailDto['comparison']>();

/** Solve (or take from the cache) the comparison of `dataset` with revision `number`. */
async function comparisonOf(dataset: BenchDataset, number: number): Promise<BenchDetailDto['comparison']> {
  const key = `${dataset.id}:${number}`;
  const hit = comparisons.get(key);
  if (hit) {
    comparisons.delete(key);
    comparisons.set(key, hit);
    return hit;
  }
  const r = await db().models.DesignRevision.findOne({ where: { designId: dataset.designId, number } });
  if (!r) throw notFound('revision');
  const doc = designDocumentSchema.safeParse(r.document);
  let result: BenchDetailDto['comparison'];
  let cacheable = true;
  if (!doc.success) {
    result = { ok: false, reason: `revision ${number} does not read as a design document` };
  } else {
    const points: BenchPoint[] = dataset.points.map(([x, y, line]) => ({ line, x, y }));
    const pooled = await runSolve('compareWithModel', [doc.data, dataset.kind, points, BENCH_SOLVE_BUDGET_MS], { timeoutMs: cutOffFor(BENCH_SOLVE_BUDGET_MS) });
    cacheable = pooled.ok;
    const c = pooled.ok ? pooled.value : { ok: false as const, reason: pooled.reason };
    result = c.ok ? { ok: true, ...c.comparison } : { ok: false, reason: c.reason };
  }
  if (cacheable) comparisons.set(key, result);
  while (comparisons.size > CACHE_SIZE) comparisons.delete(comparisons.keys().next().value as string);
  return result;
}

/** GET /api/bench/:datasetId?revision=N: the dataset, its points and the comparison with revision N. */
export async function getBenchDataset(userId: string, datasetId: string, revision?: number): Promise<BenchDetailDto> {
  const { caller, design, dataset } = await loadDataset(userId, datasetId, true);
  const number = revision ?? dataset.revision;
  if (number > design.latestRevision) throw invalid(`revision: this design has revisions 1 to ${design.latestRevision}`, 'revision');
  return {
    dataset: datasetDto(dataset, caller.roles.get(design.teamId)),
    revision: number,
    latestRevision: design.latestRevision,
    points: dataset.points.map(([x, y, line]) => ({ line, x, y })),
    comparison: await comparisonOf(dataset, number),
  };
}

/** GET /api/bench/:datasetId/file: the raw file as uploaded. */
export async function benchFile(userId: string, datasetId: string): Promise<{ bytes: Uint8Array; fileName: string }> {
  const { dataset } = await loadDataset(userId, datasetId, false);
  const bytes = await getObject(dataset.fileKey);
  if (!bytes) throw notFound('file');
  return { bytes, fileName: dataset.fileName };
}

/** DELETE /api/bench/:datasetId: owners and designers; the row and the raw file go. */
export async function deleteBenchDataset(userId: string, datasetId: string): Promise<void> {
  const { caller, design, dataset } = await loadDataset(userId, datasetId, false);
  requireRole(caller, design.teamId, WRITER_ROLES, 'dataset');
  await dataset.destroy();
  for (const key of comparisons.keys()) if (key.startsWith(`${dataset.id}:`)) comparisons.delete(key);
  await deleteObject(dataset.fileKey).catch((e: unknown) => console.error(`[bench] raw file ${dataset.fileKey} not removed: ${e instanceof Error ? e.message : String(e)}`));
}

/** Run `fn`; a CsvRejectedError becomes a 422 with `error.lines`. */
export async function answeringCsvErrors<T>(fn: () => Promise<T>): Promise<T | Response> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof CsvRejectedError) return json({ error: { ...e.toBody().error, lines: e.lines } }, 422);
    throw e;
  }
}

/** The text fields of the upload form (read from a clone of the request taken before the file was read). */
export async function benchFields(clone: Request): Promise<BenchFields> {
  const form = await clone.formData();
  const text = (k: string) => {
    const v = form.get(k);
    return typeof v === 'string' ? v : null;
  };
  return { mapping: text('mapping'), name: text('name'), notes: text('notes'), revision: text('revision') };
}
