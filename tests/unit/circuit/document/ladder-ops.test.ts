import { describe, expect, it } from 'vitest';
import { appendStages, canvasLadders, snapWires, starterDocument } from '@/lib/circuit/document/ladder-ops';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { portPosition, STAGE_WIDTH } from '@/lib/circuit/document/geometry';
import { createBlock, emptyDocument } from '@/lib/circuit/document/tray';
import { checkWire } from '@/lib/circuit/document/connect';
import { designDocumentSchema, type DesignBlock, type DesignDocument } from '@/lib/circuit/document/schema';

function compiled(doc: DesignDocument) {
  const r = compileDocument(doc);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

function grown(doc: DesignDocument, n: number, id?: string) {
  const r = appendStages(doc, n, id);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

const block = (doc: DesignDocument, id: string) => doc.blocks.find((b) => b.id === id) as DesignBlock;

describe('canvasLadders', () => {
  it('finds the chains of the starters, bottom first', () => {
    expect(canvasLadders(starterDocument('half-wave', 3))).toEqual([{ stages: ['s1', 's2', 's3'], top: 's3', polarity: 'positive' }]);
    expect(canvasLadders(starterDocument('symmetric', 2))).toEqual([
      { stages: ['p1', 'p2'], top: 'p2', polarity: 'positive' },
      { stages: ['m1', 'm2'], top: 'm2', polarity: 'negative' },
    ]);
  });
});

describe('appendStages', () => {
  for (const kind of ['half-wave', 'full-wave', 'symmetric'] as const) {
    it(`${kind}: 2 → 5 stages compiles to the same kind with 3 more stages`, () => {
      const doc = starterDocument(kind, 2);
      const before = compiled(doc).topology;
      const r = grown(doc, 3);
      expect(designDocumentSchema.safeParse(r.document).success).toBe(true);
      const after = compiled(r.document).topology;
      expect(after.kind).toBe(before.kind);
      expect(after.ladders.map((l) => l.stages)).toEqual(before.ladders.map(() => 5));
      expect(after.ladders.map((l) => l.polarity)).toEqual(before.ladders.map((l) => l.polarity));
      expect(after.ladders.every((l) => l.loadElements.length === 1)).toBe(true);
      expect(r.added).toHaveLength(kind === 'symmetric' ? 6 : 3);
      expect(compiled(r.document).diagnostics.filter((d) => d.severity !== 'info')).toEqual([]);
      // The input document is unchanged.
      expect(doc).toEqual(starterDocument(kind, 2));
    });
  }

  it('copies the top stage’s values, numbers ids and labels on, and chains ports that coincide', () => {
    const doc = starterDocument('half-wave', 2);
    const top = block(doc, 's2') as Extract<DesignBlock, { kind: 'stage' }>;
    top.data.smoothC = { capacitanceF: 22e-9, ratedVoltageV: 6000 };
    const r = grown(doc, 2);
    expect(r.added).toEqual(['s3', 's4']);
    const s4 = block(r.document, 's4') as Extract<DesignBlock, { kind: 'stage' }>;
    expect(s4.label).toBe('Stage 4');
    expect(s4.data.smoothC).toEqual({ capacitanceF: 22e-9, ratedVoltageV: 6000 });
    expect(s4.position).toEqual({ x: top.position.x + 2 * STAGE_WIDTH, y: top.position.y });
    const load = block(r.document, 'load');
    expect(load.position.x).toBe(block(doc, 'load').position.x + 2 * STAGE_WIDTH);
    expect(portPosition(load, 'a')).toEqual(portPosition(s4, 'yOut'));
    expect(r.document.wires.some((w) => w.source === 's4' && w.sourcePort === 'yOut' && w.target === 'load')).toBe(true);
    expect(new Set(r.document.wires.map((w) => w.id)).size).toBe(r.document.wires.length);
    // Blocks left of the top stay where they were.
    expect(block(r.document, 'src').position).toEqual(block(doc, 'src').position);
  });

  it('grows only the chosen ladder of a symmetric pair, from any of its stages', () => {
    const r = grown(starterDocument('symmetric', 2), 1, 'm1');
    expect(r.added).toEqual(['m3']);
    expect(block(r.document, 'm3').label).toBe('− stage 3');
    const t = compiled(r.document).topology;
    expect(t.ladders.map((l) => [l.polarity, l.stages])).toEqual([
      ['positive', 2],
      ['negative', 3],
    ]);
  });

  it('refuses what it cannot do, with a reason', () => {
    const doc = starterDocument('half-wave', 2);
    for (const [d, n, id, re] of [
      [doc, 0, undefined, /whole number/],
      [doc, 2.5, undefined, /whole number/],
      [doc, 1, 'nope', /no block "nope"/],
      [doc, 1, 'load', /not a stage/],
      [emptyDocument(), 1, undefined, /no ladder/],
    ] as const) {
      const r = appendStages(d, n, id);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(re);
    }
    const two = { ...doc, blocks: [...doc.blocks, createBlock('stage-half-pos', 's9', { x: 0, y: 900 })] };
    const r = appendStages(two, 1);
    expect(!r.ok && r.reason).toMatch(/2 ladders.*select a stage/);
  });
});

describe('snapWires', () => {
  it('a stage dropped near the top of a ladder aligns onto its outputs and wires to them', () => {
    const base = starterDocument('half-wave', 2);
    const doc = { ...base, blocks: base.blocks.filter((b) => b.id !== 'load'), wires: base.wires.filter((w) => w.source !== 'load' && w.target !== 'load') };
    const s2 = block(doc, 's2');
    const dropped = createBlock('stage-half-pos', 's3', { x: s2.position.x + STAGE_WIDTH + 15, y: s2.position.y - 12 }, doc);
    const d = { ...doc, blocks: [...doc.blocks, dropped] };
    const snap = snapWires(d, 's3');
    expect(snap).not.toBeNull();
    expect(snap?.position).toEqual({ x: s2.position.x + STAGE_WIDTH, y: s2.position.y });
    expect(snap?.wires).toEqual([
      { source: 's2', sourcePort: 'xOut', target: 's3', targetPort: 'xIn' },
      { source: 's2', sourcePort: 'yOut', target: 's3', targetPort: 'yIn' },
    ]);
    const after = { ...d, blocks: d.blocks.map((b) => (b.id === 's3' ? { ...b, position: snap!.position } : b)), wires: [...d.wires, ...snap!.wires.map((w, i) => ({ id: `x${i}`, ...w }))] };
    expect(compiled(after).topology.ladders[0].stages).toBe(3);
  });

  it('does not snap when a port is further than 24 px, nor onto a stage that already feeds one', () => {
    const doc = starterDocument('half-wave', 2);
    const s2 = block(doc, 's2');
    const far = createBlock('stage-half-pos', 's3', { x: s2.position.x + STAGE_WIDTH + 30, y: s2.position.y }, doc);
    expect(snapWires({ ...doc, blocks: [...doc.blocks, far] }, 's3')).toBeNull();
    const s1 = block(doc, 's1');
    const onS1 = createBlock('stage-half-pos', 's3', { x: s1.position.x + STAGE_WIDTH + 5, y: s1.position.y + 300 }, doc);
    expect(snapWires({ ...doc, blocks: [...doc.blocks, onS1] }, 's3')).toBeNull();
    const overS1 = createBlock('stage-half-pos', 's3', { x: s1.position.x + STAGE_WIDTH + 5, y: s1.position.y + 5 }, doc);
    expect(snapWires({ ...doc, blocks: [...doc.blocks, overS1] }, 's3')).toBeNull();
  });

  it('a stage moved next to the top of its own ladder does not snap onto it', () => {
    const doc = starterDocument('half-wave', 3);
    const s3 = block(doc, 's3');
    const moved = { ...doc, blocks: doc.blocks.map((b) => (b.id === 's1' ? { ...b, position: { x: s3.position.x + STAGE_WIDTH + 8, y: s3.position.y + 8 } } : b)) };
    expect(snapWires(moved, 's1')).toBeNull();
    // Its direct predecessor is still a target: s2 nudged off s1's outputs snaps back.
    const s1 = block(doc, 's1');
    const nudged = { ...doc, blocks: doc.blocks.map((b) => (b.id === 's2' ? { ...b, position: { x: b.position.x + 10, y: b.position.y - 6 } } : b)) };
    expect(snapWires(nudged, 's2')).toEqual({ position: { x: s1.position.x + STAGE_WIDTH, y: s1.position.y }, wires: [] });
  });

  it('a first stage snaps onto the drive: hot → xIn, ground → yIn (and hotB → x2In for full-wave)', () => {
    const src = createBlock('ac-source-ct', 'src', { x: 0, y: 120 });
    const gnd = createBlock('ground', 'gnd', { x: 0, y: 320 });
    const base: DesignDocument = { ...emptyDocument(), blocks: [src, gnd], wires: [{ id: 'w1', source: 'src', sourcePort: 'ct', target: 'gnd', targetPort: 'g' }] };
    const hot = portPosition(src, 'hot')!;
    const stage = createBlock('stage-full-pos', 's1', { x: hot.x + 10, y: hot.y - 30 + 10 });
    const d = { ...base, blocks: [...base.blocks, stage] };
    const snap = snapWires(d, 's1');
    expect(snap?.position).toEqual({ x: hot.x, y: hot.y - 30 });
    expect(snap?.wires).toEqual([
      { source: 'src', sourcePort: 'hot', target: 's1', targetPort: 'xIn' },
      { source: 'src', sourcePort: 'hotB', target: 's1', targetPort: 'x2In' },
      { source: 'gnd', sourcePort: 'g', target: 's1', targetPort: 'yIn' },
    ]);
    for (const w of snap!.wires) expect(checkWire(d, w).ok).toBe(true);
  });

  it('leaves out wires checkWire would refuse and ignores blocks that are not stages', () => {
    const doc = starterDocument('half-wave', 1);
    expect(snapWires(doc, 'load')).toBeNull();
    expect(snapWires(doc, 'nope')).toBeNull();
    // With the drive's hot output moved onto s1's xIn, s1 snaps in place, and its wires exist already.
    const moved = { ...doc, blocks: doc.blocks.map((b) => (b.id === 'src' ? { ...b, position: { x: 60, y: b.position.y } } : b)) };
    expect(portPosition(block(moved, 'src'), 'hot')).toEqual(portPosition(block(moved, 's1'), 'xIn'));
    const snap = snapWires(moved, 's1');
    expect(snap).toEqual({ position: block(moved, 's1').position, wires: [] });
  });
});
