/**
 * What differs between two canvas documents, block by block, for the "a colleague saved first"
 * compare view: blocks only in one of them, blocks whose values changed, blocks only moved, and
 * how many wires differ. Blocks are matched by id (ids are stable across saves of one design).
 */
import type { DesignBlock, DesignDocument } from '@/lib/circuit/document/schema';

/** One block that differs. `theirs`/`mine` are the block in each document (absent when not there). */
export interface BlockDifference {
  id: string;
  label: string;
  change: 'only-mine' | 'only-theirs' | 'values' | 'moved';
}

export interface DocumentComparison {
  blocks: BlockDifference[];
  /** Wires present in one document and not the other (matched by their two ends, not their ids). */
  wiresOnlyMine: number;
  wiresOnlyTheirs: number;
  settingsDiffer: boolean;
}

/**
 * Structural equality of JSON values, ignoring object key order (stored documents come back from
 * JSONB with their keys reordered).
 */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    return a.length === bb.length && a.every((v, i) => sameValue(v, bb[i]));
  }
  const ao = a as Record<string, unknown>;
  const bo = b as Record<string, unknown>;
  const ak = Object.keys(ao).filter((k) => ao[k] !== undefined);
  const bk = Object.keys(bo).filter((k) => bo[k] !== undefined);
  return ak.length === bk.length && ak.every((k) => sameValue(ao[k], bo[k]));
}

function wireKey(w: DesignDocument['wires'][number]): string {
  const a = `${w.source}:${w.sourcePort}`;
  const b = `${w.target}:${w.targetPort}`;
  return a < b ? `${a}|${b}` : `${b}|${a}`;
}

function nameOf(b: DesignBlock): string {
  return b.label?.trim() || b.id;
}

/** Compares my working copy with their saved document. */
export function compareDocuments(mine: DesignDocument, theirs: DesignDocument): DocumentComparison {
  const theirsById = new Map(theirs.blocks.map((b) => [b.id, b] as const));
  const mineIds = new Set(mine.blocks.map((b) => b.id));
  const blocks: BlockDifference[] = [];
  for (const b of mine.blocks) {
    const t = theirsById.get(b.id);
    if (!t) blocks.push({ id: b.id, label: nameOf(b), change: 'only-mine' });
    else if (b.kind !== t.kind || b.label !== t.label || !sameValue(b.data, t.data)) blocks.push({ id: b.id, label: nameOf(b), change: 'values' });
    else if (b.position.x !== t.position.x || b.position.y !== t.position.y) blocks.push({ id: b.id, label: nameOf(b), change: 'moved' });
  }
  for (const t of theirs.blocks) if (!mineIds.has(t.id)) blocks.push({ id: t.id, label: nameOf(t), change: 'only-theirs' });
  const mineWires = new Set(mine.wires.map(wireKey));
  const theirWires = new Set(theirs.wires.map(wireKey));
  return {
    blocks,
    wiresOnlyMine: [...mineWires].filter((k) => !theirWires.has(k)).length,
    wiresOnlyTheirs: [...theirWires].filter((k) => !mineWires.has(k)).length,
    settingsDiffer: !sameValue(mine.settings, theirs.settings),
  };
}
