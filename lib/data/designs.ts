/**
 * Designs and revisions.
 *
 * Who sees what: a design is visible to members of its team when its visibility is 'team', and
 * to its author alone when 'private'; for everyone else it does not exist (404). Owners and
 * designers create, save and fork; the author shares or unshares; owners, and designers on their
 * own designs, archive; reviewers and viewers read.
 *
 * Saving: a save names the revision it started from. Inside one transaction a conditional
 * `UPDATE designs SET latest_revision = latest_revision + 1 WHERE id = ? AND latest_revision = base`
 * claims the next number; PostgreSQL's row lock makes a concurrent save on the same base wait
 * and then match no row, so exactly one wins and the other answers 409 with the current number
 * and writes nothing. Revisions are only ever inserted (a trigger refuses UPDATE). The same
 * claim (`appendRevision`) turns an approved design into 'changed_since_approval'; accepted
 * offers back (lib/data/offers.ts) go through it too.
 */
import 'server-only';
import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import type {
  DesignDetailDto,
  DesignSummaryDto,
  RevisionDto,
  RevisionSummaryDto,
  Role,
  createDesignSchema,
  designListQuerySchema,
  forkSchema,
  saveRevisionSchema,
  updateDesignSchema,
} from '../api/contract';
import { designDocumentSchema, type DesignDocument } from '../circuit/document/schema';
import { db } from '../db';
import { AppError, conflict, forbidden, notFound } from '../errors';
import type { Approval, Design, DesignRevision } from '../../models';
import { canWrite, loadCaller, requireMember, requireRole, WRITER_ROLES, type Caller } from './access';
import { recordActivity } from './activity';
import { recordAudit } from './audit';
import { approvalDto, reviewDto, revisionSummaryDto, userDto } from './dto';
import { summariseTopology } from './topology';

type CreateInput = z.output<typeof createDesignSchema>;
type UpdateInput = z.output<typeof updateDesignSchema>;
type SaveInput = z.output<typeof saveRevisionSchema>;
type ForkInput = z.output<typeof forkSchema>;
type ListQuery = z.output<typeof designListQuerySchema>;

/** May the caller read `d`? Team members for 'team' designs; the author alone for 'private'. */
export function readable(caller: Caller, d: Pick<Design, 'teamId' | 'visibility' | 'authorId'>): boolean {
  return caller.roles.has(d.teamId) && (d.visibility === 'team' || d.authorId === caller.userId);
}

/** May the caller archive `d`? Owners always; designers their own designs. */
function canManage(role: Role, caller: Caller, d: Design): boolean {
  return role === 'owner' || (role === 'designer' && d.authorId === caller.userId);
}

/**
 * May the caller change `d`'s visibility? Only its author (owner or designer): making a
 * colleague's design private would hide it from everyone but that colleague, the caller included.
 */
function canShare(role: Role, caller: Caller, d: Design): boolean {
  return canWrite(role) && d.authorId === caller.userId;
}

const includeForList = () => {
  const { User, Design: D } = db().models;
  return [
    { model: User, as: 'author' },
    { model: D, as: 'forkedFrom', attributes: ['id', 'title', 'teamId', 'visibility', 'authorId', 'archivedAt'] },
  ];
};

function summaryDto(caller: Caller, d: Design): DesignSummaryDto {
  const parent = d.forkedFrom;
  return {
    id: d.id,
    teamId: d.teamId,
    title: d.title,
    description: d.description,
    author: userDto(d.author),
    topology: d.topology,
    stages: d.stages,
    status: d.status,
    visibility: d.visibility,
    archived: d.archivedAt !== null,
    latestRevision: d.latestRevision,
    createdAt: d.createdAt.toISOString(),
    updatedAt: d.updatedAt.toISOString(),
    forkedFrom:
      d.forkedFromDesignId && d.forkedFromRevision
        ? {
            designId: d.forkedFromDesignId,
            // the parent's title only for those who may see the parent
            title: parent && readable(caller, parent) ? parent.title : 'a design you cannot see',
            revision: d.forkedFromRevision,
          }
        : null,
  };
}

/** What a review request needs included for reviewDto. */
export const includeForReview = () => {
  const { User } = db().models;
  return [
    { model: User, as: 'requestedBy' },
    { model: User, as: 'decidedBy' },
    { model: User, as: 'reviewers', through: { attributes: [] } },
  ];
};

/** The latest approval of a design, if any. */
export async function latestApproval(designId: string, transaction?: Transaction): Promise<Approval | null> {
  const { Approval: A, User } = db().models;
  return A.findOne({ where: { designId }, include: [{ model: User, as: 'approvedBy' }], order: [['createdAt', 'DESC']], transaction });
}

