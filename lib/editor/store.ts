/**
 * The design editor's store: one zustand vanilla store per mounted editor (never module-global),
 * holding the canvas document, the edit counter the engine keys its results on, the selection,
 * undo/redo history, the clipboard and the reason of the last refused edit.
 *
 * Every action that changes the document goes through `commit`, which bumps `version`, records
 * one undo step and clears the redo stack. A drag is one gesture: `beginGesture` remembers the
 * document before it, `moveBlocks` during it replaces the document without recording history,
 * and `endGesture` records the whole move (plus the wires `snapWires` adds) as one step.
 * Read-only editors refuse every document change and say why in `lastRefusal`.
 */
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { DesignBlock, DesignDocument, DesignSettings, Wire } from '@/lib/circuit/document/schema';
import { checkWire, type WireCandidate } from '@/lib/circuit/document/connect';
import { appendStages as appendStagesOp, snapWires, starterDocument } from '@/lib/circuit/document/ladder-ops';
import { blockSize } from '@/lib/circuit/document/geometry';
import { TRAY_ID_PREFIX, createBlock, nextBlockId, nextWireId, type TrayItemKey } from '@/lib/circuit/document/tray';

/** Largest number of undo steps kept (older steps are dropped first). */
export const HISTORY_LIMIT = 200;

/** Starter ladder kinds offered by the "start from" action. */
export type StarterKind = 'half-wave' | 'full-wave' | 'symmetric';

/** What is selected on the canvas: block ids and wire ids. */
export interface Selection {
  blocks: string[];
  wires: string[];
}

/** Blocks and the wires between them, as copied (ids are replaced on paste). */
export interface Clipboard {
  blocks: DesignBlock[];
  wires: Wire[];
}

/** Outcome of an action that may be refused; the reason is also kept in `lastRefusal`. */
export type EditOutcome = { ok: true } | { ok: false; reason: string };

export interface EditorState {
  document: DesignDocument;
  /** Edit counter: +1 for every change of `document` (the engine labels its results with it). */
  version: number;
  selection: Selection;
  /** Documents before each recorded step, oldest first. */
  past: DesignDocument[];
  /** Documents undone, most recently undone last. */
  future: DesignDocument[];
  clipboard: Clipboard | null;
  readOnly: boolean;
  /** Why the last edit (a wire, a paste, an edit in read-only mode, …) was refused; null after a success. */
  lastRefusal: string | null;
  /** The document last loaded or saved; `dirty` is true while `document` differs from it. */
  baseDocument: DesignDocument;
  dirty: boolean;
  /** Document at the start of the running drag, null when no drag is running. */
  gestureStart: DesignDocument | null;

  /** Adds a tray item at `position` (top-left, or its centre with `anchor: 'center'`); returns the new id. */
  addBlock(item: TrayItemKey, position: { x: number; y: number }, anchor?: 'topLeft' | 'center'): { ok: true; id: string } | { ok: false; reason: string };
  /** Moves blocks to absolute positions (canvas px); one undo step unless inside a gesture. */
  moveBlocks(positions: Record<string, { x: number; y: number }>): EditOutcome;
  /** Starts a drag: moves until `endGesture` are one undo step. */
  beginGesture(): void;
  /** Ends a drag; with `snapIds`, stage blocks dropped near a matching port snap and wire up. */
  endGesture(snapIds?: string[]): void;
  /** Replaces one block's data (and optionally its label). */
  updateBlockData(id: string, data: DesignBlock['data'], label?: string): EditOutcome;
  /** Replaces one block (same id) as the inspector edited it. */
  updateBlock(next: DesignBlock): EditOutcome;
  updateSettings(settings: DesignSettings): EditOutcome;
  /** Adds a wire after the connection rules (`checkWire`) accept it. */
  connect(candidate: WireCandidate): { ok: true; id: string } | { ok: false; reason: string };
  /** Deletes the selected blocks (with every wire on them) and the selected wires. */
  deleteSelection(): EditOutcome;
  /** Copies the selected blocks and the wires that run between them. */
  copy(): EditOutcome;
  /** Pastes the clipboard with fresh ids, shifted by `offset` (canvas px), and selects it. */
  paste(offset?: { x: number; y: number }): EditOutcome;
  /** `replace` sets the parts given (blocks and/or wires), `add` joins them, `toggle` flips each. */
  select(selection: Partial<Selection>, mode?: 'replace' | 'add' | 'toggle'): void;
  selectAll(): void;
  clearSelection(): void;
  undo(): boolean;
  redo(): boolean;
  /** Adds `n` stages on top of the selected ladder (or the only one; both ladders of a symmetric pair). */
  appendStages(n: number): EditOutcome;
  /** Replaces the drawing with a starter ladder of `n` stages (one undo step). */
  loadStarter(kind: StarterKind, n: number): EditOutcome;
  /** Replaces the drawing with an imported document (one undo step). */
  replaceDocument(document: DesignDocument): EditOutcome;
  /** Loads a document as the new base (a revision, a reload): clears history and selection. */
  resetDocument(document: DesignDocument, opts?: { readOnly?: boolean; dirtyFrom?: DesignDocument }): void;
  /** Marks `document` as saved (the new base for `dirty`). */
  markSaved(document: DesignDocument): void;
  clearRefusal(): void;
}

