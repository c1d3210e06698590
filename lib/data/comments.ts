/**
 * Comments on one revision of a design, pinned to the design, to a node (a net, by the name the
 * compiler gives it) or to a part (a block, or one part inside a stage block), with one level of
 * replies and resolve/reopen.
 *
 * Who may do what: anyone who can read the design lists its comments; owners, designers and
 * reviewers write, reply, resolve and reopen (viewers 403, outsiders 404). An archived design
 * takes no new comments and no resolve/reopen (409). A reply follows its parent's revision and
 * anchor, whatever the body says; only top-level comments are resolved.
 *
 * Mentions: `@Full Name` of a member of the design's team (lib/data/mentions.ts). Members named
 * who can read the design get a 'mention' event and mail (unless they turned mentions off). The
 * comment also makes a 'comment' event, addressed to the design's author and everyone who wrote
 * earlier in the thread (not to those already mentioned), without mail. Resolving or reopening
 * makes a 'comment_resolved' event for the comment's author, without mail.
 *
 * Links: every event of a comment points at `/designs/<designId>?revision=<n>&comment=<id>`,
 * where `<id>` is the thread's top-level comment, also for a reply (the thread is where the
 * reply is read).
 */
import 'server-only';
import { Op, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { CommentAnchor, CommentDto, Role, UserDto, commentListQuerySchema, createCommentSchema, updateCommentSchema } from '../api/contract';
import { compileDocument } from '../circuit/compile/compile';
import { designDocumentSchema, type DesignBlock, type DesignDocument } from '../circuit/document/schema';
import { db } from '../db';
import { conflict, invalid, notFound } from '../errors';
import { nodeLabels } from '../editor/engine/view-model';
import type { Comment, Design, Membership } from '../../models';
import { loadCaller, requireRole, type Caller } from './access';
import { recordActivity } from './activity';
import { loadReadable, readable } from './designs';
import { userDto } from './dto';
import { mentionedIds } from './mentions';

type CreateInput = z.output<typeof createCommentSchema>;
type UpdateInput = z.output<typeof updateCommentSchema>;
type ListQuery = z.output<typeof commentListQuerySchema>;

/** Roles that write, reply to, resolve and reopen comments. */
export const COMMENTER_ROLES: readonly Role[] = ['owner', 'designer', 'reviewer'];

/** App path of a comment thread: the design at the comment's revision, the thread focused. */
export function commentPath(designId: string, revision: number, threadId: string): string {
  return `/designs/${designId}?revision=${revision}&comment=${threadId}`;
}

/** The parts inside a stage block, by their key in the block's data, and how mails name them. */
const STAGE_PARTS: Record<string, string> = {
  pumpC: 'pumping C',
  smoothC: 'smoothing C',
  diodeA: 'diode A',
  diodeB: 'diode B',
  pump2C: 'second pumping C',
  diodeC: 'diode C',
  diodeD: 'diode D',
};
const FULL_WAVE_ONLY = new Set(['pump2C', 'diodeC', 'diodeD']);

/** Part keys a block holds: a stage's capacitors and diodes (full-wave adds three); other blocks are one part and have none. */
export function partKeysOf(block: DesignBlock): string[] {
  if (block.kind !== 'stage') return [];
  return Object.keys(STAGE_PARTS).filter((k) => block.data.variant === 'full' || !FULL_WAVE_ONLY.has(k));
}

function blockName(block: DesignBlock): string {
  return block.label?.trim() || block.id;
}

/**
 * Check `anchor` against the revision's document and describe it in words for mails and the
 * feed ("on the design", "on node y_s3 (Output +)", "on Stage 2 · pumping C", "on C3").
 * 422 on `anchor` when the block, part or node does not exist in that revision.
 */
export function checkAnchor(doc: DesignDocument, anchor: CommentAnchor, revision: number): string {
  if (anchor.kind === 'design') return 'on the design';
  if (anchor.kind === 'part') {
    const block = doc.blocks.find((b) => b.id === anchor.blockId);
    if (!block) throw invalid(`revision ${revision} has no block "${anchor.blockId}"`, 'anchor');
    if (anchor.part === undefined) return `on ${blockName(block)}`;
    const keys = partKeysOf(block);
    if (!keys.includes(anchor.part)) {
      throw invalid(
        keys.length === 0
          ? `${blockName(block)} is a single part; pin the comment to the block without naming a part`
          : `${blockName(block)} has no part "${anchor.part}" (it has ${keys.join(', ')})`,
        'anchor',
      );
    }
    return `on ${blockName(block)} · ${STAGE_PARTS[anchor.part]}`;
  }
  const compiled = compileDocument(doc);
  if (!compiled.ok) throw invalid(`revision ${revision} does not compile, so it has no nodes; pin the comment to a part or to the design`, 'anchor');
  const nodes = new Set<string>([...Object.keys(compiled.netlist.nodeOrigins ?? {}), ...compiled.netlist.elements.flatMap((e) => e.nodes)]);
  if (!nodes.has(anchor.node)) throw invalid(`revision ${revision} has no node "${anchor.node}"`, 'anchor');
  const label = nodeLabels(doc, compiled)[anchor.node];
  return label && label !== anchor.node ? `on node ${anchor.node} (${label})` : `on node ${anchor.node}`;
}

async function loadDocument(designId: string, revision: number, transaction?: Transaction): Promise<DesignDocument> {
  const r = await db().models.DesignRevision.findOne({ where: { designId, number: revision }, transaction });
  if (!r) throw invalid(`revision ${revision} does not exist`, 'revision');
  const parsed = designDocumentSchema.safeParse(r.document);
  if (!parsed.success) throw new Error(`stored revision ${designId} r${revision} fails the document schema: ${parsed.error.issues[0]?.message}`);
  return parsed.data;
}

/** May `role` resolve/reopen the comments of `d`? */
function canResolve(role: Role | undefined, d: Pick<Design, 'archivedAt'>): boolean {
  return role !== undefined && COMMENTER_ROLES.includes(role) && d.archivedAt === null;
}

const includeUsers = () => {
  const { User } = db().models;
  return [
    { model: User, as: 'author' },
    { model: User, as: 'resolvedBy' },
  ];
};

/** DTOs of `rows` (top-level comments and their replies, any order), threads oldest first. */
async function threadDtos(rows: Comment[], mayResolve: boolean): Promise<CommentDto[]> {
  const mentionIds = [...new Set(rows.flatMap((c) => c.mentionIds ?? []))];
  const users = mentionIds.length > 0 ? await db().models.User.findAll({ where: { id: mentionIds } }) : [];
  const byId = new Map<string, UserDto>(users.map((u) => [u.id, userDto(u)]));
  const sorted = [...rows].sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id.localeCompare(b.id));
  const one = (c: Comment, replies: CommentDto[]): CommentDto => ({
    id: c.id,
    designId: c.designId,
    revision: c.revision,
    parentId: c.parentId,
    author: userDto(c.author),
    body: c.body,
    anchor: c.anchor,
    mentions: (c.mentionIds ?? []).map((id) => byId.get(id)).filter((u): u is UserDto => u !== undefined),
    resolved: c.resolvedAt !== null,
    resolvedBy: c.resolvedAt !== null && c.resolvedById ? userDto(c.resolvedBy) : null,
    resolvedAt: c.resolvedAt ? c.resolvedAt.toISOString() : null,
    createdAt: c.createdAt.toISOString(),
    replies,
    canResolve: mayResolve && c.parentId === null,
  });
  const repliesOf = new Map<string, CommentDto[]>();
  for (const c of sorted) if (c.parentId) (repliesOf.get(c.parentId) ?? repliesOf.set(c.parentId, []).get(c.parentId)!).push(one(c, []));
  return sorted.filter((c) => c.parentId === null).map((c) => one(c, repliesOf.get(c.id) ?? []));
}

