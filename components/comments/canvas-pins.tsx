'use client';
/**
 * Comments on the canvas: numbered pins at the anchored block or node of every thread the list
 * shows, and "pin a comment" pick mode, where the next click on a block, a port or a wire
 * chooses the new comment's anchor instead of selecting, dragging or wiring. Both act only when
 * the comments list of this same design is on the page (see comments-store.ts).
 */
import { useEffect, useMemo, useRef, type RefObject } from 'react';
import { ViewportPortal, useStore as useFlowStore } from '@xyflow/react';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { anchorFromPick, nodePositions, pinPlacements, type PickTarget } from '@/lib/client/comments';
import type { EngineSnapshot } from '@/lib/editor/types';
import { commentsStore, useComments } from './comments-store';
import { useRevisionComments } from './queries';

const NO_PORTS: Record<string, string> = {};
/** Pointer travel (px) past which a press is a drag, not a pick. */
const DRAG_PX = 5;

/** Whether the comments list attached this design. */
function useAttached(designId: string | undefined): boolean {
  return useComments((s) => designId !== undefined && s.designId === designId);
}

/** Numbered pins in canvas coordinates; render inside `<ReactFlow>`. */
export function CommentPins({ designId, snapshot, document }: { designId?: string; snapshot: EngineSnapshot; document: DesignDocument }) {
  const attached = useAttached(designId);
  const revision = useComments((s) => s.revision);
  const filter = useComments((s) => s.filter);
  const selected = useComments((s) => s.selected);
  const comments = useRevisionComments(designId ?? null, revision, attached);
  const nodeOfPort = snapshot.compile?.nodeOfPort ?? NO_PORTS;
  const nodes = useMemo(() => nodePositions(nodeOfPort, document.blocks), [nodeOfPort, document.blocks]);
  const threads = comments.data?.comments;
  const pins = useMemo(() => (threads ? pinPlacements(threads, filter, document.blocks, nodes) : []), [threads, filter, document.blocks, nodes]);
  // Pins keep their screen size whatever the zoom (a 6 px pin at 0.3× cannot be read or hit).
  const zoom = useFlowStore((s) => s.transform[2]);
  usePublishNames(attached, snapshot, document);
  if (!attached || pins.length === 0) return null;
  const scale = 1 / Math.max(zoom, 0.05);
  return (
    <ViewportPortal>
      {pins.map((p) => {
        const isSelected = selected === p.commentId;
        return (
          <button
            key={p.commentId}
            type="button"
            data-testid="comment-pin"
            data-comment-id={p.commentId}
            data-anchor={p.anchorKey}
            data-resolved={p.resolved ? 'true' : 'false'}
            data-number={p.number}
            aria-pressed={isSelected}
            aria-label={`Comment ${p.number}${p.resolved ? ' (resolved)' : ''}: show in the list`}
            title={`Comment ${p.number}${p.resolved ? ' · resolved' : ''}`}
            onClick={(e) => {
              e.stopPropagation();
              commentsStore.getState().select(p.commentId, { reveal: true });
            }}
            // Open threads: a filled round pin with the number; resolved: an outlined square with a tick.
            className={`nodrag nopan absolute flex h-5 min-w-5 items-center justify-center px-1 text-[10px] font-bold leading-none tabular-nums shadow ${
              p.resolved ? 'rounded-sm border border-dashed border-ink-400 bg-ink-900 text-ink-200' : 'rounded-full rounded-bl-none border border-copper-100 bg-copper-600 text-ink-50'
            } ${isSelected ? 'outline outline-2 outline-offset-2 outline-lagoon-400' : ''}`}
            style={{ transform: `translate(${p.x}px, ${p.y}px) scale(${scale}) translate(-50%, -100%)`, transformOrigin: '0 0', pointerEvents: 'all', zIndex: isSelected ? 6 : 5 }}
          >
            {p.resolved ? `✓${p.number}` : p.number}
          </button>
        );
      })}
    </ViewportPortal>
  );
}

/** Hands the list the names it writes anchors with, when they change. */
function usePublishNames(attached: boolean, snapshot: EngineSnapshot, document: DesignDocument) {
  const nodeLabels = snapshot.compile?.nodeLabels;
  const blockSig = document.blocks.map((b) => `${b.id}\u0000${b.label ?? ''}`).join('\u0001');
  const last = useRef<{ nodeLabels: unknown; blockSig: string } | null>(null);
  useEffect(() => {
    if (!attached) return;
    if (last.current && last.current.nodeLabels === nodeLabels && last.current.blockSig === blockSig) return;
    last.current = { nodeLabels, blockSig };
    const blocks: Record<string, string> = {};
    for (const part of blockSig ? blockSig.split('\u0001') : []) {
      const [id, label] = part.split('\u0000');
      blocks[id] = label || id;
    }
    commentsStore.getState().publishNames({ blocks, nodes: nodeLabels ?? {} });
  }, [attached, nodeLabels, blockSig]);
}

/** Slack (px) around a part symbol's box that still counts as a click on it. */
const PART_SLACK_PX = 4;

/**
 * The part symbol a click inside a block means: the one hit, else the smallest whose box (with a
 * little slack) holds the point, since a capacitor's middle is the gap between its plates.
 */
