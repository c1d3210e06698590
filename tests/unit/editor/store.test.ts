import { describe, expect, it } from 'vitest';
import { designDocumentSchema, type DesignDocument } from '@/lib/circuit/document/schema';
import { starterDocument } from '@/lib/circuit/document/ladder-ops';
import { portAnchors } from '@/lib/circuit/document/geometry';
import { HISTORY_LIMIT, createEditorStore } from '@/lib/editor/store';

function storeWith(doc: DesignDocument, readOnly = false) {
  return createEditorStore({ document: doc, readOnly });
}

function block(doc: DesignDocument, id: string) {
  const b = doc.blocks.find((x) => x.id === id);
  if (!b) throw new Error(`no block ${id}`);
  return b;
}

function stageCount(doc: DesignDocument): number {
  return doc.blocks.filter((b) => b.kind === 'stage').length;
}

describe('editor store: adding, moving, editing', () => {
  it('adds a tray block with a fresh id, selects it, bumps the version, and undo/redo it', () => {
    const store = storeWith(starterDocument('half-wave', 2));
    const before = store.getState().document;
    const res = store.getState().addBlock('capacitor', { x: 900, y: 700 });
    expect(res.ok).toBe(true);
    if (!res.ok) return;
    const s = store.getState();
    expect(s.version).toBe(1);
    expect(s.dirty).toBe(true);
    expect(s.selection.blocks).toEqual([res.id]);
    expect(before.blocks.some((b) => b.id === res.id)).toBe(false);
    expect(block(s.document, res.id).kind).toBe('capacitor');
    expect(block(s.document, res.id).position).toEqual({ x: 900, y: 700 });
    expect(designDocumentSchema.safeParse(s.document).success).toBe(true);

    expect(store.getState().undo()).toBe(true);
    expect(store.getState().document).toBe(before);
    expect(store.getState().version).toBe(2);
    expect(store.getState().dirty).toBe(false);
    expect(store.getState().selection.blocks).toEqual([]);
    expect(store.getState().redo()).toBe(true);
    expect(block(store.getState().document, res.id).kind).toBe('capacitor');
    expect(store.getState().redo()).toBe(false);
  });

  it('centres a dropped block on the pointer when asked', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    const res = store.getState().addBlock('ground', { x: 1000, y: 1000 }, 'center');
    if (!res.ok) throw new Error(res.reason);
    const b = block(store.getState().document, res.id);
    expect(b.position.x).toBeLessThan(1000);
    expect(b.position.y).toBeLessThan(1000);
  });

  it('records a drag of many pointer moves as one undo step', () => {
    const store = storeWith(starterDocument('half-wave', 2));
    const start = store.getState().document;
    const p0 = block(start, 'load').position;
    store.getState().beginGesture();
    for (let i = 1; i <= 30; i++) store.getState().moveBlocks({ load: { x: p0.x + i * 3, y: p0.y + 400 + i } });
    store.getState().endGesture(['load']);
    expect(block(store.getState().document, 'load').position).toEqual({ x: p0.x + 90, y: p0.y + 430 });
    expect(store.getState().past).toHaveLength(1);
    expect(store.getState().version).toBe(30);
    store.getState().undo();
    expect(store.getState().document).toBe(start);
    expect(store.getState().past).toHaveLength(0);
  });

  it('a drag that moves nothing records no step', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    store.getState().beginGesture();
    store.getState().endGesture(['s1']);
    expect(store.getState().past).toHaveLength(0);
    expect(store.getState().version).toBe(0);
  });

  it('moves several blocks at once outside a drag as one step', () => {
    const store = storeWith(starterDocument('half-wave', 2));
    store.getState().moveBlocks({ s1: { x: 10, y: 20 }, s2: { x: 230, y: 20 } });
    expect(block(store.getState().document, 's1').position).toEqual({ x: 10, y: 20 });
    expect(block(store.getState().document, 's2').position).toEqual({ x: 230, y: 20 });
    expect(store.getState().past).toHaveLength(1);
  });

  it('updates block data, the label and the settings, each undoable', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    const load = block(store.getState().document, 'load');
    expect(store.getState().updateBlockData('load', { mode: 'resistor', resistanceOhm: 1e6 }, 'Bench load').ok).toBe(true);
    const after = block(store.getState().document, 'load');
    expect(after.data).toEqual({ mode: 'resistor', resistanceOhm: 1e6 });
    expect(after.label).toBe('Bench load');
    store.getState().updateSettings({ ...store.getState().document.settings, deratingFraction: 0.6 });
    expect(store.getState().document.settings.deratingFraction).toBe(0.6);
    store.getState().undo();
    store.getState().undo();
    expect(block(store.getState().document, 'load')).toEqual(load);
    expect(store.getState().updateBlockData('nope', { mode: 'current', currentA: 0 }).ok).toBe(false);
    expect(store.getState().lastRefusal).toMatch(/nope/);
  });

  it('a new edit after undo clears the redo stack', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    store.getState().addBlock('diode', { x: 0, y: 600 });
    store.getState().undo();
    expect(store.getState().future).toHaveLength(1);
    store.getState().addBlock('resistor', { x: 0, y: 700 });
    expect(store.getState().future).toHaveLength(0);
    expect(store.getState().redo()).toBe(false);
  });

  it(`keeps at most ${HISTORY_LIMIT} undo steps`, () => {
    const store = storeWith(starterDocument('half-wave', 1));
    for (let i = 0; i < HISTORY_LIMIT + 15; i++) store.getState().moveBlocks({ load: { x: i, y: 0 } });
    expect(store.getState().past).toHaveLength(HISTORY_LIMIT);
  });
});

