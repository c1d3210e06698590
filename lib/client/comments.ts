/**
 * Pure decisions behind design comments, kept apart from React so they are unit-tested without a
 * DOM: an anchor's key and words, which threads show under a filter and how they group by
 * anchor, the number each thread carries (in the list and on its canvas pin), where pins go on
 * the canvas, what a click in "pin a comment" mode anchors to, and the `@Full Name` mentions in a
 * body (splitting for highlighting, the query being typed, suggestions and insertion).
 */
import type { CommentAnchor, CommentDto } from '@/lib/api/contract';
import type { DesignBlock } from '@/lib/circuit/document/schema';
import { blockSize, portPosition } from '@/lib/circuit/document/geometry';

/** Which threads the list (and the canvas) shows. */
export type ThreadFilter = 'open' | 'resolved' | 'all';

/**
 * Stable key of an anchor: `design`, `node:<node>` or `part:<blockId>` (a part inside a block
 * shares its block's key, so the block's threads stay together; the part shows in the words).
 */
export function anchorKey(anchor: CommentAnchor): string {
  if (anchor.kind === 'design') return 'design';
  if (anchor.kind === 'node') return `node:${anchor.node}`;
  return `part:${anchor.blockId}`;
}

/** Whether two anchors name the same place (parts compared too). */
export function sameAnchor(a: CommentAnchor, b: CommentAnchor): boolean {
  return anchorKey(a) === anchorKey(b) && (a.kind !== 'part' || b.kind !== 'part' || (a.part ?? null) === (b.part ?? null));
}

/** Names the canvas knows: block labels by id, human node labels by compiler node name. */
export interface AnchorNames {
  blocks?: Record<string, string>;
  nodes?: Record<string, string>;
}

/** Words for a part key inside a block (`pumpC` → "pump capacitor"); unknown keys are shown as they are. */
export const PART_WORDS: Record<string, string> = {
  pumpC: 'pump capacitor',
  pump2C: 'second pump capacitor',
  smoothC: 'smoothing capacitor',
  diodeA: 'diode A',
  diodeB: 'diode B',
  diodeC: 'diode C',
  diodeD: 'diode D',
};

/**
 * What an anchor is called in the list and the new-comment form: "Design",
 * "Node y_s3 · Stage 3 · smoothing (y3)" (the compiler's name, then the human label when the canvas
 * knows one that differs), "Stage 3 · pump capacitor" / "Stage 3" (the block's label, else its id).
 */
export function anchorLabel(anchor: CommentAnchor, names: AnchorNames = {}): string {
  if (anchor.kind === 'design') return 'Design';
  if (anchor.kind === 'node') {
    const human = names.nodes?.[anchor.node];
    return human && human !== anchor.node ? `Node ${anchor.node} · ${human}` : `Node ${anchor.node}`;
  }
  const block = names.blocks?.[anchor.blockId]?.trim() || anchor.blockId;
  return anchor.part ? `${block} · ${PART_WORDS[anchor.part] ?? anchor.part}` : block;
}

/** Whether a thread passes the filter. */
export function passesFilter(thread: Pick<CommentDto, 'resolved'>, filter: ThreadFilter): boolean {
  return filter === 'all' || (filter === 'open' ? !thread.resolved : thread.resolved);
}

const byCreated = (a: Pick<CommentDto, 'createdAt' | 'id'>, b: Pick<CommentDto, 'createdAt' | 'id'>) =>
  a.createdAt < b.createdAt ? -1 : a.createdAt > b.createdAt ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;

/**
 * The number of every top-level thread: 1, 2, … in the order they were started (so a thread keeps
 * its number whatever the filter, and its pin on the canvas shows the same number).
 */
export function threadNumbers(threads: readonly Pick<CommentDto, 'id' | 'createdAt' | 'parentId'>[]): Map<string, number> {
  const top = threads.filter((t) => t.parentId === null).sort(byCreated);
  return new Map(top.map((t, i) => [t.id, i + 1] as const));
}

/** Threads under one anchor. */
export interface ThreadGroup {
  key: string;
  anchor: CommentAnchor;
  threads: CommentDto[];
}

/**
 * The threads that pass the filter, grouped by anchor key: the design first, then nodes, then
 * parts, each kind in the order of its first thread; threads oldest first within a group.
 */
