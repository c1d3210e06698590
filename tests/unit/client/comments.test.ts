import { describe, expect, it } from 'vitest';
import type { CommentAnchor, CommentDto } from '@/lib/api/contract';
import { halfWaveStarter } from '@/lib/circuit/document/starters';
import { portPosition } from '@/lib/circuit/document/geometry';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { compileView } from '@/lib/editor/engine/view-model';
import {
  PIN_STEP,
  anchorFromPick,
  anchorKey,
  anchorLabel,
  groupThreads,
  insertMention,
  mentionQuery,
  mentionSuggestions,
  nodePositions,
  pinPlacements,
  sameAnchor,
  splitMentions,
  threadCounts,
  threadNumbers,
  threadOf,
} from '@/lib/client/comments';

const user = { id: 'u1', name: 'Wren Ashby', email: 'wren@tallgrass.test' };
let seq = 0;
function comment(over: Partial<CommentDto> & { anchor: CommentAnchor }): CommentDto {
  seq += 1;
  return {
    id: `c${seq}`,
    designId: 'd1',
    revision: 2,
    parentId: null,
    author: user,
    body: 'text',
    mentions: [],
    resolved: false,
    resolvedBy: null,
    resolvedAt: null,
    createdAt: `2026-12-02T10:${String(seq).padStart(2, '0')}:00.000Z`,
    replies: [],
    canResolve: true,
    ...over,
  };
}

describe('anchors', () => {
  it('keys a design, a node and a block (a part shares its block key)', () => {
    expect(anchorKey({ kind: 'design' })).toBe('design');
    expect(anchorKey({ kind: 'node', node: 'y_s3' })).toBe('node:y_s3');
    expect(anchorKey({ kind: 'part', blockId: 's3' })).toBe('part:s3');
    expect(anchorKey({ kind: 'part', blockId: 's3', part: 'pumpC' })).toBe('part:s3');
  });
  it('tells parts of one block apart when comparing anchors', () => {
    expect(sameAnchor({ kind: 'part', blockId: 's3', part: 'pumpC' }, { kind: 'part', blockId: 's3', part: 'smoothC' })).toBe(false);
    expect(sameAnchor({ kind: 'part', blockId: 's3' }, { kind: 'part', blockId: 's3' })).toBe(true);
    expect(sameAnchor({ kind: 'node', node: 'a' }, { kind: 'node', node: 'b' })).toBe(false);
  });
  it('words anchors with the names the canvas knows, falling back to ids', () => {
    const names = { blocks: { s3: 'C3' }, nodes: { y_s3: 'Output +', x_s1: 'x_s1' } };
    expect(anchorLabel({ kind: 'design' })).toBe('Design');
    expect(anchorLabel({ kind: 'node', node: 'y_s3' }, names)).toBe('Node y_s3 · Output +');
    expect(anchorLabel({ kind: 'node', node: 'x_s1' }, names)).toBe('Node x_s1');
    expect(anchorLabel({ kind: 'node', node: 'out' })).toBe('Node out');
    expect(anchorLabel({ kind: 'part', blockId: 's3', part: 'pumpC' }, names)).toBe('C3 · pump capacitor');
    expect(anchorLabel({ kind: 'part', blockId: 's3' }, names)).toBe('C3');
    expect(anchorLabel({ kind: 'part', blockId: 'r9', part: 'oddPart' })).toBe('r9 · oddPart');
  });
});

describe('threads', () => {
  const a = comment({ anchor: { kind: 'part', blockId: 's2', part: 'pumpC' } });
  const b = comment({ anchor: { kind: 'node', node: 'y_s3' }, resolved: true });
  const c = comment({ anchor: { kind: 'design' } });
  const d = comment({ anchor: { kind: 'part', blockId: 's2' }, replies: [comment({ anchor: { kind: 'part', blockId: 's2' }, parentId: 'x', id: 'reply1' })] });
  const all = [d, b, a, c];

  it('numbers threads in the order they were started, whatever order they arrive in', () => {
    const n = threadNumbers(all);
    expect([n.get(a.id), n.get(b.id), n.get(c.id), n.get(d.id)]).toEqual([1, 2, 3, 4]);
  });
  it('groups by anchor: design, then nodes, then blocks; a block holds its parts’ threads', () => {
    const groups = groupThreads(all, 'all');
    expect(groups.map((g) => g.key)).toEqual(['design', 'node:y_s3', 'part:s2']);
    expect(groups[2].threads.map((t) => t.id)).toEqual([a.id, d.id]);
  });
  it('filters open and resolved threads', () => {
    expect(groupThreads(all, 'open').flatMap((g) => g.threads.map((t) => t.id))).toEqual([c.id, a.id, d.id]);
    expect(groupThreads(all, 'resolved').flatMap((g) => g.threads.map((t) => t.id))).toEqual([b.id]);
    expect(threadCounts(all)).toEqual({ open: 3, resolved: 1, all: 4 });
  });
  it('finds the thread of a reply for a deep link', () => {
    expect(threadOf(all, 'reply1')?.id).toBe(d.id);
    expect(threadOf(all, b.id)?.id).toBe(b.id);
    expect(threadOf(all, 'nope')).toBeNull();
  });
});

