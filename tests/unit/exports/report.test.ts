/**
 * The report's numbers, checked against the textbook Cockcroft–Walton formulas (Kind & Kuffel,
 * High Voltage Engineering: Fundamentals, 2nd ed., §2.2.2, from memory): for n half-wave stages
 * from Vp at f with stage capacitance C and load current I,
 *   ripple δV = I/(fC) · n(n+1)/2, and drop ΔV = I/(fC) · (2n³/3 + n²/2 − n/6),
 * so the output is about 2nVp − ΔV less the diodes' forward drops. Plus the pass/fail rules of
 * requirement vs result, the report's cautions, and the PDF text and axis helpers.
 */
import { describe, expect, it } from 'vitest';
import { halfWaveStarter, type DesignDocument } from '@/lib/circuit';
import { buildReportModel, OUTPUT_TOLERANCE, REPORT_CAUTIONS, type ReportInput } from '@/lib/exports/report';
import { niceTicks, pdfText } from '@/lib/exports/report-pdf';
import { solveForExport } from '@/lib/exports/solve';

const n = 3;
const Vp = 250;
const f = 50_000;
const C = 10e-9;
const I = 100e-6;

function doc(requirement?: DesignDocument['settings']['requirement']): DesignDocument {
  const d = halfWaveStarter(n, { amplitudeV: Vp, frequencyHz: f, capacitanceF: C, capacitorRatedV: 630, loadCurrentA: I });
  if (requirement) d.settings.requirement = requirement;
  return d;
}

function input(d: DesignDocument, over: Partial<ReportInput> = {}): ReportInput {
  return {
    designTitle: 'Bias ladder',
    teamName: 'Tallgrass Instruments',
    revision: 2,
    revisionAuthor: 'Dev',
    revisionCreatedAt: '2026-12-01T10:00:00.000Z',
    revisionMessage: '',
    designStatus: 'approved',
    document: d,
    teamDerating: null,
    approvals: [],
    library: new Map(),
    generatedAt: '2026-12-02T10:00:00.000Z',
    ...over,
  };
}

const base = doc();
const solved = solveForExport(base, null);

describe('report model', () => {
  it('output DC and ripple agree with the textbook ladder formulas', () => {
    expect(solved.ok).toBe(true);
    const m = buildReportModel(input(base), solved);
    const k = I / (f * C);
    const ripple = k * (n * (n + 1)) / 2; // 1.2 V
    const drop = k * ((2 * n ** 3) / 3 + n ** 2 / 2 - n / 6); // 4.4 V
    expect(m.output?.rippleV).toBeGreaterThan(0.9 * ripple);
    expect(m.output?.rippleV).toBeLessThan(1.1 * ripple);
    // below 2nVp − ΔV by the diodes' drops only (a few volts for 2n small rectifiers)
    expect(m.output!.dcV).toBeLessThan(2 * n * Vp - drop);
    expect(m.output!.dcV).toBeGreaterThan(2 * n * Vp - drop - 2 * n * 1.5);
    expect(m.output?.loadCurrentA).toBeCloseTo(I, 8);
    // one row per part with its designator; every capacitor judged against 0.8 × 630 V
    expect(m.parts.map((p) => p.designator)).toEqual(['C1', 'C2', 'C3', 'C4', 'C5', 'C6', 'D1', 'D2', 'D3', 'D4', 'D5', 'D6']);
    for (const p of m.parts.filter((x) => x.designator.startsWith('C'))) expect(p.allowed).toBeCloseTo(504, 9);
    // the smoothing column's nodes sit at about 2kVp
    const y2 = m.nodes.find((x) => x.node === 'y_s2');
    expect(y2?.meanV).toBeGreaterThan(0.98 * 4 * Vp);
    expect(m.waveform?.x.length).toBeGreaterThan(50);
    expect(m.warmup?.y[m.warmup.y.length - 1]).toBeGreaterThan(0.98 * m.output!.dcV);
  });

  it('judges parts at the stricter of the design and team derating', () => {
    const m = buildReportModel(input(base, { teamDerating: 0.6 }), solveForExport(base, 0.6, { warmup: false }));
    expect(m.derating).toEqual({ fraction: 0.6, source: 'team' });
    expect(m.parts[0].allowed).toBeCloseTo(0.6 * 630, 9);
    const loose = buildReportModel(input(base, { teamDerating: 0.9 }), solved);
    expect(loose.derating).toEqual({ fraction: 0.8, source: 'design' });
  });

  it('passes and fails the requirement by the stated rules', () => {
    if (!solved.ok) throw new Error('no solve');
    const out = buildReportModel(input(base), solved).output!.dcV;
    const at = (outputV: number, maxRippleFraction = 0.01, loadCurrentA = I) => buildReportModel(input(doc({ outputV, maxRippleFraction, loadCurrentA })), solved).requirement.map((r) => r.pass);
    expect(at(out / (1 - OUTPUT_TOLERANCE * 0.99))).toEqual([true, true, true]);
    expect(at(out / (1 - OUTPUT_TOLERANCE * 1.01))[0]).toBe(false);
    expect(at(-out)[0]).toBe(true); // compared by magnitude
    expect(at(out, 1e-4)[1]).toBe(false); // 1.2 V / 1.49 kV ≈ 8e-4 > 1e-4
    expect(at(out, 0.01, 2 * I)[2]).toBe(false);
    expect(buildReportModel(input(base), solved).requirement.map((r) => r.pass)).toEqual([null, null, null]);
  });

  it('a failed solve keeps the title, the cautions and the approval record, with the reason', () => {
    const m = buildReportModel(input(base, { approvals: [{ revision: 1, approvedBy: 'Rue', approvedAt: '2026-11-30T00:00:00.000Z', note: '' }] }), { ok: false, reason: 'the solve ran out of its budget', compiled: null });
    expect(m.solveFailure).toBe('the solve ran out of its budget');
    expect(m.title.topology).toBe('Half-wave · 3 stages · +');
    expect(m.parts).toEqual([]);
    expect(m.thisRevisionApproval).toBeNull();
    expect(m.approvals).toHaveLength(1);
    expect(m.safety.cautions).toEqual(expect.arrayContaining(REPORT_CAUTIONS));
    expect(m.safety.cautions.join(' ')).toMatch(/not a safety certificate/);
  });
});

describe('PDF helpers', () => {
  it('writes only what the standard fonts can show', () => {
    expect(pdfText('1.00 GΩ · −5 V ± 2 µA — “ok”')).toBe('1.00 GOhm · -5 V ± 2 µA — “ok”');
    expect(pdfText('x′ ≤ 3 → 漢')).toBe("x' <= 3 -> ?");
  });

  it('ticks step by 1, 2 or 5 × 10^k and cover the range', () => {
    expect(niceTicks(0, 20)).toEqual([0, 5, 10, 15, 20]);
    expect(niceTicks(1.4912, 1.4928)).toEqual([1.4915, 1.492, 1.4925]);
    expect(niceTicks(-3, 7).every((t, i, a) => i === 0 || Math.abs(t - a[i - 1] - 2) < 1e-12)).toBe(true);
  });
});
