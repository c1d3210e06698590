/**
 * The activity feed and the notification mail that goes with it.
 *
 * `recordActivity` writes one event (kind, team, design, actor, a one-line summary and the app
 * path of the exact place) and its recipients inside the caller's transaction; once that
 * transaction commits, each recipient who has not turned the mail kind off gets a mail with the
 * link. A rolled-back action therefore neither shows in the feed nor sends mail. Mail is sent in
 * the background so a slow SMTP server never holds a request; a failed send is logged and the
 * event stays in the feed. `flushMail` waits for the sends in flight (tests, scripts).
 *
 * The feed shows a user the events of their teams' designs they can read, and every event
 * addressed to them; an invitation shows only to the person invited.
 */
import 'server-only';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { MAIL_KINDS, type ActivityDto, type ActivityKind, type activityQuerySchema, type MailKind, type NotificationSettingsDto } from '../api/contract';
import { db } from '../db';
import { env } from '../env';
import { notificationMessage, sendMail } from '../mail';
import { loadCaller, requireMember } from './access';
import { userDto } from './dto';

export interface ActivityInput {
  kind: ActivityKind;
  teamId: string;
  designId?: string | null;
  actorId: string;
  summary: string;
  /** App path of the exact place, starting with `/`. */
  path: string;
  /** Users the event is addressed to; the actor is never among them. */
  recipients: string[];
  /** The mail to send each recipient who has not turned `mail.kind` off. */
  mail?: { kind: MailKind; subject: string; lines: string[]; button?: string };
}

const inFlight = new Set<Promise<void>>();

/** Absolute URL of an app path. */
export function appUrl(path: string): string {
  return `${env().NEXTAUTH_URL.replace(/\/$/, '')}${path}`;
}

/** The users among `userIds` who turned mail `kind` off. */
export async function mutedAmong(userIds: string[], kind: MailKind, transaction?: Transaction): Promise<Set<string>> {
  if (userIds.length === 0) return new Set();
  const rows = await db().models.NotificationSetting.findAll({ where: { userId: userIds, muted: { [Op.contains]: [kind] } }, transaction });
  return new Set(rows.map((r) => r.userId));
}

async function deliver(input: ActivityInput, recipients: string[]): Promise<void> {
  const mail = input.mail;
  if (!mail || recipients.length === 0) return;
  const { User } = db().models;
  const muted = await mutedAmong(recipients, mail.kind);
  const users = await User.findAll({ where: { id: recipients.filter((id) => !muted.has(id)) } });
  const url = appUrl(input.path);
  const settingsUrl = appUrl('/settings/notifications');
  for (const u of users) {
    try {
      await sendMail(notificationMessage({ to: u.email, subject: mail.subject, lines: mail.lines, url, button: mail.button ?? 'Open in Kilorung', settingsUrl }));
    } catch (e) {
      console.error(`[mail] ${mail.kind} to user ${u.id} not sent: ${(e as Error).message}`);
    }
  }
}

function queueDelivery(input: ActivityInput, recipients: string[]): void {
  const p = deliver(input, recipients).catch((e: unknown) => console.error(`[mail] ${input.kind}: ${(e as Error).message}`));
  inFlight.add(p);
  void p.finally(() => inFlight.delete(p));
}

/** Record an event (and queue its mail for after `transaction` commits). Returns the event id. */
export async function recordActivity(input: ActivityInput, transaction?: Transaction): Promise<string> {
  const { ActivityEvent, ActivityRecipient } = db().models;
  const recipients = [...new Set(input.recipients)].filter((id) => id !== input.actorId);
  const event = await ActivityEvent.create(
    { kind: input.kind, teamId: input.teamId, designId: input.designId ?? null, actorId: input.actorId, summary: input.summary.slice(0, 500), path: input.path.slice(0, 500) },
    { transaction },
  );
  if (recipients.length > 0) await ActivityRecipient.bulkCreate(recipients.map((userId) => ({ eventId: event.id, userId })), { transaction });
  if (transaction) transaction.afterCommit(() => queueDelivery(input, recipients));
  else queueDelivery(input, recipients);
  return event.id;
}

/** Wait until every mail queued so far has been handed to the SMTP server (or failed). */
export async function flushMail(): Promise<void> {
  while (inFlight.size > 0) await Promise.all([...inFlight]);
}

type ActivityQuery = z.output<typeof activityQuerySchema>;

interface FeedRow {
  id: string;
  kind: ActivityKind;
  team_id: string;
  design_id: string | null;
  design_title: string | null;
  actor_id: string;
  actor_name: string | null;
  actor_email: string;
  summary: string;
  path: string;
  for_you: boolean;
  created_at: Date;
}

/** The caller's feed, newest first: `limit` (default 50) events before `before`, optionally one team. */
export async function listActivity(userId: string, query: ActivityQuery): Promise<ActivityDto[]> {
  const caller = await loadCaller(userId);
  if (query.teamId) requireMember(caller, query.teamId);
  const teamIds = query.teamId ? [query.teamId] : [...caller.roles.keys()];
  const rows = await db().sequelize.query<FeedRow>(
    `SELECT e.id, e.kind, e.team_id, e.design_id, d.title AS design_title, e.actor_id, u.name AS actor_name, u.email AS actor_email,
            e.summary, e.path, (r.user_id IS NOT NULL) AS for_you, e.created_at
       FROM activity_events e
       JOIN users u ON u.id = e.actor_id
       LEFT JOIN designs d ON d.id = e.design_id
       LEFT JOIN activity_recipients r ON r.event_id = e.id AND r.user_id = :userId
      WHERE (r.user_id IS NOT NULL
             OR (e.team_id IN (:teamIds) AND e.kind <> 'invitation'
                 AND (d.id IS NULL OR d.visibility = 'team' OR d.author_id = :userId)))
        AND (:teamId::uuid IS NULL OR e.team_id = :teamId::uuid)
        AND (:before::timestamptz IS NULL OR e.created_at < :before::timestamptz)
      ORDER BY e.created_at DESC, e.id DESC
      LIMIT :limit`,
    {
      replacements: { userId, teamIds: teamIds.length > 0 ? teamIds : ['00000000-0000-0000-0000-000000000000'], teamId: query.teamId ?? null, before: query.before ?? null, limit: query.limit ?? 50 },
      type: QueryTypes.SELECT,
    },
  );
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    teamId: r.team_id,
    design: r.design_id ? { id: r.design_id, title: r.design_title ?? '' } : null,
    actor: userDto({ id: r.actor_id, name: r.actor_name, email: r.actor_email }),
    summary: r.summary,
    path: r.path,
    forYou: r.for_you,
    createdAt: new Date(r.created_at).toISOString(),
  }));
}

/** The caller's mail switches (every kind on unless turned off). */
export async function getNotificationSettings(userId: string): Promise<NotificationSettingsDto> {
  const row = await db().models.NotificationSetting.findByPk(userId);
  const muted = new Set(row?.muted ?? []);
  return Object.fromEntries(MAIL_KINDS.map((k) => [k, !muted.has(k)])) as NotificationSettingsDto;
}

/** Replace the caller's mail switches. */
export async function putNotificationSettings(userId: string, settings: NotificationSettingsDto): Promise<NotificationSettingsDto> {
  const muted = MAIL_KINDS.filter((k) => !settings[k]);
  await db().models.NotificationSetting.upsert({ userId, muted });
  return getNotificationSettings(userId);
}
