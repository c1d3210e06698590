/**
 * The editor's stress check with the team's derating policy, on a real solve of a 2-stage
 * half-wave ladder. Every diode of a Cockcroft–Walton ladder sees about 2·Vp reverse voltage
 * (REFERENCES §5), so with Vp = 1000 V a 3000 V PIV rating passes at 80 % (allowed 2400 V) and
 * fails at a 50 % team policy (allowed 1500 V). Limits and margins by hand arithmetic.
 */
import { describe, expect, it } from 'vitest';
import { compileDocument, halfWaveStarter, parseNetlist, recognizeTopology, solveNetlist, type CompileResult, type DesignDocument, type SolveResult } from '@/lib/circuit';
import { partStress, rederateParts, solveView, withTeamDerating } from '@/lib/editor/engine/view-model';
import { netlistTextOf } from '@/lib/editor/engine/netlist-text';
import { bindRole, type PartOf } from '@/lib/parts/binding';

const VP = 1000;
const O = { amplitudeV: VP, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 1e-4, capacitorRatedV: 5000 };

function compiled(doc: DesignDocument): CompileResult & { ok: true } {
  const r = compileDocument(doc);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

function solveExported(doc: DesignDocument): SolveResult & { ok: true } {
  const parsed = parseNetlist(netlistTextOf(compiled(doc).netlist));
  if (!parsed.ok) throw new Error(parsed.errors[0].message);
  const outputs = recognizeTopology(parsed.netlist).outputs.map((o) => o.node);
  const r = solveNetlist(parsed.netlist, { outputNodes: outputs, waveformPoints: 200, budgetMs: 15_000 });
  if (!r.ok) throw new Error(r.reason);
  return r;
}

/** Every stage diode rated `ratedPivV`, no current ratings (so PIV decides). */
function ratedDoc(ratedPivV: number, deratingFraction = 0.8): DesignDocument {
  const doc = halfWaveStarter(2, O);
  return {
    ...doc,
    settings: { ...doc.settings, deratingFraction },
    blocks: doc.blocks.map((b) =>
      b.kind === 'stage' ? { ...b, data: { ...b.data, diodeA: { ...b.data.diodeA, ratedPivV, ratedAvgCurrentA: undefined, ratedSurgeA: undefined }, diodeB: { ...b.data.diodeB, ratedPivV, ratedAvgCurrentA: undefined, ratedSurgeA: undefined } } } : b,
    ),
  };
}

describe('stress with the team derating policy', () => {
  const doc = ratedDoc(3000);
  const c = compiled(doc);
  const solve = solveExported(doc);
  const diodes = (parts: ReturnType<typeof partStress>) => parts.filter((p) => p.kind === 'D');

  it('the diodes see about 2·Vp reverse (REFERENCES §5), so the check below is meaningful', () => {
    for (const p of diodes(partStress(doc, c, solve))) {
      expect(p.checks[0].quantity).toBe('piv');
      expect(p.checks[0].actual).toBeGreaterThan(1.8 * VP);
      expect(p.checks[0].actual).toBeLessThan(2.05 * VP);
    }
  });

  it('a diode that passes at 80 % fails at a 50 % team policy', () => {
    const at80 = diodes(partStress(doc, c, solve));
    expect(at80.every((p) => p.status === 'ok' || p.status === 'tight')).toBe(true);
    expect(at80.every((p) => p.checks[0].allowed === 2400)).toBe(true);
    const at50 = diodes(partStress(doc, c, solve, 0.5));
    expect(at50.every((p) => p.status === 'over')).toBe(true);
    for (const p of at50) {
      expect(p.checks[0].allowed).toBe(1500);
      expect(p.worstMargin).toBeCloseTo((1500 - p.checks[0].actual) / 1500, 12);
    }
  });

  it('a looser team policy does not loosen the design’s own derating', () => {
    const strict = ratedDoc(3000, 0.5);
    expect(diodes(partStress(strict, c, solve, 0.9)).every((p) => p.checks[0].allowed === 1500)).toBe(true);
  });

  it('re-judging a solved view at the team fraction equals judging it there in the first place', () => {
    const view = solveView(doc, c, solve);
    expect(view.derating).toEqual({ fraction: 0.8, source: 'design' });
    const team = withTeamDerating(view, doc.settings.deratingFraction, 0.5);
    expect(team.derating).toEqual({ fraction: 0.5, source: 'team' });
    expect(team.parts).toEqual(partStress(doc, c, solve, 0.5));
    // The canvas flags parts from `status === 'over'`: every diode is flagged under the policy.
    expect(team.parts.filter((p) => p.status === 'over').map((p) => p.role).sort()).toEqual(['diodeA', 'diodeA', 'diodeB', 'diodeB']);
    // No change, same object (memoised readers do not redraw).
    expect(withTeamDerating(team, 0.8, 0.5)).toBe(team);
    // Back to no policy: the design's 80 %.
    expect(withTeamDerating(team, 0.8, null).parts).toEqual(view.parts);
    expect(rederateParts(view.parts, 0.8)).toEqual(view.parts);
  });

  it('a bound library diode brings its rating and part id into the stress check', () => {
    const part: PartOf<'diode'> = { id: 'lib-d', kind: 'diode', partNumber: 'TG-D-1K5', specs: { ratedPivV: 1500, ratedAvgCurrentA: 1, model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 } } };
    const bound: DesignDocument = {
      ...doc,
      blocks: doc.blocks.map((b) => {
        if (b.id !== 's1') return b;
        const r = bindRole(b, 'diodeA', part);
        if (!r.ok) throw new Error(r.reason);
        return r.block;
      }),
    };
    // Same model as the starter's, so the same solve applies; only the rating changes.
    const s1a = partStress(bound, compiled(bound), solve).find((p) => p.blockId === 's1' && p.role === 'diodeA')!;
    expect(s1a.partId).toBe('lib-d');
    expect(s1a.checks[0].rating).toBe(1500);
    expect(s1a.checks[0].allowed).toBe(1200);
    expect(s1a.status).toBe('over');
    expect(partStress(bound, compiled(bound), solve).find((p) => p.blockId === 's1' && p.role === 'diodeB')!.partId).toBeUndefined();
  });
});
