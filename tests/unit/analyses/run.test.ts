/**
 * One point's solve: a point past its budget is kept as failed with the solver's reason and the
 * run's summary counts it, without losing the points that solved.
 */
import { describe, expect, it } from 'vitest';
import { analysisSpecSchema, computePoint, summarise } from '@/lib/analyses';
import { designDocumentSchema } from '@/lib/circuit/document/schema';
import { halfWaveStarter } from '@/lib/circuit/document/starters';

const doc = designDocumentSchema.parse(halfWaveStarter(3, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 }));

describe('computePoint', () => {
  it('records a point that runs out of budget as failed with the reason, and the run goes on', () => {
    const spec = analysisSpecSchema.parse({ kind: 'sweep', parameter: 'stages', from: 2, to: 3 });
    const starved = computePoint(doc, spec, 0, 1);
    expect(starved).toMatchObject({ index: 0, value: 2, ok: false });
    expect(starved.ok === false && starved.reason).toMatch(/budget/);
    const solved = computePoint(doc, spec, 1);
    expect(solved).toMatchObject({ index: 1, value: 3, ok: true });
    const r = summarise(spec, [starved, solved]);
    expect(r.failed).toBe(1);
    expect(r.kind === 'sweep' && r.optimum).toEqual({ value: 3, outputDcV: solved.ok ? solved.outputDcV : NaN });
  });
  it('gives the loaded output below the ideal 2nVp and a positive ripple', () => {
    const p = computePoint(doc, analysisSpecSchema.parse({ kind: 'sweep', parameter: 'loadCurrent', from: 1e-4, to: 2e-4, points: 2 }), 0);
    if (!p.ok) throw new Error(p.reason);
    expect(p.outputDcV).toBeLessThan(2 * 3 * 2000);
    expect(p.outputDcV).toBeGreaterThan(0.8 * 2 * 3 * 2000);
    expect(p.rippleV).toBeGreaterThan(0);
  });
});
