import { describe, expect, it } from 'vitest';
import { compileDocument, type CompileResult } from '@/lib/circuit/compile/compile';
import { fullWaveStarter, GENERIC_DIODE, halfWaveStarter, symmetricStarter, type StarterOptions } from '@/lib/circuit/document/starters';
import type { DesignBlock, DesignDocument } from '@/lib/circuit/document/schema';
import { formatNetlist } from '@/lib/circuit/netlist/format';
import { parseNetlist } from '@/lib/circuit/netlist/parse';
import { recognizeTopology } from '@/lib/circuit/compile/topology';

const O: StarterOptions = { amplitudeV: 1000, frequencyHz: 1000, capacitanceF: 1e-6, loadCurrentA: 1e-4 };

function ok(r: CompileResult) {
  if (!r.ok) throw new Error(`${r.reason}: ${JSON.stringify(r.diagnostics)}`);
  return r;
}

function stage(doc: DesignDocument, id: string): Extract<DesignBlock, { kind: 'stage' }> {
  const b = doc.blocks.find((x) => x.id === id);
  if (!b || b.kind !== 'stage') throw new Error(`no stage ${id}`);
  return b;
}

describe('compileDocument: starters are recognised', () => {
  for (let n = 1; n <= 8; n++) {
    for (const polarity of ['positive', 'negative'] as const) {
      it(`half-wave n=${n} ${polarity}`, () => {
        const r = ok(compileDocument(halfWaveStarter(n, { ...O, polarity })));
        expect(r.topology.kind).toBe('half-wave');
        expect(r.topology.ladders[0]).toMatchObject({ stages: n, polarity, outputNode: `y_s${n}` });
        expect(r.diagnostics).toEqual([]);
        expect(r.netlist.elements.every((e) => 'RCDVI'.includes(e.kind))).toBe(true);
      });
      it(`full-wave n=${n} ${polarity}`, () => {
        const r = ok(compileDocument(fullWaveStarter(n, { ...O, polarity })));
        expect(r.topology.kind).toBe('full-wave');
        expect(r.topology.ladders[0]).toMatchObject({ stages: n, polarity, variant: 'full-wave', secondDrivenColumn: Array.from({ length: n }, (_, k) => `x2_s${k + 1}`) });
        expect(r.diagnostics).toEqual([]);
      });
    }
    it(`symmetric n=${n}`, () => {
      const r = ok(compileDocument(symmetricStarter(n, O)));
      expect(r.topology.kind).toBe('symmetric');
      expect(r.topology.outputs).toEqual([
        { node: `y_p${n}`, polarity: 'positive' },
        { node: `y_m${n}`, polarity: 'negative' },
      ]);
      expect(r.diagnostics).toEqual([]);
    });
  }

  it('recognition survives export and re-import as SPICE text', () => {
    for (const doc of [halfWaveStarter(5, O), fullWaveStarter(4, O), symmetricStarter(3, O)]) {
      const r = ok(compileDocument(doc));
      const back = parseNetlist(formatNetlist(r.netlist));
      if (!back.ok) throw new Error('reparse');
      expect(recognizeTopology(back.netlist).kind).toBe(r.topology.kind);
    }
  });
});

