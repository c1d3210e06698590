import { describe, expect, it } from 'vitest';
import { parseNetlist } from '@/lib/circuit/netlist/parse';
import type { Netlist } from '@/lib/circuit/netlist/types';
import { recognizeTopology } from '@/lib/circuit/compile/topology';

function net(text: string): Netlist {
  const r = parseNetlist(text);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.netlist;
}

/** A half-wave Cockcroft–Walton ladder as SPICE text with deliberately odd node names. */
function halfWave(n: number, opts: { polarity?: 'positive' | 'negative'; prefix?: string; load?: string; drive?: string; skip?: string[]; extra?: string[] } = {}): string {
  const p = opts.prefix ?? 'q';
  const drive = opts.drive ?? 'AC_IN';
  const lines = ['half-wave ladder', `Vdrive ${drive} GND SIN(0 1k 1k)`, '.model DGEN D(IS=2.5n N=1.75 RS=0.05)'];
  const x = (k: number) => (k === 0 ? drive : `${p}Pump${k}`);
  const y = (k: number) => (k === 0 ? '0' : `${p}Dc_${k}`);
  const d = (name: string, a: string, b: string) => (opts.polarity === 'negative' ? `${name} ${b} ${a} DGEN` : `${name} ${a} ${b} DGEN`);
  for (let k = 1; k <= n; k++) {
    lines.push(`C${p}P${k} ${x(k - 1)} ${x(k)} 1u`, `C${p}S${k} ${y(k - 1)} ${y(k)} 1u`, d(`D${p}A${k}`, y(k - 1), x(k)), d(`D${p}B${k}`, x(k), y(k)));
  }
  lines.push(opts.load ?? `Iload ${y(n)} 0 DC 1u`);
  if (opts.extra) lines.push(...opts.extra);
  return lines.filter((l) => !(opts.skip ?? []).some((s) => l.startsWith(s + ' '))).join('\n');
}

function fullWave(n: number, polarity: 'positive' | 'negative' = 'positive'): string {
  const lines = ['full-wave', 'Va lineA 0 SIN(0 500 10k 0 0 0)', 'Vb lineB 0 SIN(0 500 10k 0 0 180)', '.model D1N D'];
  const x = (k: number) => (k === 0 ? 'lineA' : `ua${k}`);
  const x2 = (k: number) => (k === 0 ? 'lineB' : `ub${k}`);
  const y = (k: number) => (k === 0 ? '0' : `stack${k}`);
  const d = (name: string, a: string, b: string) => (polarity === 'negative' ? `${name} ${b} ${a} D1N` : `${name} ${a} ${b} D1N`);
  for (let k = 1; k <= n; k++) {
    lines.push(`Cp${k} ${x(k - 1)} ${x(k)} 10n`, `Cq${k} ${x2(k - 1)} ${x2(k)} 10n`, `Cs${k} ${y(k - 1)} ${y(k)} 10n`);
    lines.push(d(`Da${k}`, y(k - 1), x(k)), d(`Db${k}`, x(k), y(k)), d(`Dc${k}`, y(k - 1), x2(k)), d(`Dd${k}`, x2(k), y(k)));
  }
  lines.push(`Rl ${y(n)} 0 100meg`);
  return lines.join('\n');
}

