import { describe, expect, it } from 'vitest';
import { formatNetlist, spiceNumber } from '@/lib/circuit/netlist/format';
import { parseNetlist } from '@/lib/circuit/netlist/parse';
import type { Netlist } from '@/lib/circuit/netlist/types';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { fullWaveStarter, halfWaveStarter, symmetricStarter } from '@/lib/circuit/document/starters';

function strip(n: Netlist) {
  return {
    title: n.title,
    elements: n.elements.map((e) => {
      const { line: _line, origin: _origin, ...rest } = e;
      return rest;
    }),
    models: n.models,
    ignored: n.ignored.map((c) => c.text),
  };
}

function roundTrip(n: Netlist) {
  const text = formatNetlist(n);
  const back = parseNetlist(text);
  if (!back.ok) throw new Error(JSON.stringify(back.errors));
  return { text, back: back.netlist };
}

describe('formatNetlist', () => {
  it('numbers are written exactly', () => {
    for (const x of [1e-9, 4.7e-9, 0.1 + 0.2, 1 / 3, 1e21, -2.5e-17, 123456789.123, 0]) {
      const r = parseNetlist(`t\nR1 a 0 ${spiceNumber(x)}\n`);
      expect(r.ok && r.netlist.elements[0].kind === 'R' && r.netlist.elements[0].resistanceOhm).toBe(x);
    }
    expect(spiceNumber(-0)).toBe('0');
  });

  it('round-trips a hand-written netlist with every feature', () => {
    const src = parseNetlist(
      [
        'Round trip',
        'V1 in 0 DC 1 SIN(0 1k 50k 1u 2 45)',
        'I1 out 0 2m',
        'I2 out 0 SIN(0 1m 1k)',
        'R1 in a 4.7k',
        'C1 a b 1.234567891234n IC=3.3',
        'C2 b 0 0.1u',
        'D1 b out DX 3',
        'D2 0 b dy',
        '.model DX D(IS=2.5n N=1.75 RS=0.05 BV=1.2k IBV=5u CJO=3p VJ=0.6 M=0.4 TT=75n FC=0.45)',
        '.model DY D',
        '.tran 1u 10m',
        '.end',
      ].join('\n'),
    );
    if (!src.ok) throw new Error('setup');
    const { text, back } = roundTrip(src.netlist);
    expect(text.trimEnd().endsWith('.end')).toBe(true);
    expect(text).toContain('.model DX D(');
    expect(strip(back)).toEqual(strip(src.netlist));
  });

  it.each([
    ['half-wave', halfWaveStarter(4, { amplitudeV: 1e3, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 1e-3, sourceResistanceOhm: 2, strayCapacitanceF: 5e-12, bleederOhm: 1e9 })],
    ['full-wave', fullWaveStarter(3, { amplitudeV: 230, amplitudeMode: 'rms', frequencyHz: 50, capacitanceF: 4.7e-6, loadResistanceOhm: 1e6 })],
    ['symmetric', symmetricStarter(2, { amplitudeV: 5e3, frequencyHz: 40e3, capacitanceF: 2.2e-9, loadCurrentA: 1e-4 })],
  ])('round-trips the compiled %s starter', (_name, doc) => {
    const c = compileDocument(doc);
    if (!c.ok) throw new Error(c.reason);
    const { back } = roundTrip(c.netlist);
    expect(strip(back).elements).toEqual(strip(c.netlist).elements);
    expect(back.models).toEqual(c.netlist.models);
  });
});
