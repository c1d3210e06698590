/**
 * The documents a sweep or spread solves: stage counts grown and shrunk (the compiler still finds
 * a ladder of that many stages, the load still on the top), load current, frequency and scaled
 * capacitors; spread samples drawn within tolerance, reproducible by seed and index; specs and
 * limits validated with the field named; the optimum picked.
 */
import { describe, expect, it } from 'vitest';
import { analysisSpecSchema, MAX_SPREAD_SAMPLES, MAX_SWEEP_POINTS, pointCount, sweepValues, type SpreadSpec, type SweepSpec } from '@/lib/analyses/spec';
import { referenceCapacitance, spreadVariant, stageCountOf, sweepVariant, withFrequency, withLoadCurrent, withStageCapacitance, withStages } from '@/lib/analyses/variants';
import { optimumOf, summarise, type PointResult } from '@/lib/analyses/run';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { designDocumentSchema, type DesignDocument } from '@/lib/circuit/document/schema';
import { halfWaveStarter, symmetricStarter, fullWaveStarter } from '@/lib/circuit/document/starters';

const base = (n = 3): DesignDocument => designDocumentSchema.parse(halfWaveStarter(n, { amplitudeV: 1000, frequencyHz: 10_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 }));

function stagesCompiled(doc: DesignDocument): number | undefined {
  const c = compileDocument(doc);
  return c.ok ? c.topology.ladders[0]?.stages : undefined;
}

describe('stage-count variants', () => {
  it.each([1, 2, 3, 5, 8])('half-wave ladder of 3 → %i stages compiles as that many stages', (n) => {
    const doc = base(3);
    const v = withStages(doc, n);
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect(stageCountOf(v.document)).toBe(n);
    expect(stagesCompiled(v.document)).toBe(n);
    expect(doc.blocks.filter((b) => b.kind === 'stage')).toHaveLength(3);
  });
  it('keeps the load on the top stage when shrinking', () => {
    const v = withStages(base(5), 2);
    if (!v.ok) throw new Error(v.reason);
    const c = compileDocument(v.document);
    expect(c.ok && c.topology.outputs.length).toBe(1);
  });
  it('changes both sides of a symmetric pair', () => {
    const doc = designDocumentSchema.parse(symmetricStarter(3, { amplitudeV: 1000, frequencyHz: 10_000, capacitanceF: 10e-9 }));
    const v = withStages(doc, 5);
    if (!v.ok) throw new Error(v.reason);
    expect(v.document.blocks.filter((b) => b.kind === 'stage')).toHaveLength(10);
    const w = withStages(doc, 1);
    if (!w.ok) throw new Error(w.reason);
    expect(w.document.blocks.filter((b) => b.kind === 'stage')).toHaveLength(2);
  });
  it('refuses a drawing without a ladder', () => {
    const doc = base(2);
    const bare = { ...doc, blocks: doc.blocks.filter((b) => b.kind !== 'stage'), wires: [] };
    expect(withStages(bare, 3)).toEqual({ ok: false, reason: 'the design has no ladder of stages' });
  });
});

