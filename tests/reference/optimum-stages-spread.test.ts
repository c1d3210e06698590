/**
 * The tolerance spread against the nominal solve. Output DC is, to first order, linear in each
 * capacitor's deviation, and the deviations are drawn symmetrically about zero, so the mean
 * output of N samples must match the nominal design's output within the sampling error 3σ/√N
 * (plus 0.2 % for the second-order terms: the loaded drop goes as 1/C, which is convex) — a
 * statistics fact of the trade (common practice). With every tolerance zero every sample is the
 * nominal design, so the spread is exactly zero.
 */
import { describe, expect, it } from 'vitest';
import { analysisSpecSchema, computePoint, pointCount, summarise, type AnalysisSpec, type PointResult } from '@/lib/analyses';
import { resultsOf } from '@/lib/compare/results';
import { designDocumentSchema } from '@/lib/circuit/document/schema';
import { halfWaveStarter } from '@/lib/circuit/document/starters';

const doc = designDocumentSchema.parse(halfWaveStarter(3, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 }));

function run(spec: AnalysisSpec) {
  const points: PointResult[] = [];
  for (let i = 0; i < pointCount(spec); i++) points.push(computePoint(doc, spec, i));
  const r = summarise(spec, points);
  if (r.kind !== 'spread') throw new Error('kind');
  return r;
}

describe('tolerance spread', () => {
  it('has a mean output within 3σ/√N (+0.2 %) of the nominal solve, and a real spread at ±10 %', () => {
    const nominal = resultsOf(doc);
    if (!nominal.ok) throw new Error(nominal.reason);
    const N = 30;
    const r = run(analysisSpecSchema.parse({ kind: 'spread', samples: N, seed: 4242, assumedTolerance: 0.1 }));
    expect(r.failed).toBe(0);
    const out = r.output!;
    expect(out.n).toBe(N);
    expect(out.std).toBeGreaterThan(0);
    expect(Math.abs(out.mean - nominal.outputDcV)).toBeLessThanOrEqual((3 * out.std) / Math.sqrt(N) + 0.002 * nominal.outputDcV);
    expect(out.p5).toBeLessThan(out.p50);
    expect(out.p50).toBeLessThan(out.p95);
    expect(out.histogram.reduce((s, b) => s + b.count, 0)).toBe(N);
    expect(r.ripple!.std).toBeGreaterThan(0);
  });

  it('is zero at zero tolerance: every sample equals the nominal solve', () => {
    const nominal = resultsOf(doc);
    if (!nominal.ok) throw new Error(nominal.reason);
    const r = run(analysisSpecSchema.parse({ kind: 'spread', samples: 4, seed: 1, assumedTolerance: 0 }));
    expect(r.output!.std).toBe(0);
    expect(r.output!.min).toBe(r.output!.max);
    expect(r.output!.mean).toBeCloseTo(nominal.outputDcV, 9);
    expect(r.ripple!.std).toBe(0);
  });
});
