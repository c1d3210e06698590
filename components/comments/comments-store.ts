'use client';
/**
 * What the comments list and the canvas pins share, in one small store. The design page mounts
 * the list beside the editor, not inside it, so neither can hand the other a context: the list
 * attaches the design and revision it shows, the canvas of the same design draws that
 * revision's pins and, in pick mode, hands back the anchor a click chose. The canvas publishes
 * the names it knows (block labels, human node labels) for the list's anchor words.
 *
 * Module-wide on purpose (the page holds one design and one editor at a time); everything in it
 * is keyed by the attached design id, so a page left behind cannot leak into the next one.
 */
import { createStore } from 'zustand/vanilla';
import { useStore } from 'zustand';
import type { CommentAnchor } from '@/lib/api/contract';
import type { AnchorNames, ThreadFilter } from '@/lib/client/comments';

export interface CommentsState {
  /** The design and revision the mounted list shows; null when no list is mounted. */
  designId: string | null;
  revision: number | null;
  /** Whether the user may start threads (pick mode is offered only then). */
  canComment: boolean;
  /** Pick mode: the next click on the canvas chooses the new comment's anchor. */
  picking: boolean;
  /** Why the last pick did not make an anchor (shown on the canvas while picking). */
  pickRefusal: string | null;
  /** Anchor of the comment being written. */
  draft: CommentAnchor;
  /** The thread selected in the list or on the canvas. */
  selected: string | null;
  /** Bumped when a pin is clicked, so the list scrolls to the selection even when it did not change. */
  reveal: number;
  filter: ThreadFilter;
  names: AnchorNames;

  attach(designId: string, revision: number, canComment: boolean): void;
  detach(designId: string): void;
  startPick(): void;
  cancelPick(): void;
  /** A pick landed: the anchor is the draft's, pick mode ends. */
  pick(anchor: CommentAnchor): void;
  refusePick(reason: string): void;
  setDraft(anchor: CommentAnchor): void;
  select(commentId: string | null, opts?: { reveal?: boolean }): void;
  setFilter(filter: ThreadFilter): void;
  publishNames(names: AnchorNames): void;
}

const DESIGN: CommentAnchor = { kind: 'design' };

export const commentsStore = createStore<CommentsState>()((set, get) => ({
  designId: null,
  revision: null,
  canComment: false,
  picking: false,
  pickRefusal: null,
  draft: DESIGN,
  selected: null,
  reveal: 0,
  filter: 'open',
  names: {},
  attach(designId, revision, canComment) {
    const s = get();
    if (s.designId === designId) {
      if (s.revision !== revision || s.canComment !== canComment) set({ revision, canComment, ...(s.revision !== revision ? { draft: DESIGN, picking: false, pickRefusal: null, selected: null } : {}), ...(canComment ? {} : { picking: false }) });
      return;
    }
    set({ designId, revision, canComment, picking: false, pickRefusal: null, draft: DESIGN, selected: null, filter: 'open', names: {} });
  },
  detach(designId) {
    if (get().designId === designId) set({ designId: null, revision: null, canComment: false, picking: false, pickRefusal: null, draft: DESIGN, selected: null, names: {} });
  },
  startPick() {
    if (get().canComment) set({ picking: true, pickRefusal: null });
  },
  cancelPick() {
    if (get().picking) set({ picking: false, pickRefusal: null });
  },
  pick(anchor) {
    set({ draft: anchor, picking: false, pickRefusal: null });
  },
  refusePick(reason) {
    set({ pickRefusal: reason });
  },
  setDraft(anchor) {
    set({ draft: anchor });
  },
  select(commentId, opts) {
    set((s) => ({ selected: commentId, reveal: opts?.reveal ? s.reveal + 1 : s.reveal }));
  },
  setFilter(filter) {
    set({ filter });
  },
  publishNames(names) {
    set({ names });
  },
}));

/** A narrow, re-rendering read of the comments store. */
export function useComments<T>(selector: (s: CommentsState) => T): T {
  return useStore(commentsStore, selector);
}
