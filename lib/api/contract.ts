/**
 * The HTTP API's shapes, shared by the route handlers (server) and the client hooks. Request
 * bodies are zod schemas (every boundary is validated); responses are plain DTO types.
 * Errors always have the shape `{ error: { code, message, field? } }` (see lib/errors.ts).
 */
import { z } from '../circuit/zod';
import { designDocumentSchema } from '@/lib/circuit/document/schema';

export const ROLES = ['owner', 'designer', 'reviewer', 'viewer'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** 'changed_since_approval': a revision was saved after the approved one (the approval still names its revision). */
export const DESIGN_STATUSES = ['draft', 'in_review', 'approved', 'changes_requested', 'changed_since_approval'] as const;
export const designStatusSchema = z.enum(DESIGN_STATUSES);
export type DesignStatus = z.infer<typeof designStatusSchema>;

export const visibilitySchema = z.enum(['private', 'team']);
export type Visibility = z.infer<typeof visibilitySchema>;

/** Largest JSON body any route accepts (bytes); larger bodies answer 413. */
export const MAX_BODY_BYTES = 1_000_000;

const email = z.email().max(254).transform((s) => s.toLowerCase());
const password = z.string().min(10, 'at least 10 characters').max(200);
const name = z.string().trim().min(1, 'required').max(80);
const title = z.string().trim().min(1, 'required').max(120);
const description = z.string().max(4000);
const message = z.string().trim().max(500);

// ---- account ----
export const signUpSchema = z.object({ email, name, password });
export const passwordChangeSchema = z.object({ currentPassword: z.string().min(1).max(200), newPassword: password });

// ---- teams ----
export const createTeamSchema = z.object({ name });
export const inviteSchema = z.object({ email, role: roleSchema });
export const changeRoleSchema = z.object({ role: roleSchema });

// ---- designs ----
export const createDesignSchema = z.object({
  title,
  description: description.optional(),
  visibility: visibilitySchema.optional(),
  document: designDocumentSchema,
  message: message.optional(),
});
export const updateDesignSchema = z
  .object({
    title: title.optional(),
    description: description.optional(),
    visibility: visibilitySchema.optional(),
    archived: z.boolean().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export const saveRevisionSchema = z.object({
  /** The revision number the editor started from; a stale number answers 409. */
  baseRevision: z.int().min(1),
  document: designDocumentSchema,
  message: message.optional(),
});
export const forkSchema = z.object({
  /** Revision to fork from; default the latest. */
  revision: z.int().min(1).optional(),
  title: title.optional(),
  /** Team that will own the fork; default the parent's team. */
  teamId: z.uuid().optional(),
});
export const designListQuerySchema = z.object({
  q: z.string().max(120).optional(),
  sort: z.enum(['updated', 'title', 'author', 'status']).optional(),
  archived: z.enum(['true', 'false']).optional(),
});


// ---- reviews, approvals, offers back (issue 5) ----
const note = z.string().trim().max(2000);
export const requestReviewSchema = z.object({
  /** The revision to review (must exist). */
  revision: z.int().min(1),
  /** Team members with the reviewer or owner role, never the design's author. */
  reviewerIds: z.array(z.uuid()).min(1, 'pick at least one reviewer').max(10),
  note: note.optional(),
});
export const reviewDecisionSchema = z
  .object({ decision: z.enum(['approve', 'request_changes']), note: note.optional() })
  .refine((v) => v.decision === 'approve' || (v.note ?? '').length > 0, { message: 'say what needs to change', path: ['note'] });
export const offerBackSchema = z.object({
  /** The fork's revision to offer; default its latest. */
  revision: z.int().min(1).optional(),
  message: message.optional(),
});
export const offerDecisionSchema = z
  .object({
    decision: z.enum(['accept', 'decline']),
    /** Accept only: the parent's latest revision the owner compared against (stale → 409). */
    parentBaseRevision: z.int().min(1).optional(),
    note: note.optional(),
  })
  .refine((v) => v.decision === 'decline' || v.parentBaseRevision !== undefined, { message: 'compare against the latest revision first', path: ['parentBaseRevision'] });

// ---- comments (issue 5) ----
export const commentAnchorSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('design') }),
  /** A net, by the node name the compiler gives it (e.g. `out`, `n3`). */
  z.object({ kind: z.literal('node'), node: z.string().trim().min(1).max(64) }),
  /** A block, or one part inside it (`part` is the part's key in the block, e.g. `pumpC`). */
  z.object({ kind: z.literal('part'), blockId: z.string().trim().min(1).max(64), part: z.string().trim().min(1).max(64).optional() }),
]);
export type CommentAnchor = z.infer<typeof commentAnchorSchema>;
export const createCommentSchema = z.object({
  revision: z.int().min(1),
  /** Plain text (no markdown); `@Full Name` mentions a team member. */
  body: z.string().trim().min(1, 'required').max(4000),
  anchor: commentAnchorSchema,
  /** Reply to this top-level comment (anchor and revision then follow the parent). */
  parentId: z.uuid().optional(),
});
export const updateCommentSchema = z.object({ resolved: z.boolean() });
export const commentListQuerySchema = z.object({ revision: z.string().regex(/^[1-9][0-9]{0,8}$/).optional() });