/** One thread (top-level comment with replies) as the caller sees it. */
async function threadDto(caller: Caller, d: Design, threadId: string): Promise<CommentDto> {
  const { Comment: C } = db().models;
  const rows = await C.findAll({ where: { designId: d.id, [Op.or]: [{ id: threadId }, { parentId: threadId }] }, include: includeUsers() });
  const [dto] = await threadDtos(rows, canResolve(caller.roles.get(d.teamId), d));
  if (!dto) throw notFound('comment');
  return dto;
}

/** The design's comments (any reader), optionally of one revision: threads oldest first, replies oldest first. */
export async function listComments(userId: string, designId: string, query: ListQuery): Promise<CommentDto[]> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  const rows = await db().models.Comment.findAll({
    where: { designId, ...(query.revision ? { revision: Number(query.revision) } : {}) },
    include: includeUsers(),
  });
  return threadDtos(rows, canResolve(caller.roles.get(d.teamId), d));
}

/** Those of `ids` who are members of the design's team now and can read it. */
function readersAmong(d: Design, members: Membership[], ids: string[]): string[] {
  const wanted = new Set(ids);
  return members.filter((m) => wanted.has(m.userId) && readable({ userId: m.userId, roles: new Map([[m.teamId, m.role]]) }, d)).map((m) => m.userId);
}