describe('editor store: selection, delete, copy and paste', () => {
  it('selects, adds to and toggles the selection; select all takes every block and wire', () => {
    const store = storeWith(starterDocument('half-wave', 3));
    store.getState().select({ blocks: ['s1'] });
    store.getState().select({ blocks: ['s2'] }, 'add');
    expect(store.getState().selection.blocks).toEqual(['s1', 's2']);
    store.getState().select({ blocks: ['s1', 's3'] }, 'toggle');
    expect(store.getState().selection.blocks.sort()).toEqual(['s2', 's3']);
    store.getState().select({ blocks: ['ghost'] });
    expect(store.getState().selection.blocks).toEqual([]);
    store.getState().selectAll();
    const d = store.getState().document;
    expect(store.getState().selection.blocks).toHaveLength(d.blocks.length);
    expect(store.getState().selection.wires).toHaveLength(d.wires.length);
    store.getState().clearSelection();
    expect(store.getState().selection).toEqual({ blocks: [], wires: [] });
  });

  it('replacing one part of the selection keeps the other part', () => {
    const store = storeWith(starterDocument('half-wave', 2));
    const wire = store.getState().document.wires[0].id;
    store.getState().select({ blocks: ['s1'], wires: [wire] });
    store.getState().select({ blocks: ['s2'] });
    expect(store.getState().selection).toEqual({ blocks: ['s2'], wires: [wire] });
    store.getState().select({ wires: [] });
    expect(store.getState().selection).toEqual({ blocks: ['s2'], wires: [] });
  });

  it('deletes the selected blocks with every wire on them, and the selected wires', () => {
    const store = storeWith(starterDocument('half-wave', 3));
    const doc0 = store.getState().document;
    const onS2 = doc0.wires.filter((w) => w.source === 's2' || w.target === 's2').map((w) => w.id);
    expect(onS2.length).toBeGreaterThan(0);
    const loose = doc0.wires.find((w) => w.source !== 's2' && w.target !== 's2')!;
    store.getState().select({ blocks: ['s2'], wires: [loose.id] });
    expect(store.getState().deleteSelection().ok).toBe(true);
    const doc1 = store.getState().document;
    expect(doc1.blocks.some((b) => b.id === 's2')).toBe(false);
    for (const id of [...onS2, loose.id]) expect(doc1.wires.some((w) => w.id === id)).toBe(false);
    expect(doc1.wires).toHaveLength(doc0.wires.length - onS2.length - 1);
    expect(store.getState().selection).toEqual({ blocks: [], wires: [] });
    expect(designDocumentSchema.safeParse(doc1).success).toBe(true);
    store.getState().undo();
    expect(store.getState().document).toBe(doc0);
    expect(store.getState().deleteSelection().ok).toBe(false);
  });

  it('pastes copies with fresh ids, keeps the wires between copied blocks and drops the others', () => {
    const store = storeWith(starterDocument('half-wave', 3));
    const doc0 = store.getState().document;
    store.getState().select({ blocks: ['s2', 's3'] });
    expect(store.getState().copy().ok).toBe(true);
    const internal = doc0.wires.filter((w) => ['s2', 's3'].includes(w.source) && ['s2', 's3'].includes(w.target));
    expect(internal.length).toBe(2);
    expect(store.getState().paste({ x: 0, y: 300 }).ok).toBe(true);
    const doc1 = store.getState().document;
    expect(doc1.blocks).toHaveLength(doc0.blocks.length + 2);
    expect(doc1.wires).toHaveLength(doc0.wires.length + internal.length);
    const ids = doc1.blocks.map((b) => b.id);
    expect(new Set(ids).size).toBe(ids.length);
    const wireIds = doc1.wires.map((w) => w.id);
    expect(new Set(wireIds).size).toBe(wireIds.length);
    const pasted = store.getState().selection.blocks;
    expect(pasted).toHaveLength(2);
    for (const id of pasted) expect(doc0.blocks.some((b) => b.id === id)).toBe(false);
    const [a, b] = pasted.map((id) => block(doc1, id));
    expect(a.position).toEqual({ x: block(doc0, 's2').position.x, y: block(doc0, 's2').position.y + 300 });
    expect(a.data).toEqual(block(doc0, 's2').data);
    expect(b.kind).toBe('stage');
    const pastedWires = doc1.wires.filter((w) => pasted.includes(w.source) || pasted.includes(w.target));
    expect(pastedWires).toHaveLength(2);
    for (const w of pastedWires) expect(pasted.includes(w.source) && pasted.includes(w.target)).toBe(true);
    expect(designDocumentSchema.safeParse(doc1).success).toBe(true);
    // A second paste lands further on and again gets fresh ids.
    store.getState().paste({ x: 0, y: 300 });
    const doc2 = store.getState().document;
    expect(doc2.blocks).toHaveLength(doc0.blocks.length + 4);
    expect(new Set(doc2.blocks.map((x) => x.id)).size).toBe(doc2.blocks.length);
    const third = store.getState().selection.blocks.map((id) => block(doc2, id));
    expect(third[0].position.y).toBe(block(doc0, 's2').position.y + 600);
  });

  it('refuses to copy nothing and to paste an empty clipboard', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    expect(store.getState().copy().ok).toBe(false);
    expect(store.getState().paste().ok).toBe(false);
    expect(store.getState().lastRefusal).toMatch(/clipboard/i);
    expect(store.getState().version).toBe(0);
  });
});

