/**
 * The audit log: who changed, shared, approved or removed what, one row per action, written by
 * `recordAudit` inside the action's own transaction (a rolled-back action leaves no row; a
 * committed one always has its row). The table is append-only (a trigger refuses UPDATE,
 * DELETE and TRUNCATE). Summaries carry names, numbers and states — never passwords, tokens,
 * hashes or design documents. Team owners read their team's log, newest first, in pages.
 */
import 'server-only';
import { Op, type Transaction } from 'sequelize';
import { z } from '../circuit/zod';
import { db } from '../db';
import type { AuditTargetType } from '../../models/audit-event';
import { loadCaller, requireRole } from './access';
import { userDto } from './dto';

/** The actions the log records (`part.*` once parts exist). */
export const AUDIT_ACTIONS = [
  'design.created',
  'design.updated',
  'design.shared',
  'design.archived',
  'design.restored',
  'design.deleted',
  'design.forked',
  'revision.saved',
  'review.requested',
  'review.approved',
  'review.changes_requested',
  'review.withdrawn',
  'offer.accepted',
  'offer.declined',
  'member.role_changed',
  'member.removed',
  'member.joined',
  'invitation.sent',
  'invitation.revoked',
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number] | `part.${string}`;

/** Keys a summary may never hold (defence in depth: callers pass only plain facts). */
const SECRET_KEY = /pass|token|hash|secret|cookie|document/i;

export interface AuditInput {
  teamId: string;
  actorId: string;
  action: AuditAction;
  targetType: AuditTargetType;
  targetId: string;
  summary?: Record<string, string | number | boolean | null>;
}

/** Write one audit row inside `transaction` (required: the row belongs to the action's commit). */
export async function recordAudit(input: AuditInput, transaction: Transaction): Promise<void> {
  const summary: Record<string, string | number | boolean | null> = {};
  for (const [k, v] of Object.entries(input.summary ?? {})) {
    if (SECRET_KEY.test(k)) throw new Error(`audit summary key "${k}" looks like a secret`);
    summary[k] = typeof v === 'string' ? v.slice(0, 300) : v;
  }
  await db().models.AuditEvent.create(
    { teamId: input.teamId, actorId: input.actorId, action: input.action, targetType: input.targetType, targetId: input.targetId, summary },
    { transaction },
  );
}

/** Query of GET /api/teams/[teamId]/audit: `before` is the id of the oldest row already shown. */
export const auditQuerySchema = z.object({
  before: z.string().regex(/^[1-9][0-9]{0,17}$/, 'an audit event id').optional(),
  limit: z.coerce.number().int().min(1).max(200).optional(),
  action: z.string().regex(/^[a-z_]+(\.[a-z_]+)?$/, 'an action such as revision.saved or a prefix such as review').optional(),
});
export type AuditQuery = z.output<typeof auditQuerySchema>;

export interface AuditEventDto {
  id: string;
  action: string;
  actor: { id: string; name: string; email: string };
  target: { type: string; id: string };
  summary: Record<string, unknown>;
  createdAt: string;
}

/** One page of a team's audit log, newest first (owners only; outsiders 404, other roles 403). */
export async function listAudit(userId: string, teamId: string, query: AuditQuery): Promise<{ events: AuditEventDto[]; nextBefore: string | null }> {
  requireRole(await loadCaller(userId), teamId, ['owner']);
  const { AuditEvent, User } = db().models;
  const limit = query.limit ?? 50;
  const where: Record<string | symbol, unknown> = { teamId };
  if (query.before) where.id = { [Op.lt]: query.before };
  if (query.action) where.action = query.action.includes('.') ? query.action : { [Op.like]: `${query.action}.%` };
  const rows = await AuditEvent.findAll({ where, order: [['id', 'DESC']], limit: limit + 1 });
  const page = rows.slice(0, limit);
  const actors = new Map((await User.findAll({ where: { id: [...new Set(page.map((r) => r.actorId))] } })).map((u) => [u.id, u]));
  return {
    events: page.map((r) => ({
      id: String(r.id),
      action: r.action,
      actor: userDto(actors.get(r.actorId)),
      target: { type: r.targetType, id: r.targetId },
      summary: r.summary,
      createdAt: r.createdAt.toISOString(),
    })),
    nextBefore: rows.length > limit ? String(page[page.length - 1].id) : null,
  };
}
