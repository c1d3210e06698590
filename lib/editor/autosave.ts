/**
 * Autosave of the editor's working copy: the unsaved document of one design, kept in the
 * browser's localStorage under one key per design, so a closed tab or a crash loses nothing.
 * What is stored is checked against the document schema when it is read back; anything that does
 * not parse is dropped rather than offered.
 */
import { designDocumentSchema, type DesignDocument } from '@/lib/circuit/document/schema';

/** Storage key of a design's working copy. */
export function workingCopyKey(designId: string): string {
  return `kilorung:working-copy:${designId}`;
}

/** A stored working copy. */
export interface WorkingCopy {
  /** Revision the edits started from. */
  baseRevision: number;
  /** When it was written (ISO 8601). */
  savedAt: string;
  document: DesignDocument;
}

/** The part of `Storage` used here (a fake in tests). */
export type KeyValueStore = Pick<Storage, 'getItem' | 'setItem' | 'removeItem'>;

/** Writes the working copy; false when the browser refuses (quota, private mode). */
export function writeWorkingCopy(store: KeyValueStore, designId: string, copy: WorkingCopy): boolean {
  try {
    store.setItem(workingCopyKey(designId), JSON.stringify(copy));
    return true;
  } catch {
    return false;
  }
}

/** Reads the working copy back, or null when there is none or it is not a valid document. */
export function readWorkingCopy(store: KeyValueStore, designId: string): WorkingCopy | null {
  let raw: string | null;
  try {
    raw = store.getItem(workingCopyKey(designId));
  } catch {
    return null;
  }
  if (!raw) return null;
  let parsed: unknown;
  try {
    parsed = JSON.parse(raw);
  } catch {
    return null;
  }
  if (typeof parsed !== 'object' || parsed === null) return null;
  const p = parsed as Record<string, unknown>;
  const doc = designDocumentSchema.safeParse(p.document);
  if (!doc.success || typeof p.baseRevision !== 'number' || typeof p.savedAt !== 'string') return null;
  return { baseRevision: p.baseRevision, savedAt: p.savedAt, document: doc.data };
}

/** Forgets the working copy (after a save, a reload or a discard). */
export function clearWorkingCopy(store: KeyValueStore, designId: string): void {
  try {
    store.removeItem(workingCopyKey(designId));
  } catch {
    // Storage unavailable: nothing was kept, so nothing to forget.
  }
}

/**
 * What the editor shows when a save answers 503 (the server could not reach its database): the
 * revision was not stored, the edits are still here (and in this browser's working copy), and
 * saving again is safe. The server sends the same words (lib/api/handler.ts DB_UNAVAILABLE_WRITE).
 */
export const NOT_SAVED_RETRY = 'Not saved — the server could not reach its database. Retry.';

/** The save-failure text for an API error's status and message (503 → {@link NOT_SAVED_RETRY}). */
export function saveFailureText(status: number, message: string | undefined): string {
  if (status === 503) return NOT_SAVED_RETRY;
  return message ?? 'The revision could not be saved.';
}
