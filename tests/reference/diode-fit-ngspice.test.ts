// The fitted diode model run through ngspice (Debian's package, `ngspice -b`): an operating
// point of the fitted diode fed by a current source at each datasheet current gives back the
// datasheet voltage within 1 mV. The datasheet curves are invented (demo data), read the way an
// engineer reads points off a printed forward-characteristic plot.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { fitDiode, type DiodeFitModel, type DiodeFitPoint } from '@/lib/circuit/devices/diode-fit';
import { ensureNgspice } from '../fixtures/ngspice';

const hasNgspice = ensureNgspice();

/** ngspice's forward voltages of `model` at each current (one current source into one diode each). */
function ngspiceForward(model: DiodeFitModel, currents: number[]): number[] {
  const dir = mkdtempSync(path.join(tmpdir(), 'kilorung-diode-fit-'));
  const lines = ['* fitted diode at datasheet currents', `.model DFIT D(IS=${model.isA.toExponential(15)} N=${model.n.toPrecision(17)} RS=${model.rsOhm.toPrecision(17)})`];
  currents.forEach((i, k) => {
    lines.push(`I${k} 0 a${k} DC ${i.toExponential(15)}`, `D${k} a${k} 0 DFIT`);
  });
  lines.push('.options reltol=1e-9 abstol=1e-15 vntol=1e-12 gmin=1e-15', '.control', 'set numdgt=15', 'op', `print ${currents.map((_, k) => `v(a${k})`).join(' ')}`, 'quit', '.endc', '.end', '');
  writeFileSync(path.join(dir, 'deck.cir'), lines.join('\n'));
  const r = spawnSync('ngspice', ['-b', path.join(dir, 'deck.cir')], { encoding: 'utf8', timeout: 60_000 });
  rmSync(dir, { recursive: true, force: true });
  return currents.map((_, k) => {
    const m = new RegExp(`v\\(a${k}\\)\\s*=\\s*([-+0-9.eE]+)`).exec(r.stdout);
    if (!m) throw new Error(`no v(a${k}) in ngspice output: ${r.stdout.slice(-1500)} ${r.stderr.slice(0, 500)}`);
    return Number(m[1]);
  });
}

const SHEETS: [string, DiodeFitPoint[]][] = [
  [
    'an invented 12 kV / 20 mA stack, three points',
    [
      { currentA: 1e-3, voltageV: 9.4 },
      { currentA: 10e-3, voltageV: 11.6 },
      { currentA: 0.2, voltageV: 19.5 },
    ],
  ],
  [
    'an invented 2 kV / 1 A rectifier, three points',
    [
      { currentA: 10e-3, voltageV: 1.62 },
      { currentA: 0.2, voltageV: 1.88 },
      { currentA: 1, voltageV: 2.3 },
    ],
  ],
  [
    'an invented 1 kV / 0.5 A rectifier, two points',
    [
      { currentA: 1e-3, voltageV: 0.58 },
      { currentA: 0.1, voltageV: 0.8 },
    ],
  ],
];

describe.skipIf(!hasNgspice)('fitted diode in ngspice', () => {
  for (const [name, sheet] of SHEETS) {
    it(`${name}: datasheet voltages within 1 mV`, () => {
      const fit = fitDiode(sheet);
      if (!fit.ok) throw new Error(fit.reason);
      if (sheet.length === 3) expect(fit.model.rsOhm).toBeGreaterThan(0);
      const v = ngspiceForward(fit.model, sheet.map((p) => p.currentA));
      sheet.forEach((p, k) => expect(Math.abs(v[k] - p.voltageV), `at ${p.currentA} A: ngspice ${v[k]} V, sheet ${p.voltageV} V`).toBeLessThan(1e-3));
    });
  }

  it('a deliberately wrong model misses by more than 1 mV (the check can fail)', () => {
    const fit = fitDiode(SHEETS[0][1]);
    if (!fit.ok) throw new Error(fit.reason);
    const v = ngspiceForward({ ...fit.model, rsOhm: fit.model.rsOhm * 1.01 }, [0.2]);
    expect(Math.abs(v[0] - 19.5)).toBeGreaterThan(1e-3);
  });
});