export function groupThreads(threads: readonly CommentDto[], filter: ThreadFilter): ThreadGroup[] {
  const groups = new Map<string, ThreadGroup>();
  for (const t of [...threads].filter((c) => c.parentId === null && passesFilter(c, filter)).sort(byCreated)) {
    const key = anchorKey(t.anchor);
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { key, anchor: t.anchor, threads: [] }));
    g.threads.push(t);
  }
  const rank = (g: ThreadGroup) => (g.anchor.kind === 'design' ? 0 : g.anchor.kind === 'node' ? 1 : 2);
  return [...groups.values()].sort((a, b) => rank(a) - rank(b));
}

/** The top-level thread holding comment `id` (itself, or the thread it replies to), or null. */
export function threadOf(threads: readonly CommentDto[], id: string): CommentDto | null {
  for (const t of threads) if (t.id === id || t.replies.some((r) => r.id === id)) return t;
  return null;
}

/** Counts for the filter buttons. */
export function threadCounts(threads: readonly Pick<CommentDto, 'resolved' | 'parentId'>[]): Record<ThreadFilter, number> {
  const top = threads.filter((t) => t.parentId === null);
  const resolved = top.filter((t) => t.resolved).length;
  return { open: top.length - resolved, resolved, all: top.length };
}

// ---- the canvas ----

/** Canvas px of a point. */
export interface CanvasPoint {
  x: number;
  y: number;
}

/**
 * Where each compiled node is drawn: of its ports on the canvas, the one nearest their centroid
 * (a point on the drawing, not in the empty space between two far ports). `nodeOfPort` is the
 * compile view's map of `blockId:port` → node.
 */
export function nodePositions(nodeOfPort: Readonly<Record<string, string>>, blocks: readonly DesignBlock[]): Map<string, CanvasPoint> {
  const byId = new Map(blocks.map((b) => [b.id, b] as const));
  const points = new Map<string, CanvasPoint[]>();
  for (const [key, node] of Object.entries(nodeOfPort)) {
    const i = key.indexOf(':');
    const block = byId.get(key.slice(0, i));
    const at = block ? portPosition(block, key.slice(i + 1)) : null;
    if (!at) continue;
    let list = points.get(node);
    if (!list) points.set(node, (list = []));
    list.push(at);
  }
  const out = new Map<string, CanvasPoint>();
  for (const [node, list] of points) {
    const cx = list.reduce((s, p) => s + p.x, 0) / list.length;
    const cy = list.reduce((s, p) => s + p.y, 0) / list.length;
    let best = list[0];
    let bestD = Infinity;
    for (const p of list) {
      const d = (p.x - cx) ** 2 + (p.y - cy) ** 2;
      if (d < bestD) [best, bestD] = [p, d];
    }
    out.set(node, best);
  }
  return out;
}

/** One numbered marker on the canvas. */
export interface PinPlacement {
  commentId: string;
  number: number;
  resolved: boolean;
  anchorKey: string;
  x: number;
  y: number;
}

/** Horizontal step between pins that share one anchor point (canvas px at zoom 1). */
export const PIN_STEP = 22;

/**
 * Pins for the threads that pass the filter and whose anchor is on the canvas: a part's pin at
 * its block's top-right corner, a node's at {@link nodePositions}; threads sharing an anchor step
 * sideways so every number stays readable. Design-wide threads have no pin (they are in the list).
 */
export function pinPlacements(
  threads: readonly CommentDto[],
  filter: ThreadFilter,
  blocks: readonly DesignBlock[],
  nodes: ReadonlyMap<string, CanvasPoint>,
): PinPlacement[] {
  const numbers = threadNumbers(threads);
  const byId = new Map(blocks.map((b) => [b.id, b] as const));
  const used = new Map<string, number>();
  const out: PinPlacement[] = [];
  for (const t of [...threads].filter((c) => c.parentId === null && passesFilter(c, filter)).sort(byCreated)) {
    let at: CanvasPoint | null = null;
    if (t.anchor.kind === 'node') at = nodes.get(t.anchor.node) ?? null;
    else if (t.anchor.kind === 'part') {
      const b = byId.get(t.anchor.blockId);
      if (b) at = { x: b.position.x + blockSize(b).width, y: b.position.y };
    }
    if (!at) continue;
    const key = anchorKey(t.anchor);
    const k = used.get(key) ?? 0;
    used.set(key, k + 1);
    out.push({ commentId: t.id, number: numbers.get(t.id) ?? 0, resolved: t.resolved, anchorKey: key, x: at.x + k * PIN_STEP, y: at.y });
  }
  return out;
}