describe('compileDocument: netlist contents', () => {
  it('stable readable net names and origins', () => {
    const r = ok(compileDocument(halfWaveStarter(2, O)));
    const nodes = new Set(r.netlist.elements.flatMap((e) => e.nodes));
    expect([...nodes].sort()).toEqual(['0', 'src_hot', 'x_s1', 'x_s2', 'y_s1', 'y_s2']);
    expect(r.netlist.nodeOrigins?.x_s1).toEqual(expect.arrayContaining([{ blockId: 's1', port: 'xOut' }, { blockId: 's2', port: 'xIn' }]));
    const cp = r.netlist.elements.find((e) => e.name === 'Cpump_s2');
    expect(cp).toMatchObject({ kind: 'C', nodes: ['x_s1', 'x_s2'], origin: { blockId: 's2', role: 'pumpC' } });
    expect(r.netlist.elements.find((e) => e.name === 'DA_s2')).toMatchObject({ nodes: ['y_s1', 'x_s2'], origin: { blockId: 's2', role: 'diodeA' } });
    // Compiling twice gives the same netlist.
    expect(compileDocument(halfWaveStarter(2, O))).toEqual(r);
  });

  it('RMS amplitude becomes a peak (×√2), source resistance an explicit series R', () => {
    const r = ok(compileDocument(halfWaveStarter(1, { ...O, amplitudeV: 230, amplitudeMode: 'rms', sourceResistanceOhm: 3 })));
    const v = r.netlist.elements.find((e) => e.kind === 'V');
    expect(v?.kind === 'V' && v.sine?.amplitude).toBeCloseTo(230 * Math.SQRT2, 12);
    const rs = r.netlist.elements.find((e) => e.name === 'Rs_source_src');
    expect(rs).toMatchObject({ kind: 'R', resistanceOhm: 3, nodes: [v?.nodes[0], 'src_hot'] });
    expect(r.topology.drivePeakV).toBeCloseTo(325.27, 2);
  });

  it('centre-tapped drive: two V in antiphase about ct', () => {
    const r = ok(compileDocument(fullWaveStarter(2, O)));
    const vs = r.netlist.elements.filter((e) => e.kind === 'V');
    expect(vs.map((v) => v.kind === 'V' && [v.nodes[1], v.sine?.phaseDeg])).toEqual([
      ['0', 0],
      ['0', 180],
    ]);
  });

  it('capacitor ESR becomes a series R through an internal node', () => {
    const doc = halfWaveStarter(2, O);
    stage(doc, 's1').data.pumpC.esrOhm = 0.5;
    const r = ok(compileDocument(doc));
    const esr = r.netlist.elements.find((e) => e.name === 'Resr_pumpC_s1');
    expect(esr).toMatchObject({ kind: 'R', resistanceOhm: 0.5, nodes: ['i_s1_pumpC', 'x_s1'] });
    expect(r.topology.kind).toBe('half-wave');
  });

  it('stray capacitance at every ladder node, bleeders at every output', () => {
    const cases: Array<[DesignDocument, number, number]> = [
      [halfWaveStarter(3, { ...O, strayCapacitanceF: 2e-12, bleederOhm: 1e9 }), 6, 1],
      [fullWaveStarter(3, { ...O, strayCapacitanceF: 2e-12, bleederOhm: 1e9 }), 9, 1],
      [symmetricStarter(3, { ...O, strayCapacitanceF: 2e-12, bleederOhm: 1e9 }), 12, 2],
    ];
    for (const [doc, strays, bleeders] of cases) {
      const r = ok(compileDocument(doc));
      const cs = r.netlist.elements.filter((e) => e.name.startsWith('Cstray_'));
      expect(cs).toHaveLength(strays);
      expect(cs.every((c) => c.kind === 'C' && c.capacitanceF === 2e-12 && c.nodes[1] === '0')).toBe(true);
      const rb = r.netlist.elements.filter((e) => e.name.startsWith('Rbleed_'));
      expect(rb.map((b) => b.nodes[0]).sort()).toEqual(r.topology.outputs.map((o) => o.node).sort());
      expect(rb).toHaveLength(bleeders);
      expect(r.topology.kind).not.toBe('custom');
      expect(r.topology.strayCapacitors).toHaveLength(strays);
    }
  });

  it('loads: current source oriented to load the ladder, resistor as R', () => {
    const neg = ok(compileDocument(halfWaveStarter(2, { ...O, polarity: 'negative', loadCurrentA: 1e-3 })));
    expect(neg.netlist.elements.find((e) => e.kind === 'I')).toMatchObject({ nodes: ['0', 'y_s2'], dcA: 1e-3 });
    expect(neg.topology.ladders[0].loadCurrentA).toBeCloseTo(1e-3, 15);
    const res = ok(compileDocument(halfWaveStarter(2, { ...O, loadResistanceOhm: 4e6 })));
    expect(res.netlist.elements.find((e) => e.name === 'Rload_load')).toMatchObject({ kind: 'R', resistanceOhm: 4e6, nodes: ['y_s2', '0'] });
  });

  it('one .model per distinct diode parameter set, deterministic names', () => {
    const doc = halfWaveStarter(3, O);
    stage(doc, 's2').data.diodeB = { ...GENERIC_DIODE, model: { isA: 1e-12, n: 1.1, rsOhm: 1 } };
    const r = ok(compileDocument(doc));
    expect(Object.keys(r.netlist.models)).toEqual(['DMOD1', 'DMOD2']);
    expect(r.netlist.elements.find((e) => e.name === 'DB_s2')).toMatchObject({ model: 'DMOD2' });
    expect(r.netlist.models.DMOD2).toMatchObject({ isA: 1e-12, n: 1.1, rsOhm: 1 });
  });
});