describe('editor store: connection rules', () => {
  it('adds a wire the rules accept', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    const r = store.getState().addBlock('resistor', { x: 600, y: 600 });
    if (!r.ok) throw new Error(r.reason);
    const n = store.getState().document.wires.length;
    const res = store.getState().connect({ source: 's1', sourcePort: 'yOut', target: r.id, targetPort: 'a' });
    expect(res.ok).toBe(true);
    const doc = store.getState().document;
    expect(doc.wires).toHaveLength(n + 1);
    expect(store.getState().lastRefusal).toBeNull();
    store.getState().undo();
    expect(store.getState().document.wires).toHaveLength(n);
  });

  it.each([
    ['a port to itself', { source: 's1', sourcePort: 'xIn', target: 's1', targetPort: 'xIn' }],
    ['a wire that shorts the pumping capacitor', { source: 's1', sourcePort: 'xIn', target: 's1', targetPort: 'xOut' }],
    ['a wire that shorts the smoothing capacitor', { source: 's1', sourcePort: 'yIn', target: 's1', targetPort: 'yOut' }],
    ['a duplicate of an existing wire', { source: 'src', sourcePort: 'hot', target: 's1', targetPort: 'xIn' }],
    ['a wire that shorts the source', { source: 'src', sourcePort: 'hot', target: 'gnd', targetPort: 'g' }],
    ['a port the block does not have', { source: 's1', sourcePort: 'x2Out', target: 'load', targetPort: 'a' }],
    ['a block that is not there', { source: 'ghost', sourcePort: 'a', target: 'load', targetPort: 'a' }],
  ])('refuses %s with a reason and leaves the document alone', (_name, candidate) => {
    const store = storeWith(starterDocument('half-wave', 2));
    const doc0 = store.getState().document;
    const res = store.getState().connect(candidate);
    expect(res.ok).toBe(false);
    if (res.ok) return;
    expect(res.reason.length).toBeGreaterThan(10);
    expect(store.getState().lastRefusal).toBe(res.reason);
    expect(store.getState().document).toBe(doc0);
    expect(store.getState().version).toBe(0);
    expect(store.getState().past).toHaveLength(0);
  });

  it('a refused wire never reaches the document even through undo/redo', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    store.getState().connect({ source: 's1', sourcePort: 'xIn', target: 's1', targetPort: 'xOut' });
    expect(store.getState().undo()).toBe(false);
  });

  it('a stage dropped with its inputs on a stage output snaps into place and wires up (one undo step)', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    const doc0 = store.getState().document;
    store.getState().select({ blocks: ['load'] });
    store.getState().deleteSelection();
    const s1 = block(store.getState().document, 's1');
    const at = { x: s1.position.x + 220 + 7, y: s1.position.y - 5 };
    const res = store.getState().addBlock('stage-half-pos', at);
    if (!res.ok) throw new Error(res.reason);
    const doc = store.getState().document;
    const added = block(doc, res.id);
    // Snapped: the new stage's input ports sit exactly on s1's output ports.
    const abs = (b: typeof added, port: string) => {
      const a = portAnchors(b).find((p) => p.port === port)!;
      return { x: b.position.x + a.x, y: b.position.y + a.y };
    };
    expect(abs(added, 'xIn')).toEqual(abs(s1, 'xOut'));
    expect(abs(added, 'yIn')).toEqual(abs(s1, 'yOut'));
    const joins = doc.wires.filter((w) => w.source === res.id || w.target === res.id);
    const pairs = joins.map((w) => [w.source, w.sourcePort, w.target, w.targetPort].join(' ')).sort();
    expect(pairs.some((p) => p.includes('s1 xOut') && p.includes(`${res.id} xIn`))).toBe(true);
    expect(pairs.some((p) => p.includes('s1 yOut') && p.includes(`${res.id} yIn`))).toBe(true);
    store.getState().undo();
    store.getState().undo();
    expect(store.getState().document).toBe(doc0);
  });
});

