'use client';
/**
 * react-query hooks for design comments. The list and the canvas pins read the same key
 * (`['comments', designId, revision]`), so a new comment or a resolve shows in both at once.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CommentAnchor } from '@/lib/api/contract';
import { api } from '@/lib/client/api';

export const commentKeys = {
  all: (designId: string) => ['comments', designId] as const,
  revision: (designId: string, revision: number) => ['comments', designId, revision] as const,
  /** Comments of every revision the server lists without a revision filter. */
  unfiltered: (designId: string) => ['comments', designId, 'any'] as const,
};

/** Top-level comments (with their replies) on one revision; disabled while `enabled` is false. */
export function useRevisionComments(designId: string | null, revision: number | null, enabled = true) {
  return useQuery({
    queryKey: commentKeys.revision(designId ?? '', revision ?? 0),
    queryFn: ({ signal }) => api('GET /api/designs/:designId/comments', { params: { designId: designId as string }, query: { revision: String(revision) }, signal }),
    enabled: enabled && designId !== null && revision !== null,
  });
}

/** The comments the server lists for the design without a revision filter (the list keeps those of other revisions). */
export function useAllComments(designId: string, enabled = true) {
  return useQuery({
    queryKey: commentKeys.unfiltered(designId),
    queryFn: ({ signal }) => api('GET /api/designs/:designId/comments', { params: { designId }, signal }),
    enabled,
  });
}

/** Starts a thread, or replies to one with `parentId`. */
export function useCreateComment(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { revision: number; body: string; anchor: CommentAnchor; parentId?: string }) =>
      api('POST /api/designs/:designId/comments', { params: { designId }, body }),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: commentKeys.all(designId) }), qc.invalidateQueries({ queryKey: ['activity'] })]),
  });
}

/** Resolves or reopens a thread. */
export function useResolveComment(designId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { commentId: string; resolved: boolean }) => api('PATCH /api/comments/:commentId', { params: { commentId: v.commentId }, body: { resolved: v.resolved } }),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: commentKeys.all(designId) }), qc.invalidateQueries({ queryKey: ['activity'] })]),
  });
}
