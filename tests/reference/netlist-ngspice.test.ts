/**
 * The exported netlist is real SPICE: ngspice (Debian package, the project's reference simulator)
 * reads `formatNetlist` output of compiled starters, and its transient steady state lands on the
 * closed-form estimate (REFERENCES §1.3 crest model, §5 −2n·Vf diode correction). Skipped only
 * when the ngspice binary is absent.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { fullWaveStarter, halfWaveStarter, symmetricStarter, type StarterOptions } from '@/lib/circuit/document/starters';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { estimateFromNetlist } from '@/lib/circuit/estimates/estimate';
import { formatNetlist } from '@/lib/circuit/netlist/format';

const NGSPICE = '/usr/bin/ngspice';
const hasNgspice = existsSync(NGSPICE);

/** Run ngspice in batch mode on the exported netlist plus a transient and an average measurement. */
function ngspiceAverage(doc: DesignDocument, node: string, cycles: number, fHz: number): { avg: number; estimate: number } {
  const c = compileDocument(doc);
  if (!c.ok) throw new Error(c.reason);
  const tEnd = cycles / fHz;
  const netlist = {
    ...c.netlist,
    ignored: [
      { line: 0, text: `.tran ${1 / fHz / 400} ${tEnd} 0 ${1 / fHz / 400}` },
      { line: 0, text: `.meas tran vavg AVG v(${node}) FROM=${tEnd - 5 / fHz} TO=${tEnd}` },
    ],
  };
  const dir = mkdtempSync(path.join(tmpdir(), 'kilorung-ng-'));
  try {
    const file = path.join(dir, 'ladder.cir');
    writeFileSync(file, formatNetlist(netlist));
    const out = execFileSync(NGSPICE, ['-b', file], { encoding: 'utf8', timeout: 60_000, stdio: ['ignore', 'pipe', 'pipe'] });
    const m = /vavg\s*=\s*([-+\d.eE]+)/.exec(out);
    if (!m) throw new Error(`no measurement in ngspice output:\n${out.slice(-2000)}`);
    const est = estimateFromNetlist(c.netlist, c.topology);
    if (!est) throw new Error('no estimate');
    return { avg: Number(m[1]), estimate: est.outputMeanV };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// Vp = 1 kV, 1 kHz, 1 µF, 1 mA: u = 1 V, so the load drop (8u half-wave, 3u full-wave at n = 2) is
// well visible. Common practice: a silicon rectifier drops roughly 0.5–1 V when it conducts, so the
// simulated output sits 2n·Vf below the crest-model 2nVp − ΔV_mean.
const O: StarterOptions = { amplitudeV: 1000, frequencyHz: 1000, capacitanceF: 1e-6, loadCurrentA: 1e-3 };
/** Implied forward drop per diode on the charging path: (estimate − simulated) / 2n. */
const impliedVf = (estimate: number, simulated: number, n: number) => (estimate - simulated) / (2 * n);

describe.skipIf(!hasNgspice)('exported netlists run in ngspice', () => {
  it('half-wave n = 2, positive: ngspice mean = 2nVp − ΔV_mean − 2n·Vf', () => {
    const { avg, estimate } = ngspiceAverage(halfWaveStarter(2, O), 'y_s2', 60, 1000);
    expect(estimate).toBeCloseTo(4000 - 8, 9);
    expect(impliedVf(estimate, avg, 2)).toBeGreaterThan(0.4);
    expect(impliedVf(estimate, avg, 2)).toBeLessThan(1.1);
  });

  it('half-wave n = 2, negative: the same magnitude, negative sign', () => {
    const { avg, estimate } = ngspiceAverage(halfWaveStarter(2, { ...O, polarity: 'negative' }), 'y_s2', 60, 1000);
    expect(avg).toBeLessThan(0);
    expect(impliedVf(estimate, -avg, 2)).toBeGreaterThan(0.4);
    expect(impliedVf(estimate, -avg, 2)).toBeLessThan(1.1);
  });

  it('full-wave n = 2 (centre-tapped drive in antiphase)', () => {
    const { avg, estimate } = ngspiceAverage(fullWaveStarter(2, O), 'y_s2', 40, 1000);
    expect(estimate).toBeCloseTo(4000 - 3, 9);
    expect(impliedVf(estimate, avg, 2)).toBeGreaterThan(0.4);
    expect(impliedVf(estimate, avg, 2)).toBeLessThan(1.1);
  });

  it('symmetric n = 2: the positive output reaches +2nVp less its drop', () => {
    const { avg, estimate } = ngspiceAverage(symmetricStarter(2, O), 'y_p2', 60, 1000);
    // The estimate is for V+ − V−; each terminal carries half of it.
    expect(impliedVf(estimate / 2, avg, 2)).toBeGreaterThan(0.4);
    expect(impliedVf(estimate / 2, avg, 2)).toBeLessThan(1.1);
  });
});