/** Roles that decide reviews (never on a design they authored). */
export const DECIDER_ROLES: readonly Role[] = ['owner', 'reviewer'];

/** The detail DTO of a design the caller may read (permissions decided from their role now). */
export async function detailDto(caller: Caller, d: Design): Promise<DesignDetailDto> {
  const role = caller.roles.get(d.teamId) as Role;
  const { Design: D, User, ReviewRequest } = db().models;
  const [forks, approval, openReview] = await Promise.all([
    D.findAll({ where: { forkedFromDesignId: d.id }, include: [{ model: User, as: 'author' }], order: [['createdAt', 'ASC']] }),
    latestApproval(d.id),
    ReviewRequest.findOne({ where: { designId: d.id, state: 'open' }, include: includeForReview() }),
  ]);
  const isAuthor = d.authorId === caller.userId;
  return {
    ...summaryDto(caller, d),
    permissions: {
      edit: canWrite(role) && d.archivedAt === null,
      fork: canWrite(role),
      share: canShare(role, caller, d),
      archive: canManage(role, caller, d),
      requestReview: canWrite(role) && d.archivedAt === null,
      decideReview: DECIDER_ROLES.includes(role) && !isAuthor && d.archivedAt === null,
      comment: role !== 'viewer',
      // the cheap half of lib/data/offers.ts createOffer's checks (the server still decides)
      offerBack:
        isAuthor && canWrite(role) && d.archivedAt === null && d.visibility === 'team' && !!d.forkedFrom && readable(caller, d.forkedFrom) && d.forkedFrom.archivedAt === null,
    },
    forks: forks
      .filter((f) => readable(caller, f))
      .map((f) => ({ designId: f.id, title: f.title, author: userDto(f.author), revision: f.forkedFromRevision ?? 1 })),
    approval: approval ? approvalDto(approval) : null,
    openReview: openReview ? reviewDto(openReview) : null,
  };
}

/** Load a design the caller may read, with author and parent; 404 otherwise. */
export async function loadReadable(caller: Caller, designId: string, transaction?: Transaction): Promise<Design> {
  const d = await db().models.Design.findByPk(designId, { include: includeForList(), transaction });
  if (!d || !readable(caller, d)) throw notFound('design');
  return d;
}

/** Validate a stored document on its way out; a failure is a broken invariant, not bad input. */
function checkedDocument(r: DesignRevision): DesignDocument {
  const parsed = designDocumentSchema.safeParse(r.document);
  if (!parsed.success) throw new Error(`stored revision ${r.designId} r${r.number} fails the document schema: ${parsed.error.issues[0]?.message}`);
  return parsed.data;
}

async function insertRevision(
  designId: string,
  number: number,
  document: DesignDocument,
  authorId: string,
  message: string,
  transaction: Transaction,
): Promise<DesignRevision> {
  const { DesignRevision: R, User } = db().models;
  const r = await R.create({ designId, number, document, authorId, message }, { transaction });
  r.author = (await User.findByPk(authorId, { transaction })) ?? undefined;
  return r;
}

