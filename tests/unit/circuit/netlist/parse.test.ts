import { describe, expect, it } from 'vitest';
import { MAX_NETLIST_CHARS, parseNetlist, type ParseResult } from '@/lib/circuit/netlist/parse';
import type { Netlist } from '@/lib/circuit/netlist/types';

function ok(r: ParseResult): Netlist {
  if (!r.ok) throw new Error(`expected ok, got ${JSON.stringify(r.errors)}`);
  return r.netlist;
}
function errors(r: ParseResult) {
  if (r.ok) throw new Error('expected errors');
  return r.errors;
}

describe('parseNetlist: syntax', () => {
  it('first line is the title, even when it looks like a card', () => {
    const r = parseNetlist('R1 a b 1k\nR2 a 0 1k\n');
    const n = ok(r);
    expect(n.title).toBe('R1 a b 1k');
    expect(n.elements.map((e) => e.name)).toEqual(['R2']);
    expect(r.ok && r.warnings[0].line).toBe(1);
  });

  it('reads R, C with IC, D with area, V and I', () => {
    const n = ok(
      parseNetlist(
        [
          'title',
          'R1 a b 4.7k',
          'C1 a 0 10uF IC=5',
          'C2 b 0 1n ic = -2',
          'D1 a b DX 2',
          'V1 a 0 DC 12',
          'I1 b 0 1m',
          '.model DX D(IS=2.5n N=1.75)',
        ].join('\n'),
      ),
    );
    expect(n.elements).toEqual([
      { kind: 'R', name: 'R1', nodes: ['a', 'b'], resistanceOhm: 4700, line: 2 },
      { kind: 'C', name: 'C1', nodes: ['a', '0'], capacitanceF: 10e-6, initialV: 5, line: 3 },
      { kind: 'C', name: 'C2', nodes: ['b', '0'], capacitanceF: 1e-9, initialV: -2, line: 4 },
      { kind: 'D', name: 'D1', nodes: ['a', 'b'], model: 'DX', area: 2, line: 5 },
      { kind: 'V', name: 'V1', nodes: ['a', '0'], dcV: 12, line: 6 },
      { kind: 'I', name: 'I1', nodes: ['b', '0'], dcA: 1e-3, line: 7 },
    ]);
  });

  it('SIN with parentheses, with spaces, with DC, partial argument lists', () => {
    const n = ok(
      parseNetlist(
        [
          't',
          'V1 a 0 SIN(0 1k 50k)',
          'V2 b 0 sin 1 2 3 4 5 90',
          'V3 c 0 DC 5 SIN(0, 10, 1k, 0, 0, 180)',
          'V4 d 0 2 SIN(0 1 1)',
          'I5 e 0 SIN(0 1m 1k 1m)',
        ].join('\n'),
      ),
    );
    const [v1, v2, v3, v4, i5] = n.elements;
    expect(v1).toMatchObject({ dcV: 0, sine: { offsetV: 0, amplitude: 1000, frequencyHz: 50e3, delayS: 0, damping: 0, phaseDeg: 0 } });
    expect(v2).toMatchObject({ sine: { offsetV: 1, amplitude: 2, frequencyHz: 3, delayS: 4, damping: 5, phaseDeg: 90 } });
    expect(v3).toMatchObject({ dcV: 5, sine: { amplitude: 10, frequencyHz: 1000, phaseDeg: 180 } });
    expect(v4).toMatchObject({ dcV: 2, sine: { amplitude: 1 } });
    expect(i5).toMatchObject({ kind: 'I', dcA: 0, sine: { amplitude: 1e-3, delayS: 1e-3 } });
  });

  it('.model with and without parentheses, commas, aliases, defaults (SPICE 3 level 1)', () => {
    const n = ok(
      parseNetlist(
        ['t', 'D1 a 0 da', 'D2 a 0 DB', '.model DA D(IS=1e-12, N=1.5, RS=2 BV=1k IBV=10u CJO=5p VJ=0.7 M=0.33 TT=10n FC=0.4)', '.MODEL db d is=3n cj0=1p'].join('\n'),
      ),
    );
    expect(n.models.DA).toEqual({ name: 'DA', isA: 1e-12, n: 1.5, rsOhm: 2, bvV: 1000, ibvA: 10e-6, cjoF: 5e-12, vjV: 0.7, m: 0.33, ttS: 10e-9, fc: 0.4 });
    expect(n.models.DB).toEqual({ name: 'db', isA: 3e-9, n: 1, rsOhm: 0, ibvA: 1e-3, cjoF: 1e-12, vjV: 1, m: 0.5, ttS: 0, fc: 0.5 });
  });

  it('continuation lines, comments, gnd, .end, ignored dot-cards', () => {
    const r = parseNetlist(
      [
        'title',
        '* a comment line',
        'R1 a',
        '* comment between card and continuation',
        '+ GND 1k ; inline comment',
        'C1 a gnd 1u $ dollar comment',
        'R2 a$b 0 5',
        '.tran 1u 1m',
        '.options reltol=1e-4',
        '.end',
        'R3 x y 1',
      ].join('\n'),
    );
    const n = ok(r);
    expect(n.elements.map((e) => [e.name, e.nodes])).toEqual([
      ['R1', ['a', '0']],
      ['C1', ['a', '0']],
      ['R2', ['a$b', '0']],
    ]);
    expect(n.elements[0].line).toBe(3);
    expect(n.ignored).toEqual([
      { line: 8, text: '.tran 1u 1m' },
      { line: 9, text: '.options reltol=1e-4' },
    ]);
    expect(r.ok && r.warnings.map((w) => w.line)).toEqual([8, 9]);
  });

  it('ngspice .control blocks are kept verbatim, not read as cards', () => {
    const r = parseNetlist('t\nR1 a 0 1k\n.control\nrun\nplot v(a)\n.endc\nC1 a 0 1n\n');
    const n = ok(r);
    expect(n.elements.map((e) => e.name)).toEqual(['R1', 'C1']);
    expect(n.ignored.map((c) => c.text)).toEqual(['.control', 'run', 'plot v(a)', '.endc']);
    expect(r.ok && r.warnings).toEqual([{ line: 3, message: '.control block ignored' }]);
  });

  it('keeps node names as written', () => {
    const n = ok(parseNetlist('t\nR1 Node_A out.1 1\nR2 out.1 0 1\n'));
    expect(n.elements[0].nodes).toEqual(['Node_A', 'out.1']);
  });
});

