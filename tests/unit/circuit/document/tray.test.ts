import { describe, expect, it } from 'vitest';
import { createBlock, emptyDocument, nextBlockId, nextWireId, TRAY_ID_PREFIX, TRAY_ITEMS } from '@/lib/circuit/document/tray';
import { designDocumentSchema, type DesignBlock } from '@/lib/circuit/document/schema';
import { starterDocument } from '@/lib/circuit/document/ladder-ops';
import { compileDocument } from '@/lib/circuit/compile/compile';

describe('tray', () => {
  it('offers every item once, each with a label and a hint', () => {
    const keys = TRAY_ITEMS.map((i) => i.key);
    expect(new Set(keys).size).toBe(12);
    for (const i of TRAY_ITEMS) {
      expect(i.label.length).toBeGreaterThan(0);
      expect(i.hint.length).toBeGreaterThan(0);
      expect(TRAY_ID_PREFIX[i.key]).toMatch(/^[a-z]+$/);
    }
  });

  it('every new block is valid under the document schema', () => {
    const blocks = TRAY_ITEMS.map((item, k) => createBlock(item.key, `b${k}`, { x: 10 * k, y: 5 }));
    const parsed = designDocumentSchema.safeParse({ ...emptyDocument(), blocks });
    expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
  });

  it('stage items give the variant and polarity their key names', () => {
    const cases = [
      ['stage-half-pos', 'half', 'positive'],
      ['stage-half-neg', 'half', 'negative'],
      ['stage-full-pos', 'full', 'positive'],
      ['stage-full-neg', 'full', 'negative'],
    ] as const;
    for (const [key, variant, polarity] of cases) {
      const b = createBlock(key, 's1', { x: 0, y: 0 });
      if (b.kind !== 'stage') throw new Error('not a stage');
      expect(b.data).toMatchObject({ variant, polarity });
      expect(b.data.pump2C !== undefined).toBe(variant === 'full');
    }
    const ct = createBlock('ac-source-ct', 'src', { x: 0, y: 0 });
    expect(ct.kind === 'acSource' && ct.data.variant).toBe('centreTapped');
  });

  it('with `like`, a new stage copies the last stage of its polarity and a drive copies the existing drive', () => {
    const doc = starterDocument('half-wave', 2);
    const s2 = doc.blocks.find((b) => b.id === 's2') as Extract<DesignBlock, { kind: 'stage' }>;
    s2.data.pumpC = { capacitanceF: 47e-9, ratedVoltageV: 5000 };
    const src = doc.blocks.find((b) => b.id === 'src') as Extract<DesignBlock, { kind: 'acSource' }>;
    src.data.frequencyHz = 50_000;
    const s = createBlock('stage-full-pos', 's3', { x: 0, y: 0 }, doc);
    if (s.kind !== 'stage') throw new Error('not a stage');
    expect(s.data.pumpC).toEqual({ capacitanceF: 47e-9, ratedVoltageV: 5000 });
    expect(s.data.pump2C).toEqual({ capacitanceF: 47e-9, ratedVoltageV: 5000 });
    expect(s.label).toBe('Stage 3');
    // A copy, not a shared object.
    s.data.pumpC.capacitanceF = 1e-9;
    expect(s2.data.pumpC.capacitanceF).toBe(47e-9);
    const d = createBlock('ac-source-ct', 'src2', { x: 0, y: 0 }, doc);
    expect(d.kind === 'acSource' && d.data.frequencyHz).toBe(50_000);
  });

  it('ids are one above the highest in use, never a freed one', () => {
    const doc = starterDocument('half-wave', 3);
    expect(nextBlockId(doc, 's')).toBe('s4');
    const without2 = { ...doc, blocks: doc.blocks.filter((b) => b.id !== 's2') };
    expect(nextBlockId(without2, 's')).toBe('s4');
    expect(nextBlockId(doc, 'load')).toBe('load2');
    expect(nextBlockId(doc, 'c')).toBe('c1');
    expect(nextWireId(doc)).toBe(`w${doc.wires.length + 1}`);
    expect(nextWireId(emptyDocument())).toBe('w1');
  });
});

describe('starterDocument', () => {
  for (const kind of ['half-wave', 'full-wave', 'symmetric'] as const) {
    it(`${kind}: valid, compiles to its kind with n stages and no diagnostics`, () => {
      for (const n of [1, 3]) {
        const doc = starterDocument(kind, n);
        expect(designDocumentSchema.safeParse(doc).success).toBe(true);
        const r = compileDocument(doc);
        if (!r.ok) throw new Error(r.reason);
        expect(r.topology.kind).toBe(kind);
        expect(r.topology.ladders.every((l) => l.stages === n)).toBe(true);
        expect(r.diagnostics.filter((d) => d.severity !== 'info')).toEqual([]);
      }
    });
  }
});
