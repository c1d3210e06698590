import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { halfWaveStarter } from '@/lib/circuit/document/starters';

const root = path.resolve(import.meta.dirname, '../../..');
const tsx = path.join(root, 'node_modules/tsx/dist/cli.mjs');

function run(args: string[]) {
  const r = spawnSync(process.execPath, [tsx, path.join(root, 'scripts/solve.ts'), ...args], { encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

describe('npm run solve', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'kr-cli-'));
  const netlistFile = path.join(dir, 'two-stage.cir');
  // Two half-wave stages on 9 V peak at 50 Hz with 10 µF capacitors and a 1 MΩ (light) load.
  writeFileSync(
    netlistFile,
    [
      'two-stage ladder',
      'V1 in 0 SIN(0 9 50)',
      'C1 in x1 10u',
      'C2 0 y1 10u',
      'C3 x1 x2 10u',
      'C4 y1 y2 10u',
      'D1 0 x1 DR',
      'D2 x1 y1 DR',
      'D3 y1 x2 DR',
      'D4 x2 y2 DR',
      'Rl y2 0 1meg',
      '.model DR D(IS=2.5n N=1.75 RS=0.05)',
      '.end',
    ].join('\n'),
  );

  it('solves a netlist and prints one JSON object keyed by the netlist node names', () => {
    const r = run([netlistFile]);
    expect(r.code, r.err).toBe(0);
    const out = JSON.parse(r.out);
    expect(out.topology).toBe('half-wave');
    expect(out.stages).toEqual([2]);
    expect(Object.keys(out.nodes)).toEqual(expect.arrayContaining(['in', 'x1', 'y1', 'x2', 'y2']));
    // common practice: a 2-stage ladder on 9 V peak with small silicon rectifiers reads about 34 V at light load.
    expect(out.nodes.y2.mean).toBeGreaterThan(32.5);
    expect(out.nodes.y2.mean).toBeLessThan(35);
    expect(out.nodes.y2.min).toBeLessThanOrEqual(out.nodes.y2.mean);
    expect(out.nodes.y2.max).toBeGreaterThanOrEqual(out.nodes.y2.mean);
    expect(out.parts.D4.kind).toBe('D');
    expect(out.warmup.t90).toBeGreaterThan(0);
    expect(out.warmup.t99).toBeGreaterThan(out.warmup.t90);
    expect(out.estimate.noLoadV).toBeCloseTo(36, 6);
    expect(out.stats.solveMs).toBeGreaterThan(0);
  });

  it('answers --estimate-only from the design equations alone', () => {
    const r = run([netlistFile, '--estimate-only']);
    expect(r.code, r.err).toBe(0);
    const out = JSON.parse(r.out);
    expect(out.nodes).toBeUndefined();
    expect(out.estimate.stages).toBe(2);
  });

  it('solves a design JSON through the canvas compiler', () => {
    const file = path.join(dir, 'design.json');
    writeFileSync(file, JSON.stringify(halfWaveStarter(3, { amplitudeV: 10, frequencyHz: 50, capacitanceF: 100e-6, loadResistanceOhm: 1e6 })));
    const r = run([file, '--no-warmup']);
    expect(r.code, r.err).toBe(0);
    const out = JSON.parse(r.out);
    expect(out.topology).toBe('half-wave');
    expect(out.stages).toEqual([3]);
    // common practice: from 10 V peak, 3 stages read about 57 V.
    expect(out.outputs[0].mean).toBeGreaterThan(54);
    expect(out.outputs[0].mean).toBeLessThan(60);
  });

  it('refuses bad files with a message naming the line and a non-zero exit', () => {
    const bad = path.join(dir, 'bad.cir');
    writeFileSync(bad, 'title\nR1 a\n');
    const r = run([bad]);
    expect(r.code).toBe(3);
    expect(r.err).toMatch(/bad\.cir:2:/);
    expect(run([path.join(dir, 'missing.cir')]).code).toBe(3);
    const badJson = path.join(dir, 'bad.json');
    writeFileSync(badJson, '{"schemaVersion": 1, "blocks": 3}');
    const j = run([badJson]);
    expect(j.code).toBe(3);
    expect(j.err).toMatch(/blocks/);
    expect(run([]).code).toBe(2);
    expect(run([netlistFile, '--bogus']).code).toBe(2);
  });

  afterAll(() => rmSync(dir, { recursive: true, force: true }));
});