describe('the canvas', () => {
  const doc = halfWaveStarter(3, { amplitudeV: 1000, frequencyHz: 20_000, capacitanceF: 10e-9 });
  const compiled = compileDocument(doc);
  if (!compiled.ok) throw new Error(compiled.reason);
  const view = compileView(doc, compiled);

  it('picks a port or a wire as the node the compiler named, a block as a part anchor', () => {
    const s3 = doc.blocks.find((b) => b.id === 's3');
    expect(s3).toBeDefined();
    const yOut = anchorFromPick({ kind: 'port', blockId: 's3', port: 'yOut' }, view.nodeOfPort);
    expect(yOut).toEqual({ ok: true, anchor: { kind: 'node', node: view.nodeOfPort['s3:yOut'] } });
    expect(view.nodeOfPort['s3:yOut']).toBe('y_s3');
    const w = doc.wires.find((x) => x.source === 's1' || x.target === 's1');
    if (!w) throw new Error('no wire at s1');
    expect(anchorFromPick({ kind: 'wire', source: w.source, sourcePort: w.sourcePort }, view.nodeOfPort)).toEqual({
      ok: true,
      anchor: { kind: 'node', node: view.nodeOfPort[`${w.target}:${w.targetPort}`] },
    });
    expect(anchorFromPick({ kind: 'block', blockId: 's2', part: 'smoothC' }, view.nodeOfPort)).toEqual({ ok: true, anchor: { kind: 'part', blockId: 's2', part: 'smoothC' } });
    expect(anchorFromPick({ kind: 'block', blockId: 's2' }, view.nodeOfPort)).toEqual({ ok: true, anchor: { kind: 'part', blockId: 's2' } });
    const refused = anchorFromPick({ kind: 'port', blockId: 's3', port: 'yOut' }, {});
    expect(refused.ok).toBe(false);
  });

  it('places a node at one of its own ports, the one nearest their centroid', () => {
    const nodes = nodePositions(view.nodeOfPort, doc.blocks);
    const node = view.nodeOfPort['s1:yOut'];
    const ports = Object.entries(view.nodeOfPort).filter(([, n]) => n === node).map(([k]) => k);
    const onCanvas = ports.map((k) => {
      const [id, port] = k.split(':');
      return portPosition(doc.blocks.find((b) => b.id === id)!, port);
    });
    expect(onCanvas).toContainEqual(nodes.get(node));
  });

  it('pins part threads at their block’s top-right corner, steps shared anchors apart, skips the design and missing blocks', () => {
    const s2 = doc.blocks.find((b) => b.id === 's2')!;
    const t1 = comment({ anchor: { kind: 'part', blockId: 's2' } });
    const t2 = comment({ anchor: { kind: 'part', blockId: 's2', part: 'pumpC' }, resolved: true });
    const t3 = comment({ anchor: { kind: 'design' } });
    const t4 = comment({ anchor: { kind: 'part', blockId: 'gone' } });
    const t5 = comment({ anchor: { kind: 'node', node: 'y_s3' } });
    const nodes = nodePositions(view.nodeOfPort, doc.blocks);
    const pins = pinPlacements([t5, t4, t3, t2, t1], 'all', doc.blocks, nodes);
    expect(pins.map((p) => [p.commentId, p.number, p.resolved])).toEqual([
      [t1.id, 1, false],
      [t2.id, 2, true],
      [t5.id, 5, false],
    ]);
    expect(pins[0]).toMatchObject({ x: s2.position.x + 220, y: s2.position.y, anchorKey: 'part:s2' });
    expect(pins[1].x - pins[0].x).toBe(PIN_STEP);
    expect(pins[2]).toMatchObject(nodes.get('y_s3')!);
    expect(pinPlacements([t5, t2, t1], 'open', doc.blocks, nodes).map((p) => p.commentId)).toEqual([t1.id, t5.id]);
  });
});

describe('mentions', () => {
  const names = ['Wren Ashby', 'Wren', 'Odile Marsh'];
  it('marks known @names, longest first, and gives the body back unchanged', () => {
    const body = 'Ask @wren ashby and @Odile Marsh, cc @Wren. Not mail@Wren or @Wrenfield.';
    const seg = splitMentions(body, names);
    expect(seg.map((s) => s.text).join('')).toBe(body);
    expect(seg.filter((s) => s.mention).map((s) => [s.text, s.mention])).toEqual([
      ['@wren ashby', 'Wren Ashby'],
      ['@Odile Marsh', 'Odile Marsh'],
      ['@Wren', 'Wren'],
    ]);
  });
  it('finds the mention being typed at the caret', () => {
    expect(mentionQuery('hi @Od', 6)).toEqual({ start: 3, query: 'Od' });
    expect(mentionQuery('hi @Odile Ma', 12)).toEqual({ start: 3, query: 'Odile Ma' });
    expect(mentionQuery('@', 1)).toEqual({ start: 0, query: '' });
    expect(mentionQuery('mail@host', 9)).toBeNull();
    expect(mentionQuery('hi @a b c d', 11)).toBeNull();
    expect(mentionQuery('hi @Od\nx', 8)).toBeNull();
    expect(mentionQuery('no at here', 5)).toBeNull();
  });
  it('suggests members by name or word prefix, whole-name matches first', () => {
    const people = [{ name: 'Marsh Tully' }, { name: 'Odile Marsh' }, { name: 'Wren Ashby' }, { name: '' }];
    expect(mentionSuggestions(people, 'mar').map((p) => p.name)).toEqual(['Marsh Tully', 'Odile Marsh']);
    expect(mentionSuggestions(people, '').map((p) => p.name)).toEqual(['Marsh Tully', 'Odile Marsh', 'Wren Ashby']);
    expect(mentionSuggestions(people, 'zz')).toEqual([]);
    expect(mentionSuggestions(people, '', 1)).toHaveLength(1);
  });
  it('inserts @Full Name in place of the query', () => {
    expect(insertMention('ping @od please', 5, 8, 'Odile Marsh')).toEqual({ text: 'ping @Odile Marsh please', caret: 18 });
    expect(insertMention('@w', 0, 2, 'Wren Ashby')).toEqual({ text: '@Wren Ashby ', caret: 12 });
  });
});
