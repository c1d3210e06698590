// Power over one steady-state period, checked two ways:
// - energy conservation (Tellegen's theorem over a period that returns to its start): what the
//   source delivers equals what the load takes plus what diodes and resistors dissipate;
// - ngspice (Debian package) as an independent simulator: started from the engine's state at
//   t = 0 (capacitor IC=, `uic`) and held for 60 periods, its source power (`meas tran avg` of
//   v·i of the drive over the last period) and output mean agree with the engine's. The drive
//   power is the most sensitive figure of all (any drift of the stored energy shows in it: at
//   n = 2 ngspice's value falls from 4.076 W in its 2nd period to 4.030 W in the 10th and
//   3.995 W in the 50th, while its output mean has long agreed), hence the long hold.
// REFERENCES §5 (deriv) states "P_in ≈ I·2nVp; the difference I·ΔV_mean is dissipated in the
// switching paths". Both simulators disagree for a sine drive with near-ideal diodes: the diodes
// conduct while the drive follows the capacitor voltage, so charge moves without a voltage step
// and P_in ≈ I·V_out (n = 2: ngspice 3.9927 W, I·V_out 3.9923 W, I·2nVp 4.000 W). The test
// asserts what the simulators agree on and leaves §5's line to the note's owner.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { solveNetlist } from '@/lib/circuit/analysis/solve';
import { formatNetlist } from '@/lib/circuit/netlist/format';
import { generateLadder, GENERIC_RECTIFIER, type LadderOptions } from '@/lib/circuit/netlist/generate';
import { ensureNgspice, withNodeIc } from '../../fixtures/ngspice';
import { rel, section9, solveOk, type Solved } from './helpers';

let available = false;
beforeAll(() => {
  available = ensureNgspice();
}, 600_000);

/** ngspice's mean drive power and output mean over the 60th period held from the engine's state. */
function ngspicePower(o: LadderOptions, ours: Solved, out: string): { sourceW: number; outMeanV: number } {
  const nl = generateLadder(o);
  const ic: Record<string, number> = {};
  for (const [k, m] of Object.entries(ours.nodes)) if (!k.includes('#')) ic[k] = m.waveform!.v[0];
  const T = 1 / o.frequencyHz;
  const body = formatNetlist(withNodeIc(nl, ic)).replace(/\n\.end\s*$/i, '\n');
  const deck = [
    body,
    '.options reltol=1e-6 abstol=1e-12 vntol=1e-7 method=gear maxord=2',
    `.tran ${T / 1000} ${60 * T} 0 ${T / 1000} uic`,
    '.control',
    'run',
    'let p = v(in_src)*(-i(v1))',
    `meas tran pin avg p from=${59 * T} to=${60 * T}`,
    `meas tran vout avg v(${out}) from=${59 * T} to=${60 * T}`,
    'quit',
    '.endc',
    '.end',
    '',
  ].join('\n');
  const dir = mkdtempSync(path.join(tmpdir(), 'kilorung-power-'));
  try {
    writeFileSync(path.join(dir, 'deck.cir'), deck);
    const r = spawnSync('ngspice', ['-b', path.join(dir, 'deck.cir')], { encoding: 'utf8', timeout: 120_000 });
    const read = (name: string) => {
      const m = new RegExp(`^${name}\\s*=\\s*([-+0-9.eE]+)`, 'm').exec(r.stdout ?? '');
      if (!m) throw new Error(`ngspice printed no ${name}: ${(r.stdout ?? '').slice(-800)} ${(r.stderr ?? '').slice(-800)}`);
      return Number(m[1]);
    };
    return { sourceW: read('pin'), outMeanV: read('vout') };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe('power balance over the steady-state period', () => {
  for (const n of [2, 4]) {
    it(`half-wave n = ${n}, near-ideal diodes: balance closes${n === 2 ? ' and the drive power matches ngspice' : ''}`, () => {
      expect(available, 'ngspice could not be installed').toBe(true);
      const o = section9('half-wave', n);
      const r = solveNetlist(generateLadder(o), { waveformPoints: 2 });
      if (!r.ok) throw new Error(r.reason);
      const { sourceW, loadW, lossW, efficiency } = r.power;
      const out = r.nodes[`s${n}`].mean;
      expect(Math.abs(sourceW - loadW - lossW) / sourceW, 'energy balance').toBeLessThan(1e-4);
      expect(rel(loadW, 1e-3 * out), 'load power vs I·V_out').toBeLessThan(5e-4);
      // Near-ideal diodes (a few mV forward, 0.05 Ω) and 0.01 Ω of source: almost nothing is lost.
      expect(lossW / sourceW).toBeLessThan(1e-3);
      expect(efficiency).toBeCloseTo(loadW / (loadW + lossW), 12);
      // ngspice settles its drive power slowly from a `uic` start (at n = 4 it is still 0.3 %
      // high after 60 periods while its output mean agrees to 0.01 %), so the independent
      // check of the power measure runs where its hold is long enough: n = 2.
      if (n !== 2) return;
      const ng = ngspicePower(o, r, `s${n}`);
      expect(rel(out, ng.outMeanV), 'output mean vs ngspice').toBeLessThan(2e-3);
      expect(rel(sourceW, ng.sourceW), 'drive power vs ngspice').toBeLessThan(2e-3);
    }, 120_000);
  }

  it('full-wave n = 3 and bipolar n = 2: the balance closes too', () => {
    for (const o of [section9('full-wave', 3), section9('bipolar', 2)]) {
      const r = solveOk(o);
      const { sourceW, loadW, lossW } = r.power;
      expect(loadW).toBeGreaterThan(0);
      expect(Math.abs(sourceW - loadW - lossW) / sourceW, `${o.kind} energy balance`).toBeLessThan(1e-4);
    }
  });

  it('generic rectifier behind 50 Ω at 50 Hz: the source resistance takes I_rms²·R, efficiency below 1', () => {
    const r = solveOk({ kind: 'half-wave', stages: 4, peakV: 1000, frequencyHz: 50, capacitanceF: 10e-6, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-3, sourceResistanceOhm: 50 });
    const rs = r.parts['Rs_V1'];
    const v = r.parts['V1'];
    if (rs?.kind !== 'R' || v?.kind !== 'V') throw new Error('missing source measures');
    expect(rel(rs.powerW, v.rmsCurrentA ** 2 * 50), 'P_Rs = I_rms²·Rs').toBeLessThan(5e-3);
    expect(Math.abs(r.power.sourceW - r.power.loadW - r.power.lossW) / r.power.sourceW).toBeLessThan(1e-4);
    expect(r.power.efficiency).toBeGreaterThan(0.5);
    expect(r.power.efficiency).toBeLessThan(1);
  });
});
