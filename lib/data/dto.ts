/** Plain DTOs (lib/api/contract.ts) from model instances; nothing else leaves lib/data. */
import type { ApprovalDto, InvitationDto, MemberDto, ReviewDto, RevisionSummaryDto, UserDto } from '../api/contract';
import type { Approval, DesignRevision, Invitation, Membership, ReviewRequest, User } from '../../models';

/** A user as others see them. */
export function userDto(u: Pick<User, 'id' | 'name' | 'email'> | undefined | null): UserDto {
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

// reviews and offers

/** A review request with requestedBy, decidedBy and reviewers included. */
export function reviewDto(r: ReviewRequest): ReviewDto {
  return {
    id: r.id,
    designId: r.designId,
    revision: r.revision,
    requestedBy: userDto(r.requestedBy),
    reviewers: (r.reviewers ?? []).map(userDto).sort((a, b) => a.name.localeCompare(b.name)),
    note: r.note,
    state: r.state,
    createdAt: r.createdAt.toISOString(),
    decidedBy: r.decidedById ? userDto(r.decidedBy) : null,
    decidedAt: r.decidedAt ? r.decidedAt.toISOString() : null,
    decisionNote: r.decisionNote ?? null,
  };
}

/** An approval with approvedBy included. */
export function approvalDto(a: Approval): ApprovalDto {
  return { reviewId: a.reviewRequestId, revision: a.revision, approvedBy: userDto(a.approvedBy), approvedAt: a.createdAt.toISOString(), note: a.note };
}