/** The team's designs the caller may see, filtered and sorted. */
export async function listDesigns(userId: string, teamId: string, query: ListQuery): Promise<DesignSummaryDto[]> {
  const caller = await loadCaller(userId);
  requireMember(caller, teamId);
  const { Design: D, User } = db().models;
  const and: WhereOptions[] = [
    { teamId },
    { [Op.or]: [{ visibility: 'team' }, { authorId: userId }] },
    { archivedAt: query.archived === 'true' ? { [Op.ne]: null } : null },
  ];
  if (query.q && query.q.trim()) {
    const like = `%${query.q.trim().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    and.push({ [Op.or]: [{ title: { [Op.iLike]: like } }, { description: { [Op.iLike]: like } }] });
  }
  const order: Record<NonNullable<ListQuery['sort']>, [unknown, string][]> = {
    updated: [['updatedAt', 'DESC']],
    title: [['title', 'ASC']],
    author: [[{ model: User, as: 'author' }, 'name', 'ASC'] as unknown as [unknown, string], ['title', 'ASC']],
    status: [['status', 'ASC'], ['updatedAt', 'DESC']],
  };
  const rows = await D.findAll({
    where: { [Op.and]: and },
    include: includeForList(),
    order: order[query.sort ?? 'updated'] as never,
    limit: 500,
  });
  return rows.map((d) => summaryDto(caller, d));
}

/** Create a design with its first revision (owners and designers). */
export async function createDesign(userId: string, teamId: string, input: CreateInput): Promise<{ design: DesignDetailDto; revision: RevisionSummaryDto }> {
  const caller = await loadCaller(userId);
  requireRole(caller, teamId, WRITER_ROLES);
  const { sequelize, models } = db();
  const { topology, stages } = summariseTopology(input.document);
  const { designId, revision } = await sequelize.transaction(async (transaction) => {
    const d = await models.Design.create(
      {
        teamId,
        authorId: userId,
        title: input.title,
        description: input.description ?? '',
        visibility: input.visibility ?? 'team',
        archivedAt: null,
        forkedFromDesignId: null,
        forkedFromRevision: null,
        latestRevision: 1,
        topology,
        stages,
      },
      { transaction },
    );
    const r = await insertRevision(d.id, 1, input.document, userId, input.message ?? 'First revision', transaction);
    await recordAudit({ teamId, actorId: userId, action: 'design.created', targetType: 'design', targetId: d.id, summary: { title: d.title, visibility: d.visibility } }, transaction);
    return { designId: d.id, revision: r };
  });
  const design = await detailDto(caller, await loadReadable(caller, designId));
  return { design, revision: revisionSummaryDto(revision) };
}

/** A design with its latest revision's document. */
export async function getDesign(userId: string, designId: string): Promise<{ design: DesignDetailDto; revision: RevisionDto }> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  const [revision, design] = await Promise.all([getRevisionOf(d, d.latestRevision), detailDto(caller, d)]);
  return { design, revision };
}

/**
 * Change title/description (owners and designers), visibility (the author) and archived state
 * (owners; designers on their own designs). An archived design takes no edits but its archived flag.
 */
export async function updateDesign(userId: string, designId: string, input: UpdateInput): Promise<DesignDetailDto> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  const role = caller.roles.get(d.teamId) as Role;
  if (!canWrite(role)) throw forbidden(`a ${role} cannot change designs`);
  if (input.visibility !== undefined && !canShare(role, caller, d)) {
    throw forbidden("only the design's author can share it with the team or make it private");
  }
  if (input.archived !== undefined && !canManage(role, caller, d)) {
    throw forbidden("only the team's owners and the design's author can archive or restore it");
  }
  const editsContent = input.title !== undefined || input.description !== undefined;
  const willBeArchived = input.archived ?? d.archivedAt !== null;
  if (editsContent && willBeArchived) throw conflict('this design is archived; restore it before editing');
  const before = { title: d.title, description: d.description, visibility: d.visibility, archived: d.archivedAt !== null };
  if (input.title !== undefined) d.title = input.title;
  if (input.description !== undefined) d.description = input.description;
  if (input.visibility !== undefined) d.visibility = input.visibility;
  if (input.archived !== undefined) d.archivedAt = input.archived ? (d.archivedAt ?? new Date()) : null;
  await db().sequelize.transaction(async (transaction) => {
    await d.save({ transaction });
    // one audit row per kind of change that actually happened
    const audit = (action: 'design.updated' | 'design.shared' | 'design.archived' | 'design.restored', summary: Record<string, string | boolean>) =>
      recordAudit({ teamId: d.teamId, actorId: userId, action, targetType: 'design', targetId: d.id, summary: { title: d.title, ...summary } }, transaction);
    if (d.title !== before.title || d.description !== before.description) await audit('design.updated', { previousTitle: before.title, descriptionChanged: d.description !== before.description });
    if (d.visibility !== before.visibility) await audit('design.shared', { from: before.visibility, to: d.visibility });
    if ((d.archivedAt !== null) !== before.archived) await audit(d.archivedAt ? 'design.archived' : 'design.restored', {});
  });
  return detailDto(caller, await loadReadable(caller, designId));
}

/** Revision metadata, newest first. */
export async function listRevisions(userId: string, designId: string): Promise<RevisionSummaryDto[]> {
  const caller = await loadCaller(userId);
  await loadReadable(caller, designId);
  const { DesignRevision: R, User } = db().models;
  const rows = await R.findAll({ where: { designId }, attributes: { exclude: ['document'] }, include: [{ model: User, as: 'author' }], order: [['number', 'DESC']] });
  return rows.map(revisionSummaryDto);
}

/** Revision `number` of `d` with its document; 404 when it does not exist. */
export async function getRevisionOf(d: Pick<Design, 'id'>, number: number): Promise<RevisionDto> {
  const { DesignRevision: R, User } = db().models;
  const r = await R.findOne({ where: { designId: d.id, number }, include: [{ model: User, as: 'author' }] });
  if (!r) throw notFound('revision');
  return { ...revisionSummaryDto(r), document: checkedDocument(r) };
}

/** One revision with its document. `number` comes from the path (digits only, else 404). */
export async function getRevision(userId: string, designId: string, number: string): Promise<RevisionDto> {
  if (!/^[1-9][0-9]{0,8}$/.test(number)) throw notFound('revision');
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  return getRevisionOf(d, Number(number));
}

/**
 * Append revision `base + 1` to a design inside `transaction`: claim the number with the
 * conditional UPDATE (see the file comment), copy topology and stages, mark an approved design
 * 'changed_since_approval', and insert the revision. A stale `base` (or an archived design)
 * answers 409 with the current number and writes nothing. Saves and accepted offers both go here.
 */
export async function appendRevision(
  designId: string,
  base: number,
  document: DesignDocument,
  authorId: string,
  message: string,
  transaction: Transaction,
): Promise<DesignRevision> {
  const { topology, stages } = summariseTopology(document);
  const { sequelize } = db();
  const claimed = await sequelize.query<{ latest_revision: number }>(
    `UPDATE designs SET latest_revision = latest_revision + 1, topology = :topology, stages = :stages, updated_at = now(),
       status = CASE WHEN status = 'approved' THEN 'changed_since_approval'::"enum_designs_status" ELSE status END
     WHERE id = :id AND latest_revision = :base AND archived_at IS NULL RETURNING latest_revision`,
    { replacements: { id: designId, base, topology, stages }, type: QueryTypes.SELECT, transaction },
  );
  if (claimed.length === 0) {
    const current = await sequelize.query<{ latest_revision: number; archived_at: Date | null }>('SELECT latest_revision, archived_at FROM designs WHERE id = :id', {
      replacements: { id: designId },
      type: QueryTypes.SELECT,
      transaction,
    });
    if (current[0]?.archived_at) throw conflict('this design is archived; restore it before saving');
    const latest = current[0]?.latest_revision ?? base;
    throw new AppError('conflict', `revision ${base} is not the latest (${latest} is); reload, merge your changes and save again`, {
      latestRevision: latest,
    });
  }
  return insertRevision(designId, claimed[0].latest_revision, document, authorId, message, transaction);
}

/** Save a new revision on top of `baseRevision` (owners and designers); stale base → 409. */
export async function saveRevision(userId: string, designId: string, input: SaveInput): Promise<RevisionSummaryDto> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  requireRole(caller, d.teamId, WRITER_ROLES, 'design');
  if (d.archivedAt) throw conflict('this design is archived; restore it before saving');
  const r = await db().sequelize.transaction(async (transaction) => {
    const saved = await appendRevision(designId, input.baseRevision, input.document, userId, input.message ?? '', transaction);
    await recordAudit({ teamId: d.teamId, actorId: userId, action: 'revision.saved', targetType: 'revision', targetId: saved.id, summary: { designId, number: saved.number, baseRevision: input.baseRevision } }, transaction);
    return saved;
  });
  return revisionSummaryDto(r);
}

/**
 * Fork: copy revision `revision` (default latest) of a design the caller can read into a new
 * design they author in `teamId` (default the parent's team, where they must be owner or
 * designer). The parent is not touched. A 'forked' event goes to the feed (no mail).
 */
export async function forkDesign(userId: string, designId: string, input: ForkInput): Promise<DesignDetailDto> {
  const caller = await loadCaller(userId);
  const parent = await loadReadable(caller, designId);
  const teamId = input.teamId ?? parent.teamId;
  requireRole(caller, teamId, WRITER_ROLES);
  const number = input.revision ?? parent.latestRevision;
  const source = await getRevisionOf(parent, number);
  const { sequelize, models } = db();
  const { topology, stages } = summariseTopology(source.document);
  const forkId = await sequelize.transaction(async (transaction) => {
    const f = await models.Design.create(
      {
        teamId,
        authorId: userId,
        title: input.title ?? `${parent.title} (fork)`.slice(0, 120),
        description: parent.description,
        visibility: 'team',
        archivedAt: null,
        forkedFromDesignId: parent.id,
        forkedFromRevision: number,
        latestRevision: 1,
        topology,
        stages,
      },
      { transaction },
    );
    await insertRevision(f.id, 1, source.document, userId, `Forked from ${parent.title} r${number}`.slice(0, 500), transaction);
    await recordAudit({ teamId, actorId: userId, action: 'design.forked', targetType: 'design', targetId: f.id, summary: { title: f.title, fromDesignId: parent.id, fromRevision: number } }, transaction);
    // feed only (no mail): addressed to the parent's author when they can open the fork
    const actor = userDto(await models.User.findByPk(userId, { transaction })).name;
    const parentAuthor = await loadCaller(parent.authorId, transaction);
    await recordActivity(
      {
        kind: 'forked',
        teamId,
        designId: f.id,
        actorId: userId,
        summary: `${actor} forked "${parent.title}" r${number} as "${f.title}"`,
        path: `/designs/${f.id}`,
        recipients: readable(parentAuthor, f) ? [parent.authorId] : [],
      },
      transaction,
    );
    return f.id;
  });
  return detailDto(caller, await loadReadable(caller, forkId));
}