export type EditorStore = StoreApi<EditorState>;

const READ_ONLY_REASON = 'This design is open read-only: fork it to make changes.';


/** Id prefix for a pasted copy of `id`: its letters without the trailing number (`s12` → `s`). */
function prefixOf(id: string): string {
  const p = id.replace(/[0-9]+$/, '');
  return p.length > 0 ? p : 'b';
}

function sameSelection(a: Selection, b: Selection): boolean {
  return a.blocks.length === b.blocks.length && a.wires.length === b.wires.length && a.blocks.every((x, i) => x === b.blocks[i]) && a.wires.every((x, i) => x === b.wires[i]);
}

/** Removes ids that no longer exist in `doc` from a selection. */
function pruneSelection(sel: Selection, doc: DesignDocument): Selection {
  const blocks = new Set(doc.blocks.map((b) => b.id));
  const wires = new Set(doc.wires.map((w) => w.id));
  const next = { blocks: sel.blocks.filter((id) => blocks.has(id)), wires: sel.wires.filter((id) => wires.has(id)) };
  return sameSelection(next, sel) ? sel : next;
}

/** Adds the wires `snapWires` proposes for `blockId` (each through `checkWire`) and moves it into place. */
function applySnap(doc: DesignDocument, blockId: string): DesignDocument {
  const snap = snapWires(doc, blockId);
  if (!snap) return doc;
  let next: DesignDocument = {
    ...doc,
    blocks: doc.blocks.map((b) => (b.id === blockId ? { ...b, position: { ...snap.position } } : b)),
  };
  for (const w of snap.wires) {
    if (!checkWire(next, w).ok) continue;
    next = { ...next, wires: [...next.wires, { id: nextWireId(next), ...w }] };
  }
  return next;
}