describe('value variants', () => {
  it('load current sets every load to a constant current', () => {
    const v = withLoadCurrent(base(), 2e-3);
    if (!v.ok) throw new Error(v.reason);
    expect(v.document.blocks.filter((b) => b.kind === 'load').map((b) => b.data)).toEqual([{ mode: 'current', currentA: 2e-3 }]);
  });
  it('frequency sets every AC drive', () => {
    const v = withFrequency(base(), 50_000);
    if (!v.ok) throw new Error(v.reason);
    const drive = v.document.blocks.find((b) => b.kind === 'acSource');
    expect(drive?.kind === 'acSource' && drive.data.frequencyHz).toBe(50_000);
  });
  it('capacitance scales every stage capacitor by the bottom pumping capacitor’s factor', () => {
    const doc = designDocumentSchema.parse(fullWaveStarter(2, { amplitudeV: 1000, frequencyHz: 10_000, capacitanceF: 10e-9 }));
    expect(referenceCapacitance(doc)).toBe(10e-9);
    const v = withStageCapacitance(doc, 40e-9);
    if (!v.ok) throw new Error(v.reason);
    for (const b of v.document.blocks) {
      if (b.kind !== 'stage') continue;
      expect(b.data.pumpC.capacitanceF).toBeCloseTo(40e-9, 20);
      expect(b.data.smoothC.capacitanceF).toBeCloseTo(40e-9, 20);
      expect(b.data.pump2C?.capacitanceF).toBeCloseTo(40e-9, 20);
    }
  });
  it('sweep steps are linear or logarithmic and end exactly on `to`', () => {
    const lin = analysisSpecSchema.parse({ kind: 'sweep', parameter: 'frequency', from: 1000, to: 5000, points: 5 }) as SweepSpec;
    expect(sweepValues(lin)).toEqual([1000, 2000, 3000, 4000, 5000]);
    const log = analysisSpecSchema.parse({ kind: 'sweep', parameter: 'capacitance', from: 1e-9, to: 1e-7, points: 3, scale: 'log' }) as SweepSpec;
    const v = sweepValues(log);
    expect(v[1]).toBeCloseTo(1e-8, 20);
    expect(v[2]).toBe(1e-7);
    const st = analysisSpecSchema.parse({ kind: 'sweep', parameter: 'stages', from: 2, to: 6 }) as SweepSpec;
    expect(sweepValues(st)).toEqual([2, 3, 4, 5, 6]);
    expect(sweepVariant(base(), st, 4).ok).toBe(true);
  });
});

describe('spec limits', () => {
  const issue = (body: unknown) => {
    const r = analysisSpecSchema.safeParse(body);
    return r.success ? null : { path: r.error.issues[0].path.join('.'), message: r.error.issues[0].message };
  };
  it('refuses too many points or samples, naming the field', () => {
    expect(issue({ kind: 'sweep', parameter: 'frequency', from: 1, to: 2, points: MAX_SWEEP_POINTS + 1 })?.path).toBe('points');
    expect(issue({ kind: 'spread', samples: MAX_SPREAD_SAMPLES + 1, seed: 1 })?.path).toBe('samples');
    expect(issue({ kind: 'sweep', parameter: 'stages', from: 1, to: 41 })?.path).toBe('to');
    expect(issue({ kind: 'sweep', parameter: 'stages', from: 4, to: 4 })).toEqual({ path: 'to', message: 'must be greater than from' });
    expect(issue({ kind: 'sweep', parameter: 'frequency', from: 0, to: 10, points: 3 })?.path).toBe('from');
    expect(issue({ kind: 'sweep', parameter: 'loadCurrent', from: 0, to: 1e-3, points: 3, scale: 'log' })?.path).toBe('from');
    expect(issue({ kind: 'spread', samples: 10, seed: 1, assumedTolerance: 0.9 })?.path).toBe('assumedTolerance');
    expect(issue({ kind: 'sweep', parameter: 'voltage', from: 1, to: 2, points: 3 })?.path).toBe('parameter');
  });
  it('counts points', () => {
    expect(pointCount(analysisSpecSchema.parse({ kind: 'sweep', parameter: 'stages', from: 3, to: 12 }))).toBe(10);
    expect(pointCount(analysisSpecSchema.parse({ kind: 'spread', samples: 40, seed: 3 }))).toBe(40);
  });
});

