/**
 * The HTTP API's shapes, shared by the route handlers (server) and the client hooks. Request
 * bodies are zod schemas (every boundary is validated); responses are plain DTO types.
 * Errors always have the shape `{ error: { code, message, field? } }` (see lib/errors.ts).
 */
import { z } from 'zod';
import { designDocumentSchema } from '@/lib/circuit/document/schema';

export const ROLES = ['owner', 'designer', 'reviewer', 'viewer'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

export const DESIGN_STATUSES = ['draft', 'in_review', 'approved', 'changes_requested'] as const;
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
  permissions: { edit: boolean; fork: boolean; share: boolean; archive: boolean };
  forks: { designId: string; title: string; author: UserDto; revision: number }[];
}
export interface RevisionSummaryDto { number: number; message: string; author: UserDto; createdAt: string }
export interface RevisionDto extends RevisionSummaryDto { document: z.infer<typeof designDocumentSchema> }

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
  'POST /api/account/signup': { user: UserDto };
  'POST /api/account/password': { ok: true };
}

/** The error body every route returns on failure. */
export interface ApiErrorBody { error: { code: string; message: string; field?: string; latestRevision?: number } }
