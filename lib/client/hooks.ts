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

export function useMe() {
  return useQuery({ queryKey: keys.me, queryFn: ({ signal }) => api('GET /api/me', { signal }) });
}

export function useTeams() {
  return useQuery({ queryKey: keys.teams, queryFn: ({ signal }) => api('GET /api/teams', { signal }) });
}

export function useTeam(teamId: string) {
  return useQuery({
    queryKey: keys.team(teamId),
    queryFn: ({ signal }) => api('GET /api/teams/:teamId', { params: { teamId }, signal }),
  });
}

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

export function useDesign(designId: string) {
  return useQuery({
    queryKey: keys.design(designId),
    queryFn: ({ signal }) => api('GET /api/designs/:designId', { params: { designId }, signal }),
  });
}

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

export function useInvitationPreview(token: string) {
  return useQuery({
    queryKey: keys.invitation(token),
    queryFn: ({ signal }) => api('GET /api/invitations/:token', { params: { token }, signal }),
    retry: false,
  });
}

// ---- writes ----

export function useSignUp() {
  return useMutation({
    mutationFn: (body: { email: string; name: string; password: string }) => api('POST /api/account/signup', { body }),
  });
}

export function useChangePassword() {
  return useMutation({
    mutationFn: (body: { currentPassword: string; newPassword: string }) => api('POST /api/account/password', { body }),
  });
}

export function useCreateTeam() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { name: string }) => api('POST /api/teams', { body }),
    onSuccess: async () => {
      await Promise.all([qc.invalidateQueries({ queryKey: keys.teams }), qc.invalidateQueries({ queryKey: keys.me })]);
    },
  });
}

export function useInvite(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; role: Role }) =>
      api('POST /api/teams/:teamId/invitations', { params: { teamId }, body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.invitations(teamId) }),
  });
}

export function useRevokeInvitation(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: string) =>
      api('DELETE /api/teams/:teamId/invitations/:invitationId', { params: { teamId, invitationId } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.invitations(teamId) }),
  });
}

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

export function useCreateDesign(teamId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { title: string; description?: string; visibility?: Visibility; document: DesignDocumentInput; message?: string }) =>
      api('POST /api/teams/:teamId/designs', { params: { teamId }, body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.designs(teamId) }),
  });
}

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