// ---- activity and notification settings (issue 5) ----
/** Kinds of e-mail a user can turn off, one switch each. */
export const MAIL_KINDS = ['review_requested', 'review_decided', 'mention', 'fork_offered', 'invitation'] as const;
export type MailKind = (typeof MAIL_KINDS)[number];
export const notificationSettingsSchema = z.object({
  review_requested: z.boolean(),
  review_decided: z.boolean(),
  mention: z.boolean(),
  fork_offered: z.boolean(),
  invitation: z.boolean(),
});
export type NotificationSettingsDto = z.infer<typeof notificationSettingsSchema>;
export const ACTIVITY_KINDS = ['review_requested', 'review_decided', 'review_withdrawn', 'comment', 'mention', 'comment_resolved', 'fork_offered', 'offer_decided', 'invitation', 'forked'] as const;
export type ActivityKind = (typeof ACTIVITY_KINDS)[number];
export const activityQuerySchema = z.object({
  teamId: z.uuid().optional(),
  before: z.iso.datetime().optional(),
  limit: z.coerce.number().int().min(1).max(100).optional(),
});

// ---- DTOs ----
export interface UserDto { id: string; name: string; email: string }
export interface TeamDto { id: string; name: string; role: Role; memberCount: number }
export interface MeDto { user: UserDto; teams: TeamDto[] }
export interface MemberDto { userId: string; name: string; email: string; role: Role; joinedAt: string }
export interface InvitationDto { id: string; email: string; role: Role; invitedBy: string; createdAt: string; expiresAt: string; acceptedAt: string | null }
export interface InvitationPreviewDto { teamId: string; teamName: string; email: string; role: Role; invitedBy: string; expiresAt: string; accepted: boolean }

export interface DesignSummaryDto {
  id: string;
  teamId: string;
  title: string;
  description: string;
  author: UserDto;
  /** Recognised topology of the latest revision ('half-wave' | 'full-wave' | 'symmetric' | 'custom'), null when it did not compile. */
  topology: string | null;
  stages: number | null;
  status: DesignStatus;
  visibility: Visibility;
  archived: boolean;
  latestRevision: number;
  createdAt: string;
  updatedAt: string;
  forkedFrom: { designId: string; title: string; revision: number } | null;
}
export interface DesignDetailDto extends DesignSummaryDto {
  /** What the signed-in user may do, as decided by the server from their role. */
  permissions: {
    edit: boolean;
    fork: boolean;
    share: boolean;
    archive: boolean;
    /** Owners and designers, on a design that is not archived. */
    requestReview: boolean;
    /** Reviewers and owners who are not the design's author. */
    decideReview: boolean;
    /** Reviewers, designers and owners. */
    comment: boolean;
    /** The fork's author, when the design is a fork whose parent they can read. */
    offerBack: boolean;
  };
  forks: { designId: string; title: string; author: UserDto; revision: number }[];
  /** The latest approval (its revision may be older than latestRevision). */
  approval: ApprovalDto | null;
  /** The open review request, if any. */
  openReview: ReviewDto | null;
}
export interface RevisionSummaryDto { number: number; message: string; author: UserDto; createdAt: string }
export interface RevisionDto extends RevisionSummaryDto { document: z.infer<typeof designDocumentSchema> }


