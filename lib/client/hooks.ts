'use client';
/**
 * react-query hooks, one per API route of the contract. Reads are `useQuery` with stable keys
 * (see `keys`); writes are `useMutation` and invalidate the reads they change.
 */
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role, Visibility } from '@/lib/api/contract';
import type { DesignDocumentInput } from '@/lib/circuit/document/schema';
import { api } from './api';

/** Query keys, grouped so one invalidation reaches every list under a prefix. */
export const keys = {
  me: ['me'] as const,
  teams: ['teams'] as const,
  team: (teamId: string) => ['teams', teamId] as const,
  members: (teamId: string) => ['teams', teamId, 'members'] as const,
  invitations: (teamId: string) => ['teams', teamId, 'invitations'] as const,
  designs: (teamId: string) => ['teams', teamId, 'designs'] as const,
  designList: (teamId: string, q: DesignListParams) => ['teams', teamId, 'designs', q] as const,
  design: (designId: string) => ['designs', designId] as const,
  revisions: (designId: string) => ['designs', designId, 'revisions'] as const,
  revision: (designId: string, n: number) => ['designs', designId, 'revisions', n] as const,
  invitation: (token: string) => ['invitations', token] as const,
};

/** Search and sort of the designs list (see `designListQuerySchema`). */
export interface DesignListParams {
  q?: string;
  sort?: 'updated' | 'title' | 'author' | 'status';
  archived?: boolean;
}

// ---- reads ----

/** The signed-in user and their teams (`GET /api/me`). */
export function useMe() {
  return useQuery({ queryKey: keys.me, queryFn: ({ signal }) => api('GET /api/me', { signal }) });
}

/** My teams with my role in each (`GET /api/teams`). */
export function useTeams() {
  return useQuery({ queryKey: keys.teams, queryFn: ({ signal }) => api('GET /api/teams', { signal }) });
}

/** One team with my role in it; 404 for non-members (`GET /api/teams/:teamId`). */
export function useTeam(teamId: string) {
  return useQuery({
    queryKey: keys.team(teamId),
    queryFn: ({ signal }) => api('GET /api/teams/:teamId', { params: { teamId }, signal }),
  });
}

/** Members of a team with their roles (`GET /api/teams/:teamId/members`). */
export function useMembers(teamId: string) {
  return useQuery({
    queryKey: keys.members(teamId),
    queryFn: ({ signal }) => api('GET /api/teams/:teamId/members', { params: { teamId }, signal }),
  });
}

/** Pending and past invitations; only owners may list them, so pass `enabled` from the role. */
export function useInvitations(teamId: string, enabled: boolean) {
  return useQuery({
    queryKey: keys.invitations(teamId),
    queryFn: ({ signal }) => api('GET /api/teams/:teamId/invitations', { params: { teamId }, signal }),
    enabled,
  });
}

/** A team's designs, searched and sorted by the server; keeps the previous list while a new search loads. */
export function useDesigns(teamId: string, q: DesignListParams) {
  return useQuery({
    queryKey: keys.designList(teamId, q),
    queryFn: ({ signal }) =>
      api('GET /api/teams/:teamId/designs', {
        params: { teamId },
        query: { q: q.q?.trim() || undefined, sort: q.sort, archived: q.archived ? 'true' : undefined },
        signal,
      }),
    placeholderData: keepPreviousData,
  });
}

/** One design with its permissions and its latest revision (document included). */
export function useDesign(designId: string) {
  return useQuery({
    queryKey: keys.design(designId),
    queryFn: ({ signal }) => api('GET /api/designs/:designId', { params: { designId }, signal }),
  });
}

/** Revision history of a design, newest first as the server sends it. */
export function useRevisions(designId: string) {
  return useQuery({
    queryKey: keys.revisions(designId),
    queryFn: ({ signal }) => api('GET /api/designs/:designId/revisions', { params: { designId }, signal }),
  });
}

/** One stored revision with its document; disabled while `n` is null. */
export function useRevision(designId: string, n: number | null) {
  return useQuery({
    queryKey: keys.revision(designId, n ?? 0),
    queryFn: ({ signal }) =>
      api('GET /api/designs/:designId/revisions/:number', { params: { designId, number: String(n) }, signal }),
    enabled: n !== null,
  });
}

/** What an invitation link is for; public, the token is the secret. */
export function useInvitationPreview(token: string) {
  return useQuery({
    queryKey: keys.invitation(token),
    queryFn: ({ signal }) => api('GET /api/invitations/:token', { params: { token }, signal }),
    retry: false,
  });
}