/** What a click in pick mode landed on (read from the canvas DOM by the caller). */
export type PickTarget =
  | { kind: 'port'; blockId: string; port: string }
  | { kind: 'wire'; source: string; sourcePort: string }
  | { kind: 'block'; blockId: string; part?: string };

/**
 * The anchor a pick makes: a block (or a part symbol inside it) → a part anchor; a port or a
 * wire → the node the compiler put it on. A port on no compiled net cannot be pinned yet.
 */
export function anchorFromPick(target: PickTarget, nodeOfPort: Readonly<Record<string, string>>): { ok: true; anchor: CommentAnchor } | { ok: false; reason: string } {
  if (target.kind === 'block') return { ok: true, anchor: target.part ? { kind: 'part', blockId: target.blockId, part: target.part } : { kind: 'part', blockId: target.blockId } };
  const key = target.kind === 'port' ? `${target.blockId}:${target.port}` : `${target.source}:${target.sourcePort}`;
  const node = nodeOfPort[key];
  if (!node) return { ok: false, reason: 'That port is not on a node yet (wire it, or wait for the compile).' };
  return { ok: true, anchor: { kind: 'node', node } };
}

// ---- mentions ----

/** A run of body text; `mention` is set when the run is `@Full Name` of a known person. */
export interface BodySegment {
  text: string;
  mention?: string;
}

const isWordChar = (c: string | undefined) => c !== undefined && /[\p{L}\p{N}_]/u.test(c);

/**
 * Splits a plain-text body into runs, marking each `@Name` where Name is one of `names`
 * (case-insensitive, longest name first, not followed by a letter or digit and not preceded by
 * one, so an e-mail address is not a mention). Joining the runs' text gives the body back.
 */
export function splitMentions(body: string, names: readonly string[]): BodySegment[] {
  const sorted = [...new Set(names.map((n) => n.trim()).filter(Boolean))].sort((a, b) => b.length - a.length);
  const lower = body.toLowerCase();
  const out: BodySegment[] = [];
  let plain = '';
  let i = 0;
  while (i < body.length) {
    if (body[i] === '@' && !isWordChar(body[i - 1])) {
      const name = sorted.find((n) => lower.startsWith(n.toLowerCase(), i + 1) && !isWordChar(body[i + 1 + n.length]));
      if (name) {
        if (plain) out.push({ text: plain });
        plain = '';
        out.push({ text: body.slice(i, i + 1 + name.length), mention: name });
        i += 1 + name.length;
        continue;
      }
    }
    plain += body[i];
    i += 1;
  }
  if (plain) out.push({ text: plain });
  return out;
}

/** Longest mention query offered suggestions (characters after the `@`). */
const MAX_QUERY = 40;

/**
 * The mention being typed at the caret: the `@` that starts it and the text after it (up to the
 * caret; at most two spaces, since names are one to three words), or null when the caret is not in one.
 */
export function mentionQuery(text: string, caret: number): { start: number; query: string } | null {
  const before = text.slice(0, caret);
  const at = before.lastIndexOf('@');
  if (at < 0 || isWordChar(before[at - 1])) return null;
  const query = before.slice(at + 1);
  if (query.length > MAX_QUERY || /[\n@]/.test(query) || (query.match(/ /g)?.length ?? 0) > 2 || query.startsWith(' ')) return null;
  return { start: at, query };
}

/**
 * Members whose name matches what is typed: a word of the name starts with the query, or the
 * whole name does (case-insensitive); full-name prefixes first, then by name. An empty query lists everyone.
 */
export function mentionSuggestions<T extends { name: string }>(members: readonly T[], query: string, limit = 6): T[] {
  const q = query.trim().toLowerCase();
  const scored: { m: T; rank: number }[] = [];
  for (const m of members) {
    const name = m.name.trim().toLowerCase();
    if (!name) continue;
    const rank = q === '' || name.startsWith(q) ? 0 : name.split(/\s+/).some((w) => w.startsWith(q)) ? 1 : -1;
    if (rank >= 0) scored.push({ m, rank });
  }
  scored.sort((a, b) => a.rank - b.rank || a.m.name.localeCompare(b.m.name));
  return scored.slice(0, limit).map((s) => s.m);
}

/** Replaces the query from `start` (its `@`) to `caret` with `@Full Name ` and returns the new text and caret. */
export function insertMention(text: string, start: number, caret: number, name: string): { text: string; caret: number } {
  const inserted = `@${name.trim()} `;
  const rest = text.slice(caret).replace(/^ /, '');
  return { text: text.slice(0, start) + inserted + rest, caret: start + inserted.length };
}
