import { describe, expect, it } from 'vitest';
import { starterDocument } from '@/lib/circuit/document/ladder-ops';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { compareDocuments, sameValue } from '@/lib/editor/compare';
import { createEditorStore } from '@/lib/editor/store';

describe('compareDocuments (the 409 compare list)', () => {
  it('finds nothing between a document and a key-reordered copy of it (JSONB reorders keys)', () => {
    const doc = starterDocument('half-wave', 3);
    const reordered = JSON.parse(JSON.stringify(doc, (_k, v) => (v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v).reverse()) : v))) as DesignDocument;
    expect(sameValue(doc, reordered)).toBe(true);
    expect(compareDocuments(doc, reordered)).toEqual({ blocks: [], wiresOnlyMine: 0, wiresOnlyTheirs: 0, settingsDiffer: false });
  });

  it('lists blocks only in mine, only in theirs, with changed values and only moved', () => {
    const theirs = starterDocument('half-wave', 3);
    const store = createEditorStore({ document: theirs, readOnly: false });
    const s = store.getState;
    s().appendStages(1);
    const added = s().selection.blocks[0];
    s().moveBlocks({ s1: { x: 5, y: 5 } });
    s().updateBlockData('load', { mode: 'resistor', resistanceOhm: 2e6 });
    s().select({ blocks: ['gnd'] });
    s().deleteSelection();
    const cmp = compareDocuments(s().document, theirs);
    const byId = Object.fromEntries(cmp.blocks.map((b) => [b.id, b.change]));
    expect(byId[added]).toBe('only-mine');
    expect(byId.gnd).toBe('only-theirs');
    expect(byId.load).toBe('values');
    expect(byId.s1).toBe('moved');
    expect(byId.s2).toBeUndefined();
    expect(cmp.wiresOnlyTheirs).toBeGreaterThan(0);
    expect(cmp.settingsDiffer).toBe(false);
  });

  it('matches wires by their two ends, whichever way round they were drawn', () => {
    const a = starterDocument('half-wave', 1);
    const b: DesignDocument = { ...a, wires: a.wires.map((w, i) => ({ id: `x${i}`, source: w.target, sourcePort: w.targetPort, target: w.source, targetPort: w.sourcePort })) };
    const cmp = compareDocuments(a, b);
    expect(cmp.wiresOnlyMine).toBe(0);
    expect(cmp.wiresOnlyTheirs).toBe(0);
  });
});
