/**
 * Import and export from the canvas. The export checks run the exported netlist through the
 * same path as `npm run solve` (and once through the script itself) and compare with the worker
 * path; the import checks name the bad field or line.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { compileDocument, halfWaveStarter, parseNetlist, recognizeTopology, solveNetlist, symmetricStarter, type DesignDocument } from '@/lib/circuit';
import { exportDesignJson, exportNetlistText, importDesignFile, NETLIST_CAUTION } from '@/lib/editor/io';
import { handleEngineRequest } from '@/lib/editor/engine/run';
import type { EngineReply } from '@/lib/editor/engine/protocol';

const root = path.resolve(import.meta.dirname, '../../..');
const O = { amplitudeV: 1500, frequencyHz: 2e3, capacitanceF: 470e-9, loadResistanceOhm: 50e6 };

function text(doc: DesignDocument, title?: string): string {
  const r = exportNetlistText(doc, title === undefined ? undefined : { title });
  if (!r.ok) throw new Error(r.reason);
  return r.text;
}

describe('exportNetlistText', () => {
  it('writes the title line, the caution, and cards that read back to the compiled netlist', () => {
    const doc = symmetricStarter(2, O);
    const t = text(doc, 'Tallgrass bench supply\nrev B');
    const lines = t.split('\n');
    expect(lines[0]).toBe('Tallgrass bench supply rev B');
    expect(lines[1].startsWith('* ')).toBe(true);
    expect(lines[2]).toBe(`* ${NETLIST_CAUTION}`);
    expect(NETLIST_CAUTION).toMatch(/lethal/);
    expect(NETLIST_CAUTION).toMatch(/local electrical codes/);
    expect(lines.at(-2)).toBe('.end');
    const parsed = parseNetlist(t);
    if (!parsed.ok) throw new Error(parsed.errors[0].message);
    expect(parsed.netlist.title).toBe('Tallgrass bench supply rev B');
    const c = compileDocument(doc);
    if (!c.ok) throw new Error(c.reason);
    const strip = (els: typeof c.netlist.elements) => els.map(({ line: _l, origin: _o, ...rest }) => rest);
    expect(strip(parsed.netlist.elements)).toEqual(strip(c.netlist.elements));
    expect(parsed.netlist.models).toEqual(c.netlist.models);
    expect(text(doc).split('\n')[0]).toBe('Kilorung design');
  });

  it('refuses a drawing that does not compile, with the compiler’s reason', () => {
    const doc = halfWaveStarter(2, O);
    const broken: DesignDocument = { ...doc, wires: [...doc.wires, { id: 'wx', source: 'src', sourcePort: 'hot', target: 'gnd', targetPort: 'g' }] };
    const r = exportNetlistText(broken);
    expect(r.ok).toBe(false);
    const c = compileDocument(broken);
    expect(r.ok === false && r.reason).toBe(c.ok ? '' : c.reason);
  });

  describe('the exported file solves to what the canvas shows', () => {
    const doc = halfWaveStarter(3, O);
    const replies: EngineReply[] = [];
    handleEngineRequest({ type: 'solve', version: 1, document: doc, warmup: false }, (r) => replies.push(r));
    const worker = replies[0];
    const dir = mkdtempSync(path.join(tmpdir(), 'kr-io-'));
    afterAll(() => rmSync(dir, { recursive: true, force: true }));

    it('parseNetlist + solveNetlist (the npm run solve path) give the worker’s output exactly', () => {
      if (worker.type !== 'solved') throw new Error(JSON.stringify(worker));
      const parsed = parseNetlist(text(doc, 'Tallgrass three-stage'));
      if (!parsed.ok) throw new Error('parse');
      const topology = recognizeTopology(parsed.netlist);
      const r = solveNetlist(parsed.netlist, { warmup: false, outputNodes: topology.outputs.map((o) => o.node), waveformPoints: 0 });
      if (!r.ok) throw new Error(r.reason);
      const out = r.outputs[0].node;
      expect(out).toBe('y_s3');
      expect(worker.solve.nodes[out].meanV).toBe(r.nodes[out].mean);
      // 2nVp = 9 kV less the drop into 50 MΩ.
      expect(r.nodes[out].mean).toBeGreaterThan(0.95 * 9000);
      expect(r.nodes[out].mean).toBeLessThan(9000);
    });

    it('npm run solve on the exported file prints the output the worker shows (well within 0.1 %)', () => {
      if (worker.type !== 'solved') throw new Error(JSON.stringify(worker));
      const file = path.join(dir, 'three-stage.cir');
      writeFileSync(file, text(doc, 'Tallgrass three-stage'));
      const run = spawnSync(process.execPath, [path.join(root, 'node_modules/tsx/dist/cli.mjs'), path.join(root, 'scripts/solve.ts'), file, '--no-warmup'], { encoding: 'utf8', timeout: 120_000 });
      expect(run.status, run.stderr).toBe(0);
      const printed = JSON.parse(run.stdout) as { outputs: { node: string; mean: number }[] };
      expect(printed.outputs[0].node).toBe('y_s3');
      const shown = worker.solve.nodes.y_s3.meanV;
      expect(Math.abs(printed.outputs[0].mean - shown) / shown).toBeLessThan(1e-12);
    });
  });
});

describe('design JSON', () => {
  const doc = symmetricStarter(2, { ...O, bleederOhm: 1e9 });

  it('round-trips a document, bare or with a title', () => {
    const bare = exportDesignJson(doc);
    expect(bare.endsWith('\n')).toBe(true);
    expect(bare).toContain('\n  "schemaVersion": 1');
    expect(importDesignFile('ladder.json', bare)).toEqual({ ok: true, document: doc, warnings: [] });
    const titled = exportDesignJson(doc, { title: 'Tallgrass ±6 kV' });
    expect(JSON.parse(titled).title).toBe('Tallgrass ±6 kV');
    expect(importDesignFile('ladder.json', titled)).toEqual({ ok: true, document: doc, warnings: [] });
    // Sniffed by content when the ending says nothing.
    expect(importDesignFile('ladder.design', bare).ok).toBe(true);
  });

  it('writes the validated document (defaults filled in)', () => {
    const { settings: _s, ...noSettings } = doc;
    const out = JSON.parse(exportDesignJson(noSettings as DesignDocument));
    expect(out.settings).toEqual({ strayCapacitanceF: 0, deratingFraction: 0.8 });
  });

  it('names the bad field', () => {
    const bad = JSON.parse(exportDesignJson(doc));
    bad.blocks[3].data.pumpC.capacitanceF = -1;
    const r = importDesignFile('bad.json', JSON.stringify(bad));
    expect(r.ok).toBe(false);
    expect(r.ok === false && r.reason).toMatch(/^bad\.json is not a Kilorung design: field blocks\.3\.data\.pumpC\.capacitanceF: must be greater than zero/);
    const wrapped = importDesignFile('bad.json', JSON.stringify({ title: 'x', document: { ...bad, schemaVersion: 9 } }));
    expect(wrapped.ok === false && wrapped.reason).toMatch(/field document\.schemaVersion:/);
    expect(importDesignFile('x.json', '{ "blocks": [').ok === false).toBe(true);
    expect((importDesignFile('x.json', '{ "blocks": [') as { reason: string }).reason).toMatch(/^x\.json is not valid JSON/);
    expect((importDesignFile('photo.png', 'PNG…') as { reason: string }).reason).toMatch(/unknown file type "\.png"/);
  });
});

describe('netlist import', () => {
  it('lays out an exported netlist so that it solves to the same output', () => {
    const doc = halfWaveStarter(2, O);
    const t = text(doc, 'Tallgrass two-stage');
    const r = importDesignFile('two-stage.cir', t);
    if (!r.ok) throw new Error(r.reason);
    const c = compileDocument(r.document);
    if (!c.ok) throw new Error(c.reason);
    expect(c.topology.kind).toBe('half-wave');
    expect(c.topology.ladders[0].stages).toBe(2);
    const solveOf = (netlist: Parameters<typeof solveNetlist>[0]) => {
      const s = solveNetlist(netlist, { waveformPoints: 0, outputNodes: recognizeTopology(netlist).outputs.map((o) => o.node) });
      if (!s.ok) throw new Error(s.reason);
      return s.nodes[s.outputs[0].node].mean;
    };
    const original = parseNetlist(t);
    if (!original.ok) throw new Error('parse');
    expect(Math.abs(solveOf(c.netlist) / solveOf(original.netlist) - 1)).toBeLessThan(1e-6);
  });

  it('names the line of a netlist that does not parse', () => {
    const r = importDesignFile('broken.net', 'title\nC1 a 0 abc\nR1 a 0\n.end\n');
    expect(r.ok).toBe(false);
    expect(r.ok === false && r.reason).toMatch(/^broken\.net is not a readable netlist: line 2: .*line 3: /);
  });
});
