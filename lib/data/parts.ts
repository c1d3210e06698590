/**
 * The team parts library (issue 6): the parts a team stocks, their datasheets and the team's
 * derating policy. Who may do what: every member of the team lists and reads parts, downloads
 * datasheets and reads the policy; owners and designers create, replace, delete and import parts
 * and attach or remove datasheets; only owners set the policy. Outsiders get 404 (also for a part
 * id of another team), a member whose role does not allow the action 403.
 *
 * A part number is unique within its team, case-insensitively (409 `exists`). Every write runs in
 * one transaction with its audit row (`part.created`, `part.updated`, `part.deleted`,
 * `part.imported`, `part.datasheet_uploaded`, `part.datasheet_removed`, `part.policy_changed`).
 * Datasheet bytes live in object storage under `teams/<teamId>/parts/<partId>/datasheet-<uuid>.pdf`;
 * an object that a committed change no longer points at is removed after the commit (a failed
 * removal only leaves an orphan object, never a row pointing at nothing).
 */
import 'server-only';
import { randomUUID } from 'node:crypto';
import { Op, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import type { Role } from '../api/contract';
import type { Upload } from '../api/upload';
import { looksLikePdf } from '../api/upload';
import { db } from '../db';
import { AppError, invalid, notFound } from '../errors';
import { parsePartsCsv } from '../parts/csv';
import type { PartDto, PartImportReport, PartInput, PartsPolicy } from '../parts/schema';
import { partListQuerySchema } from '../parts/schema';
import { deleteObject, getObject, putObject } from '../storage';
import type { Part } from '../../models';
import { loadCaller, requireMember, requireRole, WRITER_ROLES } from './access';
import { recordAudit } from './audit';
import type { z } from '../circuit/zod';

export type PartListQuery = z.output<typeof partListQuerySchema>;

/** The part as the API returns it. */
export function partDto(p: Part): PartDto {
  const base = {
    id: p.id,
    teamId: p.teamId,
    kind: p.kind,
    partNumber: p.partNumber,
    description: p.description,
    maker: p.maker,
    ...(p.unitCost === null || p.unitCost === undefined ? {} : { unitCost: p.unitCost }),
    currency: p.currency,
    specs: p.specs,
    datasheet:
      p.datasheetKey && p.datasheetName && p.datasheetSize !== null && p.datasheetSize !== undefined && p.datasheetUploadedAt
        ? { fileName: p.datasheetName, sizeBytes: p.datasheetSize, uploadedAt: p.datasheetUploadedAt.toISOString() }
        : null,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
  return base as unknown as PartDto;
}

/** The message of a duplicate part number. */
function duplicate(partNumber: string): AppError {
  return new AppError('exists', `part number ${partNumber} already exists in this team; choose another or edit that part`, { field: 'partNumber' });
}

/** The row of another part of `teamId` with the same part number (case-insensitive), if any. */
async function samePartNumber(teamId: string, partNumber: string, transaction?: Transaction, exceptId?: string): Promise<Part | null> {
  const P = db().models.Part;
  const sequelize = db().sequelize;
  const where: WhereOptions = {
    teamId,
    [Op.and]: [sequelize.where(sequelize.fn('lower', sequelize.col('part_number')), partNumber.toLowerCase())],
    ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}),
  };
  return P.findOne({ where, transaction });
}

/** Run `fn`; a unique-index violation on the part number becomes 409 `exists`. */
async function guardingDuplicates<T>(partNumber: string, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw duplicate(partNumber);
    throw e;
  }
}

function columnsOf(input: PartInput) {
  return {
    kind: input.kind,
    partNumber: input.partNumber,
    description: input.description,
    maker: input.maker,
    unitCost: input.unitCost ?? null,
    currency: input.currency,
    specs: input.specs as Record<string, unknown>,
  };
}

