/**
 * Invitations. An owner invites an address with a role; the mail carries
 * `${NEXTAUTH_URL}/invitations/${token}` with a random 256-bit token of which only the SHA-256
 * is stored. Anyone holding the link may preview it; accepting needs a signed-in user with the
 * invited address. Invitations last INVITATION_TTL_MS and work once.
 */
import 'server-only';
import { createHash, randomBytes } from 'node:crypto';
import { Op } from 'sequelize';
import type { InvitationDto, InvitationPreviewDto, Role } from '../api/contract';
import { db } from '../db';
import { env } from '../env';
import { AppError, conflict, forbidden, notFound } from '../errors';
import { invitationMessage, sendMail } from '../mail';
import { loadCaller, requireRole } from './access';
import { mutedAmong, recordActivity } from './activity';
import { recordAudit } from './audit';
import { invitationDto, userDto } from './dto';

/** How long an invitation stays valid (ms): 7 days. */
export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

/** Hex SHA-256 of an invitation token (what the database keeps). */
export function hashInvitationToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** The team's invitations, newest first (owner only). */
export async function listInvitations(userId: string, teamId: string): Promise<InvitationDto[]> {
  requireRole(await loadCaller(userId), teamId, ['owner']);
  const { Invitation, User } = db().models;
  const rows = await Invitation.findAll({ where: { teamId }, include: [{ model: User, as: 'invitedBy' }], order: [['createdAt', 'DESC']] });
  return rows.map(invitationDto);
}

/**
 * Invite `email` with `role` (owner only) and mail the accept link. 409 `exists` when the
 * address already belongs to a member; an older pending invitation for the same address is
 * replaced. When the address belongs to an existing user, an 'invitation' event addressed to
 * them alone carries the same link, and no mail is sent if they turned invitation mail off.
 */
export async function createInvitation(userId: string, teamId: string, email: string, role: Role): Promise<InvitationDto> {
  requireRole(await loadCaller(userId), teamId, ['owner']);
  const { sequelize, models } = db();
  const address = email.toLowerCase();
  const existingUser = await models.User.findOne({ where: { email: address }, attributes: ['id'] });
  if (existingUser && (await models.Membership.findOne({ where: { teamId, userId: existingUser.id }, attributes: ['id'] }))) {
    throw new AppError('exists', `${address} is already a member of this team`, { field: 'email' });
  }
  const token = randomBytes(32).toString('base64url');
  const [team, inviter] = await Promise.all([models.Team.findByPk(teamId), models.User.findByPk(userId)]);
  const muted = existingUser ? (await mutedAmong([existingUser.id], 'invitation')).has(existingUser.id) : false;
  const { invitation, eventId } = await sequelize.transaction(async (transaction) => {
    await models.Invitation.destroy({ where: { teamId, email: address, acceptedAt: null }, transaction });
    const created = await models.Invitation.create(
      { teamId, email: address, role, tokenHash: hashInvitationToken(token), invitedById: userId, expiresAt: new Date(Date.now() + INVITATION_TTL_MS), acceptedAt: null, acceptedById: null },
      { transaction },
    );
    await recordAudit({ teamId, actorId: userId, action: 'invitation.sent', targetType: 'invitation', targetId: created.id, summary: { email: address, role } }, transaction);
    // someone who already has an account also finds the invitation in their activity feed (shown
    // to them alone); the replaced invitation's event, whose link no longer works, goes
    if (existingUser) {
      await sequelize.query(
        `DELETE FROM activity_events e USING activity_recipients r
          WHERE r.event_id = e.id AND r.user_id = :userId AND e.team_id = :teamId AND e.kind = 'invitation'`,
        { replacements: { userId: existingUser.id, teamId }, transaction },
      );
    }
    const event = existingUser
      ? await recordActivity(
          {
            kind: 'invitation',
            teamId,
            designId: null,
            actorId: userId,
            summary: `${userDto(inviter).name} invited you to join "${team?.name ?? 'a team'}" as ${role}`,
            path: `/invitations/${token}`,
            recipients: [existingUser.id],
          },
          transaction,
        )
      : null;
    return { invitation: created, eventId: event };
  });
  invitation.invitedBy = inviter ?? undefined;
  const url = `${env().NEXTAUTH_URL.replace(/\/$/, '')}/invitations/${token}`;
  if (!muted) {
    try {
      await sendMail(invitationMessage({ to: address, url, teamName: team?.name ?? 'a team', inviterName: userDto(inviter).name, role, expiresAt: invitation.expiresAt }));
    } catch (e) {
      // an invitation nobody can receive is useless: take it back and report the failure
      await invitation.destroy();
      await sequelize.transaction((transaction) =>
        recordAudit({ teamId, actorId: userId, action: 'invitation.revoked', targetType: 'invitation', targetId: invitation.id, summary: { email: address, reason: 'the invitation mail could not be sent' } }, transaction),
      );
      if (eventId) await models.ActivityEvent.destroy({ where: { id: eventId } });
      throw e;
    }
  }
  return invitationDto(invitation);
}

