/**
 * The canvas's pure decisions, kept apart from React so they are unit-tested without a DOM:
 * which engine status the canvas shows, the selection after xyflow's select changes, which
 * blocks to ring (diagnostics) and which parts to draw over their limit (stress), where each
 * net's DC label goes, and which shortcut a key press means.
 */
import type { Diagnostic } from '@/lib/circuit/compile/diagnostics';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { portPosition } from '@/lib/circuit/document/geometry';
import type { EngineSnapshot, PartStress, SolveView } from '@/lib/editor/types';

/** The engine status as the canvas shows it (also the `data-status` of `engine-status`). */
export type CanvasEngineStatus = 'idle' | 'solving' | 'solved' | 'out-of-date' | 'cannot-solve';

/**
 * Maps the snapshot to one status: a result of an older edit on screen is "out of date". An empty
 * canvas has nothing to solve, whatever the engine last said.
 */
export function canvasStatus(s: EngineSnapshot, opts: { empty?: boolean } = {}): { status: CanvasEngineStatus; text: string } {
  if (opts.empty) return { status: 'idle', text: 'Nothing to solve yet: drag blocks from the tray' };
  if (s.status === 'cannot-solve') return { status: 'cannot-solve', text: `Cannot solve: ${s.reason ?? 'the drawing does not compile'}` };
  if (s.status === 'idle') return { status: 'idle', text: 'Waiting for the first compile' };
  if (s.status === 'compiling') return { status: 'out-of-date', text: 'Out of date: compiling the latest edit' };
  if (s.status === 'solving') return { status: 'solving', text: 'Estimate current · solving…' };
  if (s.solvedVersion !== s.currentVersion) return { status: 'out-of-date', text: 'Out of date: the shown solve is of an older edit' };
  return { status: 'solved', text: s.warmupPending ? 'Solved · warm-up running' : 'Solved' };
}

/** The selection after xyflow's select changes: `drop` leaves, `add` joins (order kept, no repeats). */
export function applySelect(current: readonly string[], add: readonly string[], drop: readonly string[]): string[] {
  const gone = new Set(drop);
  return [...new Set([...current.filter((id) => !gone.has(id)), ...add])];
}

export type Fault = 'error' | 'warning';

/** Worst diagnostic per block (notes are not faults), and the roles of parts past their derated limit. */
export function blockFaults(diagnostics: readonly Diagnostic[], parts: readonly PartStress[]): { faults: Map<string, Fault>; over: Map<string, string[]> } {
  const faults = new Map<string, Fault>();
  for (const d of diagnostics) {
    if (!d.blockId || d.severity === 'info') continue;
    if (d.severity === 'error' || !faults.has(d.blockId)) faults.set(d.blockId, d.severity);
  }
  const over = new Map<string, string[]>();
  for (const p of parts) {
    if (p.status !== 'over') continue;
    over.set(p.blockId, [...(over.get(p.blockId) ?? []), p.role]);
  }
  return { faults, over };
}

/** One DC label: a net's mean level written at the first of its ports that is on the canvas. */
export interface DcLabel {
  node: string;
  /** Canvas px of the port the label sits at. */
  x: number;
  y: number;
  meanV: number;
}

/** Where the DC level of every solved net is written (one label per net). */
export function dcLabelPlacements(solve: SolveView | null, document: DesignDocument): DcLabel[] {
  if (!solve) return [];
  const byId = new Map(document.blocks.map((b) => [b.id, b] as const));
  const out: DcLabel[] = [];
  for (const r of Object.values(solve.nodes)) {
    for (const key of r.ports) {
      const i = key.indexOf(':');
      const block = byId.get(key.slice(0, i));
      const at = block ? portPosition(block, key.slice(i + 1)) : null;
      if (at) {
        out.push({ node: r.node, x: at.x, y: at.y, meanV: r.meanV });
        break;
      }
    }
  }
  return out;
}

/** The key fields a shortcut looks at (a `KeyboardEvent` has them all). */
export interface KeyPress {
  key: string;
  ctrlKey: boolean;
  metaKey: boolean;
  shiftKey: boolean;
}

/**
 * Whether `e` is the key chord `chord` ("Ctrl+Shift+Z", "Delete", "?"). Ctrl also matches ⌘.
 * Letters compare Shift exactly; punctuation (?, +, -) comes with whatever Shift the layout needs.
 */
export function chordMatches(e: KeyPress, chord: string): boolean {
  // A one-character chord is the key itself ("+" would otherwise split into nothing).
  const parts = chord.length === 1 ? [chord] : chord.split('+');
  const main = parts[parts.length - 1];
  const ctrl = parts.includes('Ctrl');
  const shift = parts.includes('Shift');
  if ((e.ctrlKey || e.metaKey) !== ctrl) return false;
  if (main.length === 1 && /[A-Z]/.test(main)) {
    if (e.shiftKey !== shift) return false;
    return e.key.toLowerCase() === main.toLowerCase();
  }
  return e.key === main;
}
