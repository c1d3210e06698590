import { describe, expect, it } from 'vitest';
import { appendStages, halfWaveStarter, type DesignDocument } from '@/lib/circuit';
import { buildComparison, compareHref, comparisonTitle, defaultRevisions, diffDesigns, highlights, resultsOf, type CompareSideInput } from '@/lib/compare';

/** Invented demo values. */
const O = { amplitudeV: 1000, frequencyHz: 20e3, capacitanceF: 10e-9, capacitorRatedV: 3000, loadCurrentA: 100e-6 };

function side(doc: DesignDocument, revision: number, designId = '00000000-0000-4000-8000-000000000001', title = 'Bench supply'): CompareSideInput {
  return { designId, title, revision, latestRevision: 4, revisions: [], document: doc };
}

describe('compare page model', () => {
  const a = halfWaveStarter(2, O);
  const b0 = structuredClone(a);
  const s1 = b0.blocks.find((x) => x.id === 's1');
  if (s1?.kind === 'stage') s1.data.pumpC.capacitanceF = 22e-9;
  const grown = appendStages(b0, 1);
  if (!grown.ok) throw new Error(grown.reason);
  const b = grown.document;

  it('highlights removed and changed blocks on the older drawing, added and changed on the newer', () => {
    const h = highlights(diffDesigns(a, b));
    expect(h.a).toEqual({ s1: 'changed' });
    expect(h.b).toEqual({ s1: 'changed', [grown.added[0]]: 'added' });
    const back = highlights(diffDesigns(b, a));
    expect(back.a).toEqual({ s1: 'changed', [grown.added[0]]: 'removed' });
  });

  it('builds the whole view from the two documents, each side solved on its own', () => {
    const view = buildComparison(side(a, 3), side(b, 4), 'revisions');
    expect(comparisonTitle(view)).toBe('r3 → r4');
    expect(view.diff.changes.map((c) => [c.kind, c.blockId])).toEqual([
      ['changed', 's1'],
      ['added', grown.added[0]],
    ]);
    expect(view.a.results).toEqual(resultsOf(a));
    // The wires each drawing marks are the ones the diff counts.
    expect(view.a.wiresOnlyHere).toHaveLength(view.diff.wires.removed);
    expect(view.b.wiresOnlyHere).toHaveLength(view.diff.wires.added);
    expect(view.b.wiresOnlyHere.every((id) => b.wires.some((w) => w.id === id))).toBe(true);
    const out = view.metrics.find((m) => m.metric === 'outputDc');
    // One more stage: about 2Vp more output (REFERENCES §1.1, V0 = 2nVp).
    expect((out?.delta ?? 0) / 2000).toBeGreaterThan(0.95);
    expect((out?.delta ?? 0) / 2000).toBeLessThan(1.01);
  });

  it('words a fork comparison with both titles', () => {
    const none = { results: { ok: false as const, reason: '' }, highlight: {}, wiresOnlyHere: [] };
    expect(comparisonTitle({ relation: 'fork-of-a', a: { ...side(a, 5), ...none }, b: { ...side(b, 2, 'x', 'Bench supply (fork)'), ...none } })).toBe(
      'Bench supply r5 → Bench supply (fork) r2',
    );
  });

  it('defaults to the revision before the latest and the latest, or both latest for two designs', () => {
    expect(defaultRevisions({}, 4, 4, true)).toEqual({ a: '3', b: '4' });
    expect(defaultRevisions({}, 1, 1, true)).toEqual({ a: '1', b: '1' });
    expect(defaultRevisions({ a: '2' }, 4, 4, true)).toEqual({ a: '2', b: '4' });
    expect(defaultRevisions({}, 7, 2, false)).toEqual({ a: '7', b: '2' });
    expect(defaultRevisions({ a: 'x' }, 7, 2, false).a).toBe('x');
  });

  it('writes the page address with the other design and the offer only when given', () => {
    expect(compareHref('d1', { a: 1, b: 2 })).toBe('/designs/d1/compare?a=1&b=2');
    expect(compareHref('d1', { a: 1, b: 2, bDesign: 'd1' })).toBe('/designs/d1/compare?a=1&b=2');
    expect(compareHref('d1', { a: 3, b: 1, bDesign: 'd2', offer: 'o9' })).toBe('/designs/d1/compare?a=3&b=1&bDesign=d2&offer=o9');
  });
});