/** Write a comment or a reply (owners, designers, reviewers). Returns the new comment (a reply without replies of its own). */
export async function createComment(userId: string, designId: string, input: CreateInput): Promise<CommentDto> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  requireRole(caller, d.teamId, COMMENTER_ROLES, 'design');
  if (d.archivedAt) throw conflict('this design is archived; restore it before commenting');
  const { sequelize, models } = db();

  let revision = input.revision;
  let anchor: CommentAnchor = input.anchor;
  let parent: Comment | null = null;
  if (input.parentId) {
    parent = await models.Comment.findOne({ where: { id: input.parentId, designId } });
    if (!parent) throw invalid('the comment to reply to is not on this design', 'parentId');
    if (parent.parentId !== null) throw invalid('reply to the thread\u2019s first comment, not to a reply', 'parentId');
    revision = parent.revision;
    anchor = parent.anchor;
  }
  const where = checkAnchor(await loadDocument(designId, revision), anchor, revision);

  // only what mentions and recipients need (a team's member list can be long)
  const members = await models.Membership.findAll({
    where: { teamId: d.teamId },
    attributes: ['id', 'teamId', 'userId', 'role'],
    include: [{ model: models.User, as: 'user', attributes: ['id', 'name', 'email'] }],
  });
  const mentionIds = mentionedIds(
    input.body,
    members.map((m) => ({ id: m.userId, name: userDto(m.user).name })),
  );
  const actor = userDto(members.find((m) => m.userId === userId)?.user).name;
  const mentioned = readersAmong(d, members, mentionIds);

  const { commentId, threadId } = await sequelize.transaction(async (transaction) => {
    // a shared lock orders this insert with a concurrent archive of the design
    const locked = await models.Design.findByPk(designId, { lock: transaction.LOCK.SHARE, transaction });
    if (!locked) throw notFound('design');
    if (locked.archivedAt) throw conflict('this design is archived; restore it before commenting');
    const c = await models.Comment.create({ designId, revision, parentId: parent?.id ?? null, authorId: userId, body: input.body, anchor, mentionIds }, { transaction });
    const threadId = parent?.id ?? c.id;
    const path = commentPath(designId, revision, threadId);
    const earlier = parent
      ? [parent.authorId, ...(await models.Comment.findAll({ where: { parentId: parent.id }, attributes: ['authorId'], transaction })).map((r) => r.authorId)]
      : [];
    const notMentioned = readersAmong(d, members, [d.authorId, ...earlier]).filter((id) => !mentioned.includes(id));
    const what = parent ? 'replied to a comment' : 'commented';
    await recordActivity(
      { kind: 'comment', teamId: d.teamId, designId, actorId: userId, summary: `${actor} ${what} on "${d.title}" r${revision}, ${where}`, path, recipients: notMentioned },
      transaction,
    );
    if (mentioned.some((id) => id !== userId)) {
      const names = members.filter((m) => mentioned.includes(m.userId) && m.userId !== userId).map((m) => userDto(m.user).name);
      await recordActivity(
        {
          kind: 'mention',
          teamId: d.teamId,
          designId,
          actorId: userId,
          summary: `${actor} mentioned ${names.join(', ')} on "${d.title}" r${revision}, ${where}`,
          path,
          recipients: mentioned,
          mail: {
            kind: 'mention',
            subject: `You were mentioned on "${d.title}"`,
            lines: [`${actor} mentioned you in a comment on "${d.title}", revision ${revision}, ${where}:`, '', input.body, ''],
            button: 'Open the comment',
          },
        },
        transaction,
      );
    }
    return { commentId: c.id, threadId };
  });
  const thread = await threadDto(caller, d, threadId);
  if (commentId === threadId) return thread;
  const reply = thread.replies.find((r) => r.id === commentId);
  if (!reply) throw notFound('comment');
  return reply;
}

/**
 * Resolve or reopen a top-level comment (owners, designers, reviewers; a reply 422). A comment
 * the caller cannot see, through its design, is 404 'comment'. Asking for the state it already
 * has changes nothing and records nothing.
 */
export async function updateComment(userId: string, commentId: string, input: UpdateInput): Promise<CommentDto> {
  const { sequelize, models } = db();
  const caller = await loadCaller(userId);
  const found = await models.Comment.findByPk(commentId);
  if (!found) throw notFound('comment');
  const d = await models.Design.findByPk(found.designId);
  if (!d || !readable(caller, d)) throw notFound('comment');
  requireRole(caller, d.teamId, COMMENTER_ROLES, 'comment');
  if (found.parentId !== null) throw invalid('a reply cannot be resolved; resolve or reopen its thread', 'resolved');
  if (d.archivedAt) throw conflict('this design is archived; restore it before resolving or reopening comments');
  const actor = userDto(await models.User.findByPk(userId)).name;
  const authorMember = await models.Membership.findOne({ where: { teamId: d.teamId, userId: found.authorId } });
  const recipients = authorMember ? readersAmong(d, [authorMember], [found.authorId]) : [];
  await sequelize.transaction(async (transaction) => {
    const c = await models.Comment.findByPk(commentId, { lock: transaction.LOCK.UPDATE, transaction });
    if (!c) throw notFound('comment');
    if ((c.resolvedAt !== null) === input.resolved) return;
    await c.update(input.resolved ? { resolvedAt: new Date(), resolvedById: userId } : { resolvedAt: null, resolvedById: null }, { transaction });
    await recordActivity(
      {
        kind: 'comment_resolved',
        teamId: d.teamId,
        designId: d.id,
        actorId: userId,
        summary: `${actor} ${input.resolved ? 'resolved' : 'reopened'} a comment on "${d.title}" r${c.revision}`,
        path: commentPath(d.id, c.revision, c.id),
        recipients,
      },
      transaction,
    );
  });
  return threadDto(caller, d, commentId);
}