// ---- writes ----

/** Creates an account (`POST /api/account/signup`); 409 when the e-mail is taken. */
export function useSignUp() {
  return useMutation({
    mutationFn: (body: { email: string; name: string; password: string }) => api('POST /api/account/signup', { body }),
  });
}

/** Changes my password; the current one is checked by the server. */
export function useChangePassword() {
  return useMutation({
    mutationFn: (body: { currentPassword: string; newPassword: string }) => api('POST /api/account/password', { body }),
  });
}

/** Creates a team with me as owner. */
export function useCreateTeam() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { name: string }) => api('POST /api/teams', { body }),
    onSuccess: async () => {
      await Promise.all([qc.invalidateQueries({ queryKey: keys.teams }), qc.invalidateQueries({ queryKey: keys.me })]);
    },
  });
}

/** Owner: invites an e-mail address with a role (the server mails the accept link). */
export function useInvite(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; role: Role }) =>
      api('POST /api/teams/:teamId/invitations', { params: { teamId }, body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.invitations(teamId) }),
  });
}

/** Owner: revokes a pending invitation. */
export function useRevokeInvitation(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: string) =>
      api('DELETE /api/teams/:teamId/invitations/:invitationId', { params: { teamId, invitationId } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.invitations(teamId) }),
  });
}

/** Owner: changes a member's role; the last owner cannot be demoted (409 `last_owner`). */
export function useChangeRole(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { userId: string; role: Role }) =>
      api('PATCH /api/teams/:teamId/members/:userId', { params: { teamId, userId: v.userId }, body: { role: v.role } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.team(teamId) }),
  });
}

/** Removes a member; with the caller's own id this is "leave team". */
export function useRemoveMember(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (userId: string) => api('DELETE /api/teams/:teamId/members/:userId', { params: { teamId, userId } }),
    onSuccess: async () => {
      await Promise.all([qc.invalidateQueries({ queryKey: keys.teams }), qc.invalidateQueries({ queryKey: keys.me })]);
    },
  });
}

/** Accepts an invitation as the signed-in user (whose e-mail must match). */
export function useAcceptInvitation(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api('POST /api/invitations/:token/accept', { params: { token } }),
    onSuccess: async () => {
      await Promise.all([
        qc.invalidateQueries({ queryKey: keys.teams }),
        qc.invalidateQueries({ queryKey: keys.me }),
        qc.invalidateQueries({ queryKey: keys.invitation(token) }),
      ]);
    },
  });
}

/** Creates a design with its first revision from a document. */
export function useCreateDesign(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { title: string; description?: string; visibility?: Visibility; document: DesignDocumentInput; message?: string }) =>
      api('POST /api/teams/:teamId/designs', { params: { teamId }, body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.designs(teamId) }),
  });
}

/** Renames, shares/unshares or archives a design. */
export function useUpdateDesign(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { title?: string; description?: string; visibility?: Visibility; archived?: boolean }) =>
      api('PATCH /api/designs/:designId', { params: { designId }, body }),
    onSuccess: async (res) => {
      await Promise.all([
        qc.invalidateQueries({ queryKey: keys.design(designId) }),
        qc.invalidateQueries({ queryKey: keys.designs(res.design.teamId) }),
      ]);
    },
  });
}

/** Copies a design (latest or a chosen revision) into a new design I own. */
export function useForkDesign(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { revision?: number; title?: string; teamId?: string }) =>
      api('POST /api/designs/:designId/fork', { params: { designId }, body }),
    onSuccess: async (res) => {
      await Promise.all([
        qc.invalidateQueries({ queryKey: keys.design(designId) }),
        qc.invalidateQueries({ queryKey: keys.designs(res.design.teamId) }),
      ]);
    },
  });
}

/**
 * Saves the editor's document as a new revision on top of `baseRevision`. A colleague's newer
 * save answers 409 with `ApiError.latestRevision` (the editor offers reload/compare).
 */
export function useSaveRevision(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { baseRevision: number; document: DesignDocumentInput; message?: string }) =>
      api('POST /api/designs/:designId/revisions', { params: { designId }, body }),
    onSuccess: async () => {
      await Promise.all([qc.invalidateQueries({ queryKey: keys.design(designId) }), qc.invalidateQueries({ queryKey: keys.revisions(designId) })]);
    },
  });
}