/** Creates the store of one editor. */
export function createEditorStore(init: { document: DesignDocument; readOnly: boolean }): EditorStore {
  return createStore<EditorState>()((set, get) => {
    /** Records `next` as one undo step; false (and a refusal) in read-only mode. */
    function commit(next: DesignDocument, extra: Partial<EditorState> = {}): EditOutcome {
      const s = get();
      if (s.readOnly) return refuse(READ_ONLY_REASON);
      if (next === s.document) return { ok: true };
      const past = s.gestureStart ? s.past : [...s.past, s.document].slice(-HISTORY_LIMIT);
      set({
        ...extra,
        document: next,
        version: s.version + 1,
        past,
        future: s.gestureStart ? s.future : [],
        dirty: next !== s.baseDocument,
        lastRefusal: null,
        selection: pruneSelection(extra.selection ?? s.selection, next),
      });
      return { ok: true };
    }

    function refuse(reason: string): { ok: false; reason: string } {
      set({ lastRefusal: reason });
      return { ok: false, reason };
    }

    return {
      document: init.document,
      version: 0,
      selection: { blocks: [], wires: [] },
      past: [],
      future: [],
      clipboard: null,
      readOnly: init.readOnly,
      lastRefusal: null,
      baseDocument: init.document,
      dirty: false,
      gestureStart: null,

      addBlock(item, position, anchor = 'topLeft') {
        const s = get();
        if (s.readOnly) return refuse(READ_ONLY_REASON);
        const id = nextBlockId(s.document, TRAY_ID_PREFIX[item]);
        let block = createBlock(item, id, position, s.document);
        if (anchor === 'center') {
          const size = blockSize(block);
          block = { ...block, position: { x: position.x - size.width / 2, y: position.y - size.height / 2 } };
        }
        const placed: DesignDocument = { ...s.document, blocks: [...s.document.blocks, block] };
        const out = commit(applySnap(placed, id), { selection: { blocks: [id], wires: [] } });
        return out.ok ? { ok: true, id } : out;
      },

      moveBlocks(positions) {
        const s = get();
        if (s.readOnly) return refuse(READ_ONLY_REASON);
        let changed = false;
        const blocks = s.document.blocks.map((b) => {
          const p = positions[b.id];
          if (!p || (p.x === b.position.x && p.y === b.position.y)) return b;
          changed = true;
          return { ...b, position: { x: p.x, y: p.y } };
        });
        if (!changed) return { ok: true };
        return commit({ ...s.document, blocks });
      },

      beginGesture() {
        const s = get();
        if (s.readOnly || s.gestureStart) return;
        set({ gestureStart: s.document });
      },

      endGesture(snapIds = []) {
        const s = get();
        const start = s.gestureStart;
        if (!start) return;
        let doc = s.document;
        // Snap only a lone dragged block: a group keeps the relative layout the user gave it.
        if (snapIds.length === 1) doc = applySnap(doc, snapIds[0]);
        const moved = doc !== start;
        set({
          gestureStart: null,
          ...(moved
            ? {
                document: doc,
                version: doc === s.document ? s.version : s.version + 1,
                past: [...s.past, start].slice(-HISTORY_LIMIT),
                future: [],
                dirty: doc !== s.baseDocument,
              }
            : {}),
        });
      },

      updateBlockData(id, data, label) {
        const s = get();
        const block = s.document.blocks.find((b) => b.id === id);
        if (!block) return refuse(`There is no block ${id} on the canvas.`);
        const next = { ...block, data, ...(label !== undefined ? { label } : {}) } as DesignBlock;
        return get().updateBlock(next);
      },

      updateBlock(next) {
        const s = get();
        const i = s.document.blocks.findIndex((b) => b.id === next.id);
        if (i < 0) return refuse(`There is no block ${next.id} on the canvas.`);
        const blocks = s.document.blocks.slice();
        blocks[i] = next;
        return commit({ ...s.document, blocks });
      },

      updateSettings(settings) {
        const s = get();
        return commit({ ...s.document, settings });
      },

      connect(candidate) {
        const s = get();
        if (s.readOnly) return refuse(READ_ONLY_REASON);
        const verdict = checkWire(s.document, candidate);
        if (!verdict.ok) return refuse(verdict.reason);
        const id = nextWireId(s.document);
        const wire: Wire = { id, ...candidate };
        const out = commit({ ...s.document, wires: [...s.document.wires, wire] });
        return out.ok ? { ok: true, id } : out;
      },

      deleteSelection() {
        const s = get();
        if (s.readOnly) return refuse(READ_ONLY_REASON);
        const gone = new Set(s.selection.blocks);
        const goneWires = new Set(s.selection.wires);
        if (gone.size === 0 && goneWires.size === 0) return refuse('Nothing is selected to delete.');
        const blocks = s.document.blocks.filter((b) => !gone.has(b.id));
        const wires = s.document.wires.filter((w) => !goneWires.has(w.id) && !gone.has(w.source) && !gone.has(w.target));
        return commit({ ...s.document, blocks, wires }, { selection: { blocks: [], wires: [] } });
      },

      copy() {
        const s = get();
        const ids = new Set(s.selection.blocks);
        if (ids.size === 0) return refuse('Select blocks to copy first.');
        const blocks = s.document.blocks.filter((b) => ids.has(b.id));
        const wires = s.document.wires.filter((w) => ids.has(w.source) && ids.has(w.target));
        set({ clipboard: structuredClone({ blocks, wires }), lastRefusal: null });
        return { ok: true };
      },

      paste(offset = { x: 40, y: 40 }) {
        const s = get();
        if (s.readOnly) return refuse(READ_ONLY_REASON);
        if (!s.clipboard || s.clipboard.blocks.length === 0) return refuse('The clipboard is empty: copy blocks first.');
        let doc = s.document;
        const idMap = new Map<string, string>();
        for (const b of s.clipboard.blocks) {
          const id = nextBlockId(doc, prefixOf(b.id));
          idMap.set(b.id, id);
          const copy = { ...structuredClone(b), id, position: { x: b.position.x + offset.x, y: b.position.y + offset.y } } as DesignBlock;
          doc = { ...doc, blocks: [...doc.blocks, copy] };
        }
        const newWires: string[] = [];
        for (const w of s.clipboard.wires) {
          const source = idMap.get(w.source);
          const target = idMap.get(w.target);
          if (!source || !target) continue;
          const id = nextWireId(doc);
          newWires.push(id);
          doc = { ...doc, wires: [...doc.wires, { id, source, sourcePort: w.sourcePort, target, targetPort: w.targetPort }] };
        }
        // The next paste lands one step further on, so repeated pastes do not stack.
        const clipboard: Clipboard = {
          blocks: s.clipboard.blocks.map((b) => ({ ...b, position: { x: b.position.x + offset.x, y: b.position.y + offset.y } }) as DesignBlock),
          wires: s.clipboard.wires,
        };
        return commit(doc, { selection: { blocks: [...idMap.values()], wires: newWires }, clipboard });
      },

      select(sel, mode = 'replace') {
        const s = get();
        const blocks = sel.blocks ?? [];
        const wires = sel.wires ?? [];
        let next: Selection;
        // Replace sets the parts given; a part left out (blocks or wires) stays as it is.
        if (mode === 'replace') next = { blocks: sel.blocks ? [...new Set(blocks)] : s.selection.blocks, wires: sel.wires ? [...new Set(wires)] : s.selection.wires };
        else if (mode === 'add') next = { blocks: [...new Set([...s.selection.blocks, ...blocks])], wires: [...new Set([...s.selection.wires, ...wires])] };
        else {
          const tb = new Set(s.selection.blocks);
          for (const id of blocks) if (tb.has(id)) tb.delete(id); else tb.add(id);
          const tw = new Set(s.selection.wires);
          for (const id of wires) if (tw.has(id)) tw.delete(id); else tw.add(id);
          next = { blocks: [...tb], wires: [...tw] };
        }
        next = pruneSelection(next, s.document);
        if (!sameSelection(next, s.selection)) set({ selection: next });
      },

      selectAll() {
        const d = get().document;
        set({ selection: { blocks: d.blocks.map((b) => b.id), wires: d.wires.map((w) => w.id) } });
      },

      clearSelection() {
        if (get().selection.blocks.length || get().selection.wires.length) set({ selection: { blocks: [], wires: [] } });
      },

      undo() {
        const s = get();
        if (s.readOnly || s.gestureStart || s.past.length === 0) return false;
        const prev = s.past[s.past.length - 1];
        set({
          document: prev,
          version: s.version + 1,
          past: s.past.slice(0, -1),
          future: [...s.future, s.document],
          dirty: prev !== s.baseDocument,
          selection: pruneSelection(s.selection, prev),
          lastRefusal: null,
        });
        return true;
      },

      redo() {
        const s = get();
        if (s.readOnly || s.gestureStart || s.future.length === 0) return false;
        const next = s.future[s.future.length - 1];
        set({
          document: next,
          version: s.version + 1,
          past: [...s.past, s.document].slice(-HISTORY_LIMIT),
          future: s.future.slice(0, -1),
          dirty: next !== s.baseDocument,
          selection: pruneSelection(s.selection, next),
          lastRefusal: null,
        });
        return true;
      },

      appendStages(n) {
        const s = get();
        if (s.readOnly) return refuse(READ_ONLY_REASON);
        if (!Number.isInteger(n) || n < 1) return refuse('The number of stages to add must be a whole number of at least 1.');
        const byId = new Map(s.document.blocks.map((b) => [b.id, b] as const));
        const stages = s.selection.blocks.filter((id) => byId.get(id)?.kind === 'stage');
        const res = appendStagesOp(s.document, n, stages.length === 1 ? stages[0] : undefined);
        if (!res.ok) return refuse(res.reason);
        return commit(res.document, { selection: { blocks: res.added, wires: [] } });
      },

      loadStarter(kind, n) {
        if (!Number.isInteger(n) || n < 1 || n > 200) return refuse('A starter needs a whole number of stages from 1 to 200.');
        return commit(starterDocument(kind, n), { selection: { blocks: [], wires: [] } });
      },

      replaceDocument(document) {
        return commit(document, { selection: { blocks: [], wires: [] } });
      },

      resetDocument(document, opts = {}) {
        const s = get();
        const base = opts.dirtyFrom ?? document;
        set({
          document,
          baseDocument: base,
          dirty: document !== base,
          version: s.version + 1,
          past: [],
          future: [],
          gestureStart: null,
          selection: { blocks: [], wires: [] },
          lastRefusal: null,
          readOnly: opts.readOnly ?? s.readOnly,
        });
      },

      markSaved(document) {
        const s = get();
        set({ baseDocument: document, dirty: s.document !== document });
      },

      clearRefusal() {
        if (get().lastRefusal !== null) set({ lastRefusal: null });
      },
    };
  });
}
