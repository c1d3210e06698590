/**
 * The analysis form's words turned into a spec: engineering notation for values, per cent for
 * tolerances, and the form field named when something is wrong (so the message shows under it).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_FORM, specFromForm } from '@/lib/client/analyses';

describe('specFromForm', () => {
  it('reads a spread with per-cent tolerances', () => {
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'spread', samples: '40', seed: '7', assumedTolerancePct: '20', loadTolerancePct: '5', distribution: 'normal' })).toEqual({
      ok: true,
      spec: { kind: 'spread', samples: 40, seed: 7, distribution: 'normal', assumedTolerance: 0.2, loadTolerance: 0.05 },
    });
  });
  it('reads a value sweep in engineering notation', () => {
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'sweep', parameter: 'capacitance', from: '1n', to: '100n', points: '5', scale: 'log' })).toEqual({
      ok: true,
      spec: { kind: 'sweep', parameter: 'capacitance', from: 1e-9, to: 1e-7, points: 5, scale: 'log' },
    });
  });
  it('reads a stage sweep and ignores the points field', () => {
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'sweep', parameter: 'stages', from: '2', to: '9', points: 'x' })).toEqual({ ok: true, spec: { kind: 'sweep', parameter: 'stages', from: 2, to: 9 } });
  });
  it('names the form field that is wrong', () => {
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'spread', samples: 'lots' })).toMatchObject({ ok: false, field: 'samples' });
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'spread', samples: '900' })).toMatchObject({ ok: false, field: 'samples', message: 'must be at most 500' });
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'spread', assumedTolerancePct: '80' })).toMatchObject({ ok: false, field: 'assumedTolerancePct' });
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'sweep', parameter: 'frequency', from: '20k', to: '10k', points: '5' })).toMatchObject({ ok: false, field: 'to' });
    expect(specFromForm({ ...DEFAULT_FORM, kind: 'sweep', parameter: 'stages', from: '2.5', to: '9' })).toMatchObject({ ok: false, field: 'from' });
  });
});