/** Withdraw a pending invitation (owner only). */
export async function revokeInvitation(userId: string, teamId: string, invitationId: string): Promise<void> {
  requireRole(await loadCaller(userId), teamId, ['owner']);
  const invitation = await db().models.Invitation.findOne({ where: { id: invitationId, teamId } });
  if (!invitation) throw notFound('invitation');
  if (invitation.acceptedAt) throw conflict('this invitation was already accepted');
  await invitation.destroy();
}

async function findByToken(token: string) {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) throw notFound('invitation');
  const { Invitation, Team, User } = db().models;
  const invitation = await Invitation.findOne({
    where: { tokenHash: hashInvitationToken(token) },
    include: [{ model: Team, as: 'team' }, { model: User, as: 'invitedBy' }],
  });
  if (!invitation) throw notFound('invitation');
  return invitation;
}

/** What the accept page shows; 404 unknown token, 410 `expired`. */
export async function previewInvitation(token: string): Promise<InvitationPreviewDto> {
  const i = await findByToken(token);
  if (!i.acceptedAt && i.expiresAt.getTime() < Date.now()) throw new AppError('expired', 'this invitation has expired; ask for a new one');
  return {
    teamId: i.teamId,
    teamName: i.team?.name ?? '',
    email: i.email,
    role: i.role,
    invitedBy: userDto(i.invitedBy).name,
    expiresAt: i.expiresAt.toISOString(),
    accepted: i.acceptedAt !== null,
  };
}

/**
 * Accept an invitation as `userId`: 403 when the caller's e-mail is not the invited one,
 * 410 when expired, 409 when already used or the caller is already a member.
 */
export async function acceptInvitation(userId: string, token: string): Promise<{ teamId: string; role: Role }> {
  const found = await findByToken(token);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const i = await models.Invitation.findByPk(found.id, { lock: transaction.LOCK.UPDATE, transaction });
    if (!i) throw notFound('invitation');
    const user = await models.User.findByPk(userId, { transaction });
    if (!user || user.email.toLowerCase() !== i.email) throw forbidden(`this invitation is for ${i.email}; sign in with that address`);
    if (i.acceptedAt) throw conflict('this invitation was already used');
    if (i.expiresAt.getTime() < Date.now()) throw new AppError('expired', 'this invitation has expired; ask for a new one');
    const already = await models.Membership.findOne({ where: { teamId: i.teamId, userId }, transaction });
    if (already) throw new AppError('exists', 'you are already a member of this team');
    await models.Membership.create({ teamId: i.teamId, userId, role: i.role }, { transaction });
    await recordAudit({ teamId: i.teamId, actorId: userId, action: 'member.joined', targetType: 'member', targetId: userId, summary: { role: i.role, invitationId: i.id } }, transaction);
    i.acceptedAt = new Date();
    i.acceptedById = userId;
    await i.save({ transaction });
    await models.Invitation.destroy({ where: { teamId: i.teamId, email: i.email, acceptedAt: null, id: { [Op.ne]: i.id } }, transaction });
    return { teamId: i.teamId, role: i.role };
  });
}