describe('editor store: ladder actions and documents', () => {
  it('adds n stages to the ladder in one undo step', () => {
    const store = storeWith(starterDocument('half-wave', 3));
    const doc0 = store.getState().document;
    expect(store.getState().appendStages(2).ok).toBe(true);
    expect(stageCount(store.getState().document)).toBe(5);
    expect(store.getState().selection.blocks).toHaveLength(2);
    expect(store.getState().past).toHaveLength(1);
    store.getState().undo();
    expect(store.getState().document).toBe(doc0);
  });

  it('grows both ladders of a symmetric pair', () => {
    const store = storeWith(starterDocument('symmetric', 2));
    expect(store.getState().appendStages(1).ok).toBe(true);
    expect(stageCount(store.getState().document)).toBe(6);
  });

  it('refuses a stage count that is not a positive whole number', () => {
    const store = storeWith(starterDocument('half-wave', 2));
    expect(store.getState().appendStages(0).ok).toBe(false);
    expect(store.getState().appendStages(1.5).ok).toBe(false);
    expect(store.getState().version).toBe(0);
  });

  it('loads a starter as one undoable step', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    const doc0 = store.getState().document;
    expect(store.getState().loadStarter('full-wave', 4).ok).toBe(true);
    expect(store.getState().document).toEqual(starterDocument('full-wave', 4));
    expect(store.getState().loadStarter('symmetric', 0).ok).toBe(false);
    store.getState().undo();
    expect(store.getState().document).toBe(doc0);
  });

  it('replaces the document on import (undoable) and resets it on load (history cleared)', () => {
    const store = storeWith(starterDocument('half-wave', 1));
    store.getState().select({ blocks: ['s1'] });
    const imported = starterDocument('symmetric', 3);
    store.getState().replaceDocument(imported);
    expect(store.getState().document).toBe(imported);
    expect(store.getState().selection.blocks).toEqual([]);
    expect(store.getState().past).toHaveLength(1);
    const loaded = starterDocument('full-wave', 2);
    store.getState().resetDocument(loaded, { readOnly: true });
    expect(store.getState().document).toBe(loaded);
    expect(store.getState().past).toHaveLength(0);
    expect(store.getState().dirty).toBe(false);
    expect(store.getState().readOnly).toBe(true);
  });

  it('tracks dirty against the last saved document', () => {
    const store = storeWith(starterDocument('half-wave', 2));
    store.getState().moveBlocks({ load: { x: 1, y: 1 } });
    expect(store.getState().dirty).toBe(true);
    store.getState().markSaved(store.getState().document);
    expect(store.getState().dirty).toBe(false);
    store.getState().undo();
    expect(store.getState().dirty).toBe(true);
    store.getState().redo();
    expect(store.getState().dirty).toBe(false);
  });
});

describe('editor store: read-only', () => {
  it('refuses every edit with the same reason and never bumps the version', () => {
    const doc = starterDocument('half-wave', 2);
    const store = storeWith(doc, true);
    const s = () => store.getState();
    const outcomes = [
      s().addBlock('capacitor', { x: 0, y: 0 }),
      s().moveBlocks({ s1: { x: 5, y: 5 } }),
      s().updateBlockData('load', { mode: 'current', currentA: 1 }),
      s().updateSettings({ ...doc.settings, deratingFraction: 0.5 }),
      s().connect({ source: 's2', sourcePort: 'yOut', target: 'gnd', targetPort: 'g' }),
      s().appendStages(1),
      s().loadStarter('full-wave', 2),
      s().replaceDocument(starterDocument('symmetric', 1)),
    ];
    s().selectAll();
    outcomes.push(s().deleteSelection());
    expect(s().copy().ok).toBe(true);
    outcomes.push(s().paste());
    for (const o of outcomes) expect(o.ok).toBe(false);
    expect(s().lastRefusal).toMatch(/read-only/);
    s().beginGesture();
    s().endGesture(['s1']);
    expect(s().undo()).toBe(false);
    expect(s().document).toBe(doc);
    expect(s().version).toBe(0);
    expect(s().past).toHaveLength(0);
    expect(s().dirty).toBe(false);
  });
});