describe('parseNetlist: broken input names the line and the reason', () => {
  it.each([
    ['L1 a b 1m', 2, /inductors/],
    ['Z1 a b 1', 2, /unknown element letter "Z"/],
    ['R1 a', 2, /missing node/],
    ['R1', 2, /missing nodes/],
    ['R1 a b', 2, /missing resistance/],
    ['R1 a b 1.2.3', 2, /bad resistance "1.2.3"/],
    ['C1 a b NaN', 2, /bad capacitance "NaN"/],
    ['C1 a b Infinity', 2, /bad capacitance/],
    ['C1 a b 1n IC=oops', 2, /initial condition/],
    ['R1 a a 1', 2, /same node "a"/],
    ['V1 gnd 0 1', 2, /same node "0"/],
    ['D1 a b', 2, /missing model/],
    ['D1 a b NOPE', 2, /unknown model "NOPE"/],
    ['V1 a 0 PULSE(0 1 0)', 2, /PULSE sources are not supported/],
    ['V1 a 0 SIN(0 1)', 2, /SIN needs at least/],
    ['V1 a 0 SIN(0 1 0)', 2, /frequency must be greater than zero/],
    ['V1 a 0 SIN(0 1 NaN)', 2, /bad SIN parameter/],
    ['V1 a 0 DC', 2, /DC needs a value/],
    ['V1 a 0', 2, /missing value/],
    ['V1 a 0 1 2', 2, /bad value "2"/],
    ['.model X D(IS=abc)', 2, /bad value for IS/],
    ['.model X D IS', 2, /expected PARAM=value/],
    ['.model', 2, /needs a name and a type/],
    ['.subckt foo a b', 2, /not supported/],
    ['+ 1k', 2, /continuation line/],
  ])('%s', (card, line, message) => {
    const errs = errors(parseNetlist(`title\n${card}\nR99 q 0 1\n`));
    expect(errs[0].line).toBe(line);
    expect(errs[0].message).toMatch(message);
  });

  it('duplicate element names (case-insensitive) and duplicate models', () => {
    const errs = errors(parseNetlist('t\nR1 a 0 1\nr1 b 0 1\n.model X D\n.model x D\n'));
    expect(errs).toEqual([
      { line: 3, message: expect.stringMatching(/duplicate element name \(first defined on line 2\)/) },
      { line: 5, message: expect.stringMatching(/duplicate model name/) },
    ]);
  });

  it('an empty netlist is an error', () => {
    expect(errors(parseNetlist('only a title\n'))[0].message).toMatch(/no elements/);
    expect(errors(parseNetlist(''))[0].message).toMatch(/no elements/);
  });

  it('reports several errors at once, in line order', () => {
    const errs = errors(parseNetlist('t\nD1 a b MISSING\nR1 a\nQ1 a b c\n'));
    expect(errs.map((e) => e.line)).toEqual([2, 3, 4]);
  });
});

describe('parseNetlist: hostile input', () => {
  it('refuses text above the size limit without reading it', () => {
    const errs = errors(parseNetlist('t\n' + 'x'.repeat(MAX_NETLIST_CHARS)));
    expect(errs[0]).toMatchObject({ line: 0, message: expect.stringMatching(/limit/) });
  });

  it('a very long line is an error, not a crash', () => {
    const errs = errors(parseNetlist(`t\nR1 a b ${'9'.repeat(50_000)}\n`));
    expect(errs[0]).toMatchObject({ line: 2, message: expect.stringMatching(/longer than/) });
  });

  it('100 000 lines parse in reasonable time', () => {
    const lines = ['big'];
    for (let i = 0; i < 100_000; i++) lines.push(`R${i} n${i % 97} 0 1k`);
    const t0 = performance.now();
    const n = ok(parseNetlist(lines.join('\n')));
    expect(n.elements).toHaveLength(100_000);
    expect(performance.now() - t0).toBeLessThan(5000);
  });

  it('100 000 bad lines give a bounded error list', () => {
    const lines = ['bad'];
    for (let i = 0; i < 100_000; i++) lines.push(`R${i} a b NaN`);
    const errs = errors(parseNetlist(lines.join('\n')));
    expect(errs.length).toBeGreaterThan(10);
    expect(errs.length).toBeLessThanOrEqual(200);
  });

  it('binary junk is rejected with line numbers', () => {
    const junk = 't\n' + Array.from({ length: 50 }, (_, i) => String.fromCharCode(33 + ((i * 7919) % 90)).repeat(5)).join('\n');
    const r = parseNetlist(junk);
    expect(r.ok).toBe(false);
  });
});