/**
 * A half-wave ladder drawn from discrete capacitor and diode blocks: stage k has cp{k} x(k−1)→x(k),
 * cs{k} y(k−1)→y(k), da{k} y(k−1)→x(k), db{k} x(k)→y(k); x0 = source hot, y0 = ground.
 */
function discreteLadder(n: number, opts: { omit?: string; reverse?: string } = {}): DesignDocument {
  const blocks: DesignBlock[] = [
    { id: 'src', kind: 'acSource', position: { x: 0, y: 0 }, data: { variant: 'single', amplitudeV: 100, amplitudeMode: 'peak', frequencyHz: 50e3, phaseDeg: 0, sourceResistanceOhm: 0 } },
    { id: 'gnd', kind: 'ground', position: { x: 0, y: 0 }, data: {} },
  ];
  const wires: DesignDocument['wires'] = [{ id: 'w0', source: 'src', sourcePort: 'ret', target: 'gnd', targetPort: 'g' }];
  let wn = 1;
  const wire = (a: string, ap: string, b: string, bp: string) => {
    if (a === opts.omit || b === opts.omit) return;
    wires.push({ id: `w${wn++}`, source: a, sourcePort: ap, target: b, targetPort: bp });
  };
  const cap = (id: string) => {
    if (id !== opts.omit) blocks.push({ id, kind: 'capacitor', position: { x: 0, y: 0 }, data: { capacitanceF: 10e-9 } });
  };
  const dio = (id: string) => blocks.push({ id, kind: 'diode', position: { x: 0, y: 0 }, data: GENERIC_DIODE });
  // A reversed diode swaps its anode and cathode wires.
  const an = (id: string) => (id === opts.reverse ? 'cathode' : 'anode');
  const ca = (id: string) => (id === opts.reverse ? 'anode' : 'cathode');
  const xPort = (k: number): [string, string] => (k === 0 ? ['src', 'hot'] : [`cp${k}`, 'b']);
  const yPort = (k: number): [string, string] => (k === 0 ? ['gnd', 'g'] : [`db${k}`, ca(`db${k}`)]);
  for (let k = 1; k <= n; k++) {
    cap(`cp${k}`);
    cap(`cs${k}`);
    dio(`da${k}`);
    dio(`db${k}`);
    wire(...xPort(k - 1), `cp${k}`, 'a');
    wire(...yPort(k - 1), `da${k}`, an(`da${k}`));
    wire(`da${k}`, ca(`da${k}`), `cp${k}`, 'b');
    wire(`cp${k}`, 'b', `db${k}`, an(`db${k}`));
    wire(...yPort(k - 1), `cs${k}`, 'a');
    wire(`cs${k}`, 'b', `db${k}`, ca(`db${k}`));
  }
  blocks.push({ id: 'load', kind: 'load', position: { x: 0, y: 0 }, data: { mode: 'current', currentA: 1e-6 } });
  wire(`db${n}`, ca(`db${n}`), 'load', 'a');
  wire('load', 'b', 'gnd', 'g');
  return { schemaVersion: 1, blocks, wires, settings: { strayCapacitanceF: 0, deratingFraction: 0.8 } };
}