describe('recognizeTopology from hand-written netlists', () => {
  it('a 3-stage half-wave ladder, literal text with arbitrary names', () => {
    const t = recognizeTopology(
      net(`greinacher triple
Vsrc feed 0 SIN(0 2k 25k)
Rsrc feed drv 4.7
C_a drv mid1 1n
C_b 0 top1 1n
D_1 0 mid1 RECT
D_2 mid1 top1 RECT
C_c mid1 mid2 1n
C_d top1 top2 1n
D_3 top1 mid2 RECT
D_4 mid2 top2 RECT
C_e mid2 mid3 1n
C_f top2 OUTPUT 1n
D_5 top2 mid3 RECT
D_6 mid3 OUTPUT RECT
Rload OUTPUT 0 50meg
.model RECT D(IS=1n N=2)
`),
    );
    expect(t.kind).toBe('half-wave');
    expect(t.diagnostics.filter((d) => d.severity !== 'info')).toEqual([]);
    const l = t.ladders[0];
    expect(l).toMatchObject({ polarity: 'positive', stages: 3, outputNode: 'OUTPUT', drivenColumn: ['mid1', 'mid2', 'mid3'], smoothingColumn: ['top1', 'top2', 'OUTPUT'] });
    expect(l.stageElements[1]).toEqual({ stage: 2, pumpC: 'C_c', smoothC: 'C_d', diodes: ['D_3', 'D_4'] });
    expect(l.sourceElements).toEqual(['Vsrc', 'Rsrc']);
    expect(t.drivePeakV).toBe(2000);
    expect(t.frequencyHz).toBe(25e3);
    expect(t.columnOf).toMatchObject({ '0': 'ground', mid2: 'driven', top2: 'smoothing', drv: 'source' });
    expect(t.stageOf).toMatchObject({ mid3: 3, OUTPUT: 3, top1: 1 });
    expect(t.outputs).toEqual([{ node: 'OUTPUT', polarity: 'positive' }]);
    expect(l.loadCurrentA).toBeCloseTo(12e3 / 50e6, 12);
  });

  for (let n = 1; n <= 8; n++) {
    for (const polarity of ['positive', 'negative'] as const) {
      it(`half-wave n=${n} ${polarity}`, () => {
        const t = recognizeTopology(net(halfWave(n, { polarity })));
        expect(t.kind).toBe('half-wave');
        expect(t.ladders).toHaveLength(1);
        expect(t.ladders[0]).toMatchObject({ stages: n, polarity, outputNode: `qDc_${n}` });
        expect(t.diagnostics).toEqual([]);
      });
      it(`full-wave n=${n} ${polarity}`, () => {
        const t = recognizeTopology(net(fullWave(n, polarity)));
        expect(t.kind).toBe('full-wave');
        expect(t.ladders[0]).toMatchObject({ variant: 'full-wave', stages: n, polarity, outputNode: `stack${n}` });
        expect(t.ladders[0].secondDrivenColumn).toHaveLength(n);
        expect(t.columnOf[`ub${n}`]).toBe('driven2');
        expect(t.ladders[0].stageElements[n - 1].diodes).toHaveLength(4);
        expect(t.diagnostics).toEqual([]);
      });
    }
    it(`symmetric n=${n}`, () => {
      const pos = halfWave(n, { prefix: 'p', load: `Itube pDc_${n} nDc_${n} 1m` });
      const neg = halfWave(n, { prefix: 'n', polarity: 'negative', load: '' })
        .split('\n')
        .filter((l) => /^[CD]/.test(l));
      const t = recognizeTopology(net([pos, ...neg].join('\n')));
      expect(t.kind).toBe('symmetric');
      expect(t.ladders.map((l) => [l.polarity, l.stages])).toEqual([
        ['positive', n],
        ['negative', n],
      ]);
      expect(t.outputs.map((o) => o.node).sort()).toEqual([`nDc_${n}`, `pDc_${n}`]);
      expect(t.ladders.every((l) => l.loadCurrentA === 1e-3)).toBe(true);
    });
  }

  it('stray capacitors to ground are recognised as strays, not as a custom shape', () => {
    const extra = [1, 2, 3].flatMap((k) => [`Cx${k} qPump${k} 0 10p`, `Cy${k} qDc_${k} 0 10p`]);
    const t = recognizeTopology(net(halfWave(3, { extra })));
    expect(t.kind).toBe('half-wave');
    expect(t.strayCapacitors.sort()).toEqual(['Cx1', 'Cx2', 'Cx3', 'Cy1', 'Cy2', 'Cy3']);
  });

  it('capacitor ESR in series is contracted', () => {
    const text = halfWave(2).replace('CqP2 qPump1 qPump2 1u', 'CqP2 qPump1 esr2 1u\nResr2 esr2 qPump2 0.1');
    const t = recognizeTopology(net(text));
    expect(t.kind).toBe('half-wave');
    expect(t.ladders[0].stageElements[1].pumpC).toBe('CqP2');
  });

  it('ESR on either side of a capacitor is contracted', () => {
    const text = halfWave(3)
      .replace('CqS2 qDc_1 qDc_2 1u', 'Resr qDc_1 near 0.2\nCqS2 near qDc_2 1u')
      .replace('CqP3 qPump2 qPump3 1u', 'CqP3 qPump2 far 1u\nResr3 qPump3 far 0.2');
    const t = recognizeTopology(net(text));
    expect(t.kind).toBe('half-wave');
    expect(t.ladders[0].stageElements.map((s) => [s.pumpC, s.smoothC])).toEqual([
      ['CqP1', 'CqS1'],
      ['CqP2', 'CqS2'],
      ['CqP3', 'CqS3'],
    ]);
    expect(t.columnOf.near).toBe('other');
  });

  it('anything else is custom, with an info diagnostic', () => {
    const t = recognizeTopology(net('bridge\nV1 a 0 SIN(0 10 50)\nD1 a b DX\nD2 0 b DX\nC1 b 0 1u\nR1 b 0 1k\n.model DX D\n'));
    expect(t.kind).toBe('custom');
    expect(t.diagnostics.map((d) => d.code)).toContain('custom-topology');
  });
});

