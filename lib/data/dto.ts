/** Plain DTOs (lib/api/contract.ts) from model instances; nothing else leaves lib/data. */
import type { InvitationDto, MemberDto, RevisionSummaryDto, UserDto } from '../api/contract';
import type { DesignRevision, Invitation, Membership, User } from '../../models';

/** A user as others see them. */
export function userDto(u: User | undefined | null): UserDto {
  if (!u) return { id: '', name: 'unknown', email: '' };
  return { id: u.id, name: u.name ?? u.email.split('@')[0], email: u.email };
}

/** A membership row with its user included. */
export function memberDto(m: Membership): MemberDto {
  const u = userDto(m.user);
  return { userId: m.userId, name: u.name, email: u.email, role: m.role, joinedAt: m.createdAt.toISOString() };
}

/** An invitation with its inviter included. */
export function invitationDto(i: Invitation): InvitationDto {
  return {
    id: i.id,
    email: i.email,
    role: i.role,
    invitedBy: userDto(i.invitedBy).name,
    createdAt: i.createdAt.toISOString(),
    expiresAt: i.expiresAt.toISOString(),
    acceptedAt: i.acceptedAt ? i.acceptedAt.toISOString() : null,
  };
}

/** A revision's metadata with its author included. */
export function revisionSummaryDto(r: DesignRevision): RevisionSummaryDto {
  return { number: r.number, message: r.message, author: userDto(r.author), createdAt: r.createdAt.toISOString() };
}