describe('compileDocument: faults on the right block and stage', () => {
  it('diodes of stage 2 reversed (stage polarity flipped)', () => {
    const doc = halfWaveStarter(4, O);
    stage(doc, 's2').data.polarity = 'negative';
    const r = ok(compileDocument(doc));
    const rev = r.diagnostics.filter((d) => d.code === 'reversed-diode');
    expect(rev.map((d) => [d.element, d.blockId, d.stage])).toEqual([
      ['DA_s2', 's2', 2],
      ['DB_s2', 's2', 2],
    ]);
    expect(r.topology.ladders[0].stages).toBe(4);
  });

  it('a capacitor shorted by a wire', () => {
    const doc = halfWaveStarter(3, O);
    doc.wires.push({ id: 'short', source: 's2', sourcePort: 'xIn', target: 's2', targetPort: 'xOut' });
    const r = ok(compileDocument(doc));
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'shorted-capacitor', blockId: 's2', element: 'Cpump_s2' }));
  });

  it('one diode reversed in stage 2 of a ladder built from discrete parts', () => {
    const r = ok(compileDocument(discreteLadder(4, { reverse: 'db2' })));
    expect(r.topology.ladders[0]).toMatchObject({ stages: 4, polarity: 'positive' });
    const rev = r.diagnostics.filter((d) => d.code === 'reversed-diode');
    expect(rev).toEqual([expect.objectContaining({ element: 'D_db2', blockId: 'db2', stage: 2 })]);
    expect(ok(compileDocument(discreteLadder(4))).diagnostics).toEqual([]);
  });

  it('a missing capacitor in a ladder built from discrete parts', () => {
    const r = ok(compileDocument(discreteLadder(3, { omit: 'cs2' })));
    expect(r.topology.ladders[0].stages).toBe(3);
    const miss = r.diagnostics.filter((d) => d.code === 'missing-capacitor');
    expect(miss).toEqual([expect.objectContaining({ stage: 2, blockId: 'db2' })]);
    // With the capacitor in place it is a clean half-wave ladder.
    const fixed = ok(compileDocument(discreteLadder(3)));
    expect(fixed.topology.kind).toBe('half-wave');
    expect(fixed.diagnostics).toEqual([]);
  });

  it('floating part and unconnected port', () => {
    const doc = halfWaveStarter(2, O);
    doc.blocks.push({ id: 'rx', kind: 'resistor', position: { x: 0, y: 0 }, data: { resistanceOhm: 1e3 } });
    doc.blocks.push({ id: 'cx', kind: 'capacitor', position: { x: 0, y: 0 }, data: { capacitanceF: 1e-9 } });
    doc.wires.push({ id: 'f1', source: 'rx', sourcePort: 'a', target: 'cx', targetPort: 'a' });
    doc.wires.push({ id: 'f2', source: 'rx', sourcePort: 'b', target: 'cx', targetPort: 'b' });
    const r = compileDocument(doc);
    expect(r.ok).toBe(false);
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'floating-node', severity: 'error', blockId: expect.stringMatching(/^(rx|cx)$/) }));

    const open = halfWaveStarter(2, O);
    open.blocks.push({ id: 'rb', kind: 'resistor', position: { x: 0, y: 0 }, data: { resistanceOhm: 1e9 } });
    open.wires.push({ id: 'o1', source: 'rb', sourcePort: 'a', target: 's2', targetPort: 'yOut' });
    const r2 = ok(compileDocument(open));
    expect(r2.diagnostics).toContainEqual(expect.objectContaining({ code: 'unconnected-port', blockId: 'rb', node: 'n_rb_b' }));
    expect(r2.diagnostics.filter((d) => d.code === 'floating-node')).toEqual([]);
  });

  it('no ground', () => {
    const doc = halfWaveStarter(2, O);
    doc.blocks = doc.blocks.filter((b) => b.kind !== 'ground');
    doc.wires = doc.wires.filter((w) => w.source !== 'gnd' && w.target !== 'gnd');
    const r = compileDocument(doc);
    expect(r.ok).toBe(false);
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'no-ground', severity: 'error' }));
  });

  it('shorted source', () => {
    const doc = halfWaveStarter(2, O);
    doc.wires.push({ id: 'sh', source: 'src', sourcePort: 'hot', target: 'gnd', targetPort: 'g' });
    const r = compileDocument(doc);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/shorted/);
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'shorted-source', blockId: 'src' }));
  });

  it('zero value', () => {
    const doc = halfWaveStarter(3, O);
    stage(doc, 's2').data.pumpC.capacitanceF = 0;
    const r = compileDocument(doc);
    expect(r.ok).toBe(false);
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'non-positive-value', blockId: 's2' }));
  });

  it('overload', () => {
    // Vp·f·C = 1 V·A: at 0.5 A the optimum is √2 ≈ 1.4 stages, far below 4.
    const r = ok(compileDocument(halfWaveStarter(4, { ...O, loadCurrentA: 0.5 })));
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'overload', blockId: 'load', node: 'y_s4' }));
    const fine = ok(compileDocument(halfWaveStarter(4, O)));
    expect(fine.diagnostics.map((d) => d.code)).not.toContain('overload');
  });

  it('wire to a port the block does not have', () => {
    const doc = halfWaveStarter(1, O);
    doc.wires.push({ id: 'bad', source: 's1', sourcePort: 'x2Out', target: 'gnd', targetPort: 'g' });
    const r = compileDocument(doc);
    expect(r.ok).toBe(false);
    expect(r.diagnostics).toContainEqual(expect.objectContaining({ code: 'unknown-port', blockId: 's1' }));
  });
});