describe('faults diagnosed on the right part', () => {
  it('reversed diode in stage 2 (either diode), ladder still reported', () => {
    for (const which of ['A', 'B']) {
      const text = halfWave(4).replace(new RegExp(`^(Dq${which}2) (\\S+) (\\S+) DGEN$`, 'm'), '$1 $3 $2 DGEN');
      const t = recognizeTopology(net(text));
      expect(t.ladders[0]).toMatchObject({ stages: 4, polarity: 'positive' });
      const rev = t.diagnostics.filter((d) => d.code === 'reversed-diode');
      expect(rev).toEqual([expect.objectContaining({ element: `Dq${which}2`, stage: 2, severity: 'warning' })]);
    }
  });

  it('reversed diode in a negative ladder', () => {
    const text = halfWave(3, { polarity: 'negative' }).replace(/^(DqB3) (\S+) (\S+) DGEN$/m, '$1 $3 $2 DGEN');
    const t = recognizeTopology(net(text));
    expect(t.ladders[0].polarity).toBe('negative');
    expect(t.diagnostics.filter((d) => d.code === 'reversed-diode')).toEqual([expect.objectContaining({ element: 'DqB3', stage: 3 })]);
  });

  it('missing smoothing capacitor in stage 2', () => {
    const t = recognizeTopology(net(halfWave(4, { skip: ['CqS2'] })));
    expect(t.ladders[0].stages).toBe(4);
    const miss = t.diagnostics.filter((d) => d.code === 'missing-capacitor');
    expect(miss).toEqual([expect.objectContaining({ stage: 2, node: 'qDc_2' })]);
  });

  it('missing pumping capacitor in stage 3', () => {
    const t = recognizeTopology(net(halfWave(4, { skip: ['CqP3'] })));
    expect(t.ladders[0].stages).toBe(4);
    expect(t.diagnostics.filter((d) => d.code === 'missing-capacitor')).toEqual([expect.objectContaining({ stage: 3, node: 'qPump3' })]);
  });

  it('missing diode in stage 2', () => {
    const t = recognizeTopology(net(halfWave(3, { skip: ['DqB2'] })));
    expect(t.ladders[0].stages).toBe(3);
    expect(t.diagnostics.filter((d) => d.code === 'missing-diode')).toEqual([expect.objectContaining({ stage: 2 })]);
  });

  it('floating sub-circuit', () => {
    const t = recognizeTopology(net(halfWave(2, { extra: ['Rx island1 island2 1k', 'Cx island2 island1 1n'] })));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'floating-node', severity: 'error' }));
    expect(['island1', 'island2']).toContain(t.diagnostics.find((d) => d.code === 'floating-node')?.node);
  });

  it('open end (a node touching one part)', () => {
    const t = recognizeTopology(net(halfWave(2, { extra: ['Rdangle qDc_2 nowhere 1k'] })));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'floating-node', severity: 'warning', node: 'nowhere' }));
  });

  it('node reached only through capacitors has no DC path', () => {
    const t = recognizeTopology(net(halfWave(2, { extra: ['Cc1 qDc_2 capnode 1n', 'Cc2 capnode 0 1n'] })));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'no-dc-path', node: 'capnode' }));
  });

  it('no ground', () => {
    const t = recognizeTopology(net('t\nV1 a b SIN(0 1 1k)\nC1 a b 1u\n'));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'no-ground', severity: 'error' }));
  });

  it('shorted source and shorted capacitor (netlists built in code)', () => {
    const n = net(halfWave(1));
    const bad: Netlist = {
      ...n,
      elements: [...n.elements, { kind: 'V', name: 'Vshort', nodes: ['qDc_1', 'qDc_1'], dcV: 5 }, { kind: 'C', name: 'Cshort', nodes: ['qPump1', 'qPump1'], capacitanceF: 1e-9 }],
    };
    const t = recognizeTopology(bad);
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'shorted-source', element: 'Vshort', severity: 'error' }));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'shorted-capacitor', element: 'Cshort' }));
  });

  it('voltage sources in parallel short each other', () => {
    const t = recognizeTopology(net(halfWave(2, { extra: ['Vpar AC_IN 0 DC 5'] })));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'shorted-source', element: 'Vpar', severity: 'error' }));
    const ring = recognizeTopology(net(halfWave(1, { extra: ['Vr1 AC_IN m DC 1', 'Vr2 m 0 DC 1'] })));
    expect(ring.diagnostics).toContainEqual(expect.objectContaining({ code: 'shorted-source', element: 'Vr2' }));
  });

  it('zero and negative values', () => {
    const t = recognizeTopology(net(halfWave(2).replace('CqS2 qDc_1 qDc_2 1u', 'CqS2 qDc_1 qDc_2 0').replace('Iload', 'Rneg qDc_2 0 -5\nIload')));
    const bad = t.diagnostics.filter((d) => d.code === 'non-positive-value').map((d) => d.element);
    expect(bad.sort()).toEqual(['CqS2', 'Rneg']);
  });

  it('overload: load above the optimum-stage current and loaded output ≤ 0', () => {
    // Vp = 1 kV, f = 1 kHz, C = 1 µF: n_opt = √(Vp f C / I). At I = 0.2 A, n_opt = 2.2 < 4.
    const t = recognizeTopology(net(halfWave(4, { load: 'Iheavy qDc_4 0 0.2' })));
    expect(t.diagnostics).toContainEqual(expect.objectContaining({ code: 'overload', element: 'Iheavy', node: 'qDc_4' }));
    const light = recognizeTopology(net(halfWave(4, { load: 'Ilight qDc_4 0 1m' })));
    expect(light.diagnostics.map((d) => d.code)).not.toContain('overload');
    const huge = recognizeTopology(net(halfWave(4, { load: 'Ihuge qDc_4 0 10' })));
    expect(huge.diagnostics.find((d) => d.code === 'overload')?.message).toMatch(/more than the ladder can feed/);
  });
});