function partAt(node: Element, el: Element, at: { x: number; y: number } | null): string | undefined {
  const hit = el.closest('[data-testid^="sym-"]');
  if (hit && node.contains(hit)) return hit.getAttribute('data-testid')?.slice(4);
  if (!at) return undefined;
  let best: { part: string; area: number } | null = null;
  for (const sym of node.querySelectorAll('[data-testid^="sym-"]')) {
    const r = sym.getBoundingClientRect();
    if (at.x < r.left - PART_SLACK_PX || at.x > r.right + PART_SLACK_PX || at.y < r.top - PART_SLACK_PX || at.y > r.bottom + PART_SLACK_PX) continue;
    const area = r.width * r.height;
    const part = sym.getAttribute('data-testid')?.slice(4);
    if (part && (!best || area < best.area)) best = { part, area };
  }
  return best?.part;
}

/** What in the canvas DOM an event landed on, as a pick target. */
function pickTarget(el: Element, document: DesignDocument, at: { x: number; y: number } | null = null): PickTarget | null {
  const handle = el.closest('.react-flow__handle');
  if (handle) {
    const blockId = handle.getAttribute('data-nodeid');
    const port = handle.getAttribute('data-handleid');
    return blockId && port ? { kind: 'port', blockId, port } : null;
  }
  const edge = el.closest('.react-flow__edge');
  if (edge) {
    const wire = document.wires.find((w) => w.id === edge.getAttribute('data-id'));
    return wire ? { kind: 'wire', source: wire.source, sourcePort: wire.sourcePort } : null;
  }
  const node = el.closest('.react-flow__node');
  const blockId = node?.getAttribute('data-id');
  if (!node || !blockId) return null;
  const part = partAt(node, el, at);
  return { kind: 'block', blockId, ...(part ? { part } : {}) };
}

/**
 * Pick mode on the canvas element `ref`: while the list is picking, pointer presses on blocks,
 * ports and wires are caught before xyflow sees them (no drag, no wire, no selection change) and
 * the click (or Enter on a focused port or block) becomes the draft's anchor; Escape cancels.
 * Pressing the empty canvas still pans, so the user can move to what they want to pin.
 */
export function useCommentPick(ref: RefObject<HTMLElement | null>, designId: string | undefined, snapshot: EngineSnapshot, document: DesignDocument) {
  const attached = useAttached(designId);
  const picking = useComments((s) => s.picking);
  const live = useRef({ snapshot, document });
  useEffect(() => {
    live.current = { snapshot, document };
  }, [snapshot, document]);
  const active = attached && picking;
  useEffect(() => {
    const el = ref.current;
    if (!el || !active) return;
    const targetOf = (e: Event) =>
      e.target instanceof Element && !e.target.closest('[data-testid="comment-pin"]')
        ? pickTarget(e.target, live.current.document, e instanceof MouseEvent ? { x: e.clientX, y: e.clientY } : null)
        : null;
    // A press that moves before it lifts is a drag, not a pick (the browser still sends a click).
    let down: { x: number; y: number } | null = null;
    const swallow = (e: Event) => {
      if (!targetOf(e)) return;
      if (e instanceof PointerEvent) down = { x: e.clientX, y: e.clientY };
      e.stopPropagation();
      e.preventDefault();
    };
    const choose = (target: PickTarget) => {
      const res = anchorFromPick(target, live.current.snapshot.compile?.nodeOfPort ?? NO_PORTS);
      if (res.ok) commentsStore.getState().pick(res.anchor);
      else commentsStore.getState().refusePick(res.reason);
    };
    const onClick = (e: Event) => {
      const target = targetOf(e);
      if (!target) return;
      e.stopPropagation();
      e.preventDefault();
      const moved = down !== null && e instanceof MouseEvent && Math.hypot(e.clientX - down.x, e.clientY - down.y) > DRAG_PX;
      down = null;
      if (!moved) choose(target);
    };
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') {
        e.stopPropagation();
        commentsStore.getState().cancelPick();
        return;
      }
      if (e.key !== 'Enter' && e.key !== ' ') return;
      const target = targetOf(e);
      if (!target) return;
      e.stopPropagation();
      e.preventDefault();
      choose(target);
    };
    const presses = ['pointerdown', 'mousedown', 'touchstart', 'dblclick'] as const;
    for (const t of presses) el.addEventListener(t, swallow, { capture: true });
    el.addEventListener('click', onClick, { capture: true });
    el.addEventListener('keydown', onKey, { capture: true });
    const onWindowKey = (e: KeyboardEvent) => e.key === 'Escape' && commentsStore.getState().cancelPick();
    window.addEventListener('keydown', onWindowKey);
    return () => {
      for (const t of presses) el.removeEventListener(t, swallow, { capture: true });
      el.removeEventListener('click', onClick, { capture: true });
      el.removeEventListener('keydown', onKey, { capture: true });
      window.removeEventListener('keydown', onWindowKey);
    };
  }, [ref, active]);
  return active;
}

/** The hint on the canvas while picking. */
export function CommentPickHint({ designId }: { designId?: string }) {
  const attached = useAttached(designId);
  const picking = useComments((s) => s.picking);
  const refusal = useComments((s) => s.pickRefusal);
  if (!attached || !picking) return null;
  return (
    <div role="status" data-testid="comment-pick-hint" className="pointer-events-auto absolute left-1/2 top-3 z-10 flex max-w-[90%] -translate-x-1/2 items-center gap-2 rounded-md border border-copper-600 bg-ink-900/95 px-3 py-2 text-sm text-copper-100 shadow-lg">
      <span>{refusal ?? 'Click a block, a port or a wire to pin the comment to it. Esc cancels.'}</span>
      <button type="button" onClick={() => commentsStore.getState().cancelPick()} className="rounded px-1.5 text-xs text-ink-200 hover:bg-ink-800 hover:text-ink-50">
        Cancel
      </button>
    </div>
  );
}