/** A review request and, once decided, its decision. */
export interface ReviewDto {
  id: string;
  designId: string;
  revision: number;
  requestedBy: UserDto;
  reviewers: UserDto[];
  note: string;
  state: 'open' | 'approved' | 'changes_requested' | 'withdrawn' | 'superseded';
  createdAt: string;
  decidedBy: UserDto | null;
  decidedAt: string | null;
  decisionNote: string | null;
}
/** The approval record: who approved which revision, when. Never changed, only superseded. */
export interface ApprovalDto { reviewId: string; revision: number; approvedBy: UserDto; approvedAt: string; note: string }
export interface CommentDto {
  id: string;
  designId: string;
  revision: number;
  parentId: string | null;
  author: UserDto;
  body: string;
  anchor: CommentAnchor;
  mentions: UserDto[];
  resolved: boolean;
  resolvedBy: UserDto | null;
  resolvedAt: string | null;
  createdAt: string;
  /** Top-level comments only: replies, oldest first. */
  replies: CommentDto[];
  /** May the caller resolve/reopen it (server-decided). */
  canResolve: boolean;
}
/** A fork's revision offered back to its parent. */
export interface OfferDto {
  id: string;
  fork: { designId: string; title: string; revision: number };
  parent: { designId: string; title: string; baseRevision: number };
  offeredBy: UserDto;
  message: string;
  state: 'open' | 'accepted' | 'declined' | 'withdrawn';
  createdAt: string;
  decidedBy: UserDto | null;
  decidedAt: string | null;
  decisionNote: string | null;
  /** Accepted: the parent revision it became. */
  resultingRevision: number | null;
  /** May the caller accept/decline it (parent's author or the parent team's owner). */
  canDecide: boolean;
}
export interface ActivityDto {
  id: string;
  kind: ActivityKind;
  teamId: string;
  design: { id: string; title: string } | null;
  actor: UserDto;
  summary: string;
  /** App path of the exact place, e.g. `/designs/ID?revision=3&comment=CID`. */
  path: string;
  /** The event names the caller (review asked of them, a mention, an offer to them…). */
  forYou: boolean;
  createdAt: string;
}

/** Response bodies, by route. */
export interface Api {
  'GET /api/me': MeDto;
  'GET /api/teams': { teams: TeamDto[] };
  'POST /api/teams': { team: TeamDto };
  'GET /api/teams/:teamId': { team: TeamDto };
  'GET /api/teams/:teamId/members': { members: MemberDto[] };
  'PATCH /api/teams/:teamId/members/:userId': { member: MemberDto };
  'DELETE /api/teams/:teamId/members/:userId': { ok: true };
  'GET /api/teams/:teamId/invitations': { invitations: InvitationDto[] };
  'POST /api/teams/:teamId/invitations': { invitation: InvitationDto };
  'DELETE /api/teams/:teamId/invitations/:invitationId': { ok: true };
  'GET /api/invitations/:token': { invitation: InvitationPreviewDto };
  'POST /api/invitations/:token/accept': { teamId: string; role: Role };
  'GET /api/teams/:teamId/designs': { designs: DesignSummaryDto[] };
  'POST /api/teams/:teamId/designs': { design: DesignDetailDto; revision: RevisionSummaryDto };
  'GET /api/designs/:designId': { design: DesignDetailDto; revision: RevisionDto };
  'PATCH /api/designs/:designId': { design: DesignDetailDto };
  'GET /api/designs/:designId/revisions': { revisions: RevisionSummaryDto[] };
  'POST /api/designs/:designId/revisions': { revision: RevisionSummaryDto };
  'GET /api/designs/:designId/revisions/:number': { revision: RevisionDto };
  'POST /api/designs/:designId/fork': { design: DesignDetailDto };
  'POST /api/designs/:designId/reviews': { review: ReviewDto; design: DesignDetailDto };
  'GET /api/designs/:designId/reviews': { reviews: ReviewDto[]; approval: ApprovalDto | null };
  'POST /api/designs/:designId/reviews/:reviewId/decision': { review: ReviewDto; design: DesignDetailDto };
  'DELETE /api/designs/:designId/reviews/:reviewId': { review: ReviewDto; design: DesignDetailDto };
  'POST /api/designs/:designId/offers': { offer: OfferDto };
  'GET /api/designs/:designId/offers': { incoming: OfferDto[]; outgoing: OfferDto[] };
  'POST /api/offers/:offerId/decision': { offer: OfferDto; revision: RevisionSummaryDto | null };
  'DELETE /api/offers/:offerId': { offer: OfferDto };
  'GET /api/designs/:designId/comments': { comments: CommentDto[] };
  'POST /api/designs/:designId/comments': { comment: CommentDto };
  'PATCH /api/comments/:commentId': { comment: CommentDto };
  'GET /api/activity': { events: ActivityDto[] };
  'GET /api/me/notifications': { settings: NotificationSettingsDto };
  'PUT /api/me/notifications': { settings: NotificationSettingsDto };
  'POST /api/account/signup': { user: UserDto };
  'POST /api/account/password': { ok: true };
}

/** The error body every route returns on failure. */
export interface ApiErrorBody { error: { code: string; message: string; field?: string; latestRevision?: number } }