describe('spread samples', () => {
  const spec = (o: Partial<SpreadSpec> = {}): SpreadSpec => analysisSpecSchema.parse({ kind: 'spread', samples: 50, seed: 17, ...o }) as SpreadSpec;
  it('draw every capacitor within its tolerance (uniform and normal)', () => {
    const doc = base(4);
    // One capacitor with its own tolerance; the others take the assumed 10 %.
    const stage = doc.blocks.find((b) => b.kind === 'stage');
    if (stage?.kind === 'stage') stage.data.pumpC.tolerance = 0.02;
    for (const distribution of ['uniform', 'normal'] as const) {
      for (let i = 0; i < 50; i++) {
        const { factors } = spreadVariant(doc, spec({ distribution }), i);
        expect(Object.keys(factors)).toHaveLength(8);
        for (const [k, f] of Object.entries(factors)) {
          const tol = k === `${stage!.id}.pumpC` ? 0.02 : 0.1;
          expect(Math.abs(f - 1)).toBeLessThanOrEqual(tol + 1e-15);
        }
      }
    }
  });
  it('are the same for the same seed and index, different for another seed', () => {
    const doc = base(3);
    expect(spreadVariant(doc, spec(), 5).factors).toEqual(spreadVariant(doc, spec(), 5).factors);
    expect(spreadVariant(doc, spec(), 5).factors).not.toEqual(spreadVariant(doc, spec({ seed: 18 }), 5).factors);
  });
  it('leave the document as drawn at zero tolerance', () => {
    const doc = base(3);
    const { document } = spreadVariant(doc, spec({ assumedTolerance: 0 }), 3);
    expect(document).toEqual(doc);
  });
  it('vary the load only when asked', () => {
    const doc = base(3);
    expect(Object.keys(spreadVariant(doc, spec(), 0).factors).some((k) => k.endsWith('.load'))).toBe(false);
    const withLoad = spreadVariant(doc, spec({ loadTolerance: 0.05 }), 0);
    const k = Object.entries(withLoad.factors).find(([key]) => key.endsWith('.load'))?.[1];
    expect(k).toBeDefined();
    expect(Math.abs(k! - 1)).toBeLessThanOrEqual(0.05);
  });
});

describe('optimum and summary', () => {
  const pt = (index: number, value: number, outputDcV: number): PointResult => ({ index, value, ok: true, outputDcV, rippleV: 1, worstMargin: null, worstPart: null, ms: 1 });
  it('picks the highest output DC, the smaller stage count on a tie, skipping failed points', () => {
    const pts: PointResult[] = [pt(0, 2, 10), pt(1, 3, 30), { index: 2, value: 4, ok: false, reason: 'x', ms: 1 }, pt(3, 5, 30), pt(4, 6, 20)];
    expect(optimumOf(pts)).toEqual({ value: 3, outputDcV: 30 });
    expect(optimumOf([{ index: 0, value: 1, ok: false, reason: 'x', ms: 0 }])).toBeNull();
    const s = summarise(analysisSpecSchema.parse({ kind: 'sweep', parameter: 'stages', from: 2, to: 6 }), pts);
    expect(s.kind === 'sweep' && s.optimum).toEqual({ value: 3, outputDcV: 30 });
    expect(s.failed).toBe(1);
  });
  it('a value sweep has no optimum; a spread summarises output and ripple', () => {
    const sw = summarise(analysisSpecSchema.parse({ kind: 'sweep', parameter: 'frequency', from: 1, to: 2, points: 2 }), [pt(0, 1, 5), pt(1, 2, 6)]);
    expect(sw.kind === 'sweep' && sw.optimum).toBeNull();
    const sp = summarise(analysisSpecSchema.parse({ kind: 'spread', samples: 4, seed: 1 }), [pt(3, 4, 4), pt(0, 1, 1), pt(2, 3, 3), pt(1, 2, 2)]);
    if (sp.kind !== 'spread') throw new Error('kind');
    expect(sp.points.map((p) => p.index)).toEqual([0, 1, 2, 3]);
    expect(sp.output).toMatchObject({ n: 4, mean: 2.5, p50: 2.5 });
    expect(sp.ripple).toMatchObject({ n: 4, std: 0 });
  });
});