/** A part and the caller's role in its team; 404 when the caller is not in that team. */
async function loadPart(userId: string, partId: string, transaction?: Transaction): Promise<{ part: Part; role: Role; caller: Awaited<ReturnType<typeof loadCaller>> }> {
  const part = await db().models.Part.findByPk(partId, { transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!part) throw notFound('part');
  const caller = await loadCaller(userId, transaction);
  const role = requireMember(caller, part.teamId, 'part');
  return { part, role, caller };
}

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** GET /api/teams/:teamId/parts: search `q` over part number, description and maker; kind filter; sort. */
export async function listParts(userId: string, teamId: string, query: PartListQuery): Promise<PartDto[]> {
  requireMember(await loadCaller(userId), teamId);
  const { Part: P } = db().models;
  const sequelize = db().sequelize;
  const and: WhereOptions[] = [{ teamId }];
  if (query.kind) and.push({ kind: query.kind });
  const q = query.q?.trim();
  if (q) {
    const like = `%${escapeLike(q)}%`;
    and.push({ [Op.or]: [{ partNumber: { [Op.iLike]: like } }, { description: { [Op.iLike]: like } }, { maker: { [Op.iLike]: like } }] });
  }
  const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
  const byNumber = sequelize.fn('lower', sequelize.col('part_number'));
  const order: [unknown, string][] = [];
  switch (query.sort ?? 'partNumber') {
    case 'kind':
      order.push([sequelize.col('kind'), dir]);
      break;
    case 'maker':
      order.push([sequelize.fn('lower', sequelize.col('maker')), dir]);
      break;
    case 'unitCost':
      order.push([sequelize.col('unit_cost'), `${dir} NULLS LAST`]);
      break;
    case 'updated':
      order.push([sequelize.col('updated_at'), dir]);
      break;
    default:
      break;
  }
  order.push([byNumber, query.sort === undefined || query.sort === 'partNumber' ? dir : 'ASC']);
  const rows = await P.findAll({ where: { [Op.and]: and }, order: order as never, limit: 10_000 });
  return rows.map(partDto);
}

/** GET /api/parts/:partId. */
export async function getPart(userId: string, partId: string): Promise<PartDto> {
  return partDto((await loadPart(userId, partId)).part);
}

/** POST /api/teams/:teamId/parts (owners and designers): 201, or 409 `exists` for a taken part number. */
export async function createPart(userId: string, teamId: string, input: PartInput): Promise<PartDto> {
  requireRole(await loadCaller(userId), teamId, WRITER_ROLES);
  const { Part: P } = db().models;
  return guardingDuplicates(input.partNumber, () =>
    db().sequelize.transaction(async (transaction) => {
      if (await samePartNumber(teamId, input.partNumber, transaction)) throw duplicate(input.partNumber);
      const part = await P.create({ teamId, ...columnsOf(input), createdBy: userId }, { transaction });
      await recordAudit({ teamId, actorId: userId, action: 'part.created', targetType: 'part', targetId: part.id, summary: { partNumber: part.partNumber, kind: part.kind } }, transaction);
      return partDto(part);
    }),
  );
}

/** PATCH /api/parts/:partId (owners and designers): the whole part is replaced by `input`. */
export async function replacePart(userId: string, partId: string, input: PartInput): Promise<PartDto> {
  return guardingDuplicates(input.partNumber, () =>
    db().sequelize.transaction(async (transaction) => {
      const { part, caller } = await loadPart(userId, partId, transaction);
      requireRole(caller, part.teamId, WRITER_ROLES, 'part');
      if (await samePartNumber(part.teamId, input.partNumber, transaction, part.id)) throw duplicate(input.partNumber);
      const before = part.partNumber;
      part.set(columnsOf(input));
      part.changed('specs', true);
      await part.save({ transaction });
      await recordAudit({ teamId: part.teamId, actorId: userId, action: 'part.updated', targetType: 'part', targetId: part.id, summary: { partNumber: part.partNumber, was: before, kind: part.kind } }, transaction);
      return partDto(part);
    }),
  );
}

/** Remove an object after a commit; a failure is logged and leaves an orphan object only. */
async function removeObjectAfterCommit(key: string | null | undefined): Promise<void> {
  if (!key) return;
  await deleteObject(key).catch((e: unknown) => console.error(`[parts] datasheet ${key} not removed: ${e instanceof Error ? e.message : String(e)}`));
}

/** DELETE /api/parts/:partId (owners and designers); its datasheet object goes after the commit. */
export async function deletePart(userId: string, partId: string): Promise<void> {
  const key = await db().sequelize.transaction(async (transaction) => {
    const { part, caller } = await loadPart(userId, partId, transaction);
    requireRole(caller, part.teamId, WRITER_ROLES, 'part');
    const k = part.datasheetKey;
    await part.destroy({ transaction });
    await recordAudit({ teamId: part.teamId, actorId: userId, action: 'part.deleted', targetType: 'part', targetId: part.id, summary: { partNumber: part.partNumber, kind: part.kind } }, transaction);
    return k;
  });
  await removeObjectAfterCommit(key);
}

/** Thrown inside the import transaction to roll a dry run back after counting. */
class DryRunRollback extends Error {
  constructor(readonly report: PartImportReport) {
    super('dry run');
  }
}

/**
 * POST /api/teams/:teamId/parts/import (owners and designers). Rows that read are created, or
 * replace the team's part with the same part number (`updated`); rows that do not read are listed
 * with their line and reasons. Everything runs in ONE transaction: a failure anywhere stores
 * nothing. A dry run does the same work and rolls it back, so its counts are the real ones.
 * A file that cannot be read as a whole (header, row limit) is 422 with the reason.
 */
export async function importParts(userId: string, teamId: string, body: { csv: string; dryRun?: boolean }): Promise<PartImportReport> {
  requireRole(await loadCaller(userId), teamId, WRITER_ROLES);
  const read = parsePartsCsv(body.csv);
  if (!read.ok) throw invalid(read.reason, 'csv');
  const dryRun = body.dryRun === true;
  const { Part: P } = db().models;
  try {
    return await db().sequelize.transaction(async (transaction) => {
      let updated = 0;
      const existing = new Map<string, Part>();
      if (read.rows.length > 0) {
        const rows = await P.findAll({ where: { teamId }, transaction, lock: transaction.LOCK.UPDATE });
        for (const r of rows) existing.set(r.partNumber.toLowerCase(), r);
      }
      const fresh: ReturnType<typeof columnsOf>[] = [];
      for (const row of read.rows) {
        const old = existing.get(row.input.partNumber.toLowerCase());
        if (old) {
          old.set(columnsOf(row.input));
          old.changed('specs', true);
          await old.save({ transaction });
          updated++;
        } else fresh.push(columnsOf(row.input));
      }
      for (let k = 0; k < fresh.length; k += 500) {
        await P.bulkCreate(
          fresh.slice(k, k + 500).map((c) => ({ teamId, ...c, createdBy: userId })),
          { transaction },
        );
      }
      const created = fresh.length;
      const report: PartImportReport = { created, updated, rejected: read.rejected, dryRun };
      if (dryRun) throw new DryRunRollback(report);
      if (created + updated > 0) {
        await recordAudit({ teamId, actorId: userId, action: 'part.imported', targetType: 'part', targetId: teamId, summary: { created, updated, rejected: read.rejected.length } }, transaction);
      }
      return report;
    });
  } catch (e) {
    if (e instanceof DryRunRollback) return e.report;
    if (e instanceof UniqueConstraintError) throw new AppError('exists', 'two parts of the import ended with the same part number; nothing was imported', { field: 'csv' });
    throw e;
  }
}

/** The S3 key of a new datasheet of a part. */
export function datasheetKey(teamId: string, partId: string): string {
  return `teams/${teamId}/parts/${partId}/datasheet-${randomUUID()}.pdf`;
}

/** Check the caller may change `partId`'s datasheet (404 / 403), before the upload is read. */
export async function requireDatasheetWriter(userId: string, partId: string): Promise<void> {
  const { part, caller } = await loadPart(userId, partId);
  requireRole(caller, part.teamId, WRITER_ROLES, 'part');
}

/**
 * PUT /api/parts/:partId/datasheet (owners and designers): `upload` must be a PDF by its bytes
 * (415 otherwise; the size limit is the route's readUpload, 413). The new object is stored first;
 * if the row update fails it is removed again; the replaced object is removed after the commit.
 */
export async function putDatasheet(userId: string, partId: string, upload: Upload): Promise<PartDto> {
  if (!looksLikePdf(upload.bytes)) throw new AppError('unsupported_media_type', 'a datasheet must be a PDF file (this one does not start like a PDF)', { field: 'file' });
  const { part: first, caller } = await loadPart(userId, partId);
  requireRole(caller, first.teamId, WRITER_ROLES, 'part');
  const key = datasheetKey(first.teamId, first.id);
  await putObject(key, upload.bytes, 'application/pdf');
  let result: { dto: PartDto; old: string | null };
  try {
    result = await db().sequelize.transaction(async (transaction) => {
      const { part, caller: c } = await loadPart(userId, partId, transaction);
      requireRole(c, part.teamId, WRITER_ROLES, 'part');
      const old = part.datasheetKey ?? null;
      part.set({ datasheetKey: key, datasheetName: upload.fileName.toLowerCase().endsWith('.pdf') ? upload.fileName : `${upload.fileName}.pdf`, datasheetSize: upload.bytes.byteLength, datasheetUploadedAt: new Date() });
      await part.save({ transaction });
      await recordAudit({ teamId: part.teamId, actorId: userId, action: 'part.datasheet_uploaded', targetType: 'part', targetId: part.id, summary: { partNumber: part.partNumber, fileName: part.datasheetName, bytes: upload.bytes.byteLength } }, transaction);
      return { dto: partDto(part), old };
    });
  } catch (e) {
    await removeObjectAfterCommit(key);
    throw e;
  }
  if (result.old !== key) await removeObjectAfterCommit(result.old);
  return result.dto;
}

/** GET /api/parts/:partId/datasheet (every member): the PDF bytes; 404 without one. */
export async function datasheetFile(userId: string, partId: string): Promise<{ bytes: Uint8Array; fileName: string }> {
  const { part } = await loadPart(userId, partId);
  if (!part.datasheetKey) throw notFound('datasheet');
  const bytes = await getObject(part.datasheetKey);
  if (!bytes) throw notFound('datasheet');
  return { bytes, fileName: part.datasheetName ?? `${part.partNumber}.pdf` };
}

/** DELETE /api/parts/:partId/datasheet (owners and designers); 404 without one. */
export async function deleteDatasheet(userId: string, partId: string): Promise<PartDto> {
  const { dto, old } = await db().sequelize.transaction(async (transaction) => {
    const { part, caller } = await loadPart(userId, partId, transaction);
    requireRole(caller, part.teamId, WRITER_ROLES, 'part');
    if (!part.datasheetKey) throw notFound('datasheet');
    const k = part.datasheetKey;
    const name = part.datasheetName;
    part.set({ datasheetKey: null, datasheetName: null, datasheetSize: null, datasheetUploadedAt: null });
    await part.save({ transaction });
    await recordAudit({ teamId: part.teamId, actorId: userId, action: 'part.datasheet_removed', targetType: 'part', targetId: part.id, summary: { partNumber: part.partNumber, fileName: name } }, transaction);
    return { dto: partDto(part), old: k };
  });
  await removeObjectAfterCommit(old);
  return dto;
}

async function readPolicy(teamId: string, transaction?: Transaction): Promise<PartsPolicy> {
  const [rows] = await db().sequelize.query('SELECT derating_fraction FROM teams WHERE id = :teamId', { replacements: { teamId }, transaction });
  const row = (rows as { derating_fraction: number }[])[0];
  if (!row) throw notFound('team');
  return { deratingFraction: Number(row.derating_fraction) };
}

/** GET /api/teams/:teamId/parts-policy (every member). */
export async function getPartsPolicy(userId: string, teamId: string): Promise<PartsPolicy> {
  requireMember(await loadCaller(userId), teamId);
  return readPolicy(teamId);
}

/** The team's derating fraction for server-side readers (reports); no role check. */
export async function teamDeratingFraction(teamId: string): Promise<number> {
  return (await readPolicy(teamId)).deratingFraction;
}

/** PUT /api/teams/:teamId/parts-policy (owners only). */
export async function setPartsPolicy(userId: string, teamId: string, policy: PartsPolicy): Promise<PartsPolicy> {
  requireRole(await loadCaller(userId), teamId, ['owner']);
  return db().sequelize.transaction(async (transaction) => {
    const was = await readPolicy(teamId, transaction);
    await db().sequelize.query('UPDATE teams SET derating_fraction = :f, updated_at = now() WHERE id = :teamId', { replacements: { f: policy.deratingFraction, teamId }, transaction });
    await recordAudit({ teamId, actorId: userId, action: 'part.policy_changed', targetType: 'part', targetId: teamId, summary: { deratingFraction: policy.deratingFraction, was: was.deratingFraction } }, transaction);
    return readPolicy(teamId, transaction);
  });
}
