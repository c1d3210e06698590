// The parts-list CSV reader (lib/parts/csv.ts): good files become part inputs in SI units, broken
// rows are listed by their file line with every reason, and a file that cannot be read as a whole
// is refused with the reason. Engineering notation follows the SPICE 3 user's guide ("numbers":
// f p n u m k meg g t; M means milli, hence the refusal of a bare M here — common practice).
import { describe, expect, it } from 'vitest';
import { MAX_IMPORT_ROWS, PART_CSV_COLUMNS, parsePartsCsv, readCsvNumber, readCsvTolerance } from '@/lib/parts/csv';

function ok(text: string) {
  const r = parsePartsCsv(text);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

describe('numbers and tolerances', () => {
  it.each([
    ['10n', 10e-9],
    ['4.7nF', 4.7e-9],
    ['4.7 nF', 4.7e-9],
    ['15kV', 15e3],
    ['1e-14', 1e-14],
    ['2.2meg', 2.2e6],
    ['100MEG', 100e6],
    ['50m', 0.05],
    ['500uA', 500e-6],
    ['2µ', 2e-6],
    ['+3', 3],
  ])('%s → %d', (text, value) => {
    const r = readCsvNumber(text);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(value, 20);
  });

  it.each(['abc', '1.2.3', '10 %', '', '5 kV x', 'NaN'])('%j is not a number', (text) => {
    expect(readCsvNumber(text).ok).toBe(false);
  });

  it('a bare upper-case M is refused as ambiguous (SPICE reads it as milli)', () => {
    const r = readCsvNumber('10M');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/ambiguous.*meg/);
    expect(readCsvNumber('10MΩ').ok).toBe(false);
  });

  it.each([
    ['10 %', 0.1],
    ['±5%', 0.05],
    ['+/- 20 %', 0.2],
    ['0.05', 0.05],
    ['1', 1],
  ])('tolerance %s → %d', (text, value) => {
    const r = readCsvTolerance(text);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(value, 12);
  });

  it('a tolerance above 1 without % is refused with a hint', () => {
    const r = readCsvTolerance('5');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/5 %/);
    expect(readCsvTolerance('five %').ok).toBe(false);
  });
});

describe('a good file', () => {
  const GOOD = [
    '# invented demo parts list',
    'Kind,Part Number,Description,Maker,Unit Cost,Currency,Capacitance,Tolerance,Rated Voltage,ESR,Dielectric,Size,Rated PIV,Avg Current,Surge Current,trr,IS,N,RS,CJO,TT,Resistance,Power',
    'capacitor,TG-C-1N5-20K,"doorknob, 20 kV",Meadowlark Ceramics,4.20,eur,1.5nF,±10%,20kV,0.2,C0G,32 x 18 mm,,,,,,,,,,,',
    '',
    'diode,TG-D-12K,HV stack,Basalt Semis,1.10,USD,,,,,,,12kV,20mA,2A,150ns,1.5e-8,32.7,28.3,2p,80n,,',
    'resistor,TG-R-100M,bleeder,Foxglove Resistive,,,,5 %,15kV,,,,,,,,,,,,,100meg,1',
    'diode,TG-D-NORS,no RS given,,,,,,,,,,1kV,1,,,1e-14,1.8,,,,,',
  ].join('\r\n');

  it('reads every row into SI values with its file line', () => {
    const r = ok(GOOD);
    expect(r.rejected).toEqual([]);
    expect(r.rows.map((x) => x.line)).toEqual([3, 5, 6, 7]);
    const [c, d, res, norm] = r.rows.map((x) => x.input);
    expect(c).toEqual({
      kind: 'capacitor',
      partNumber: 'TG-C-1N5-20K',
      description: 'doorknob, 20 kV',
      maker: 'Meadowlark Ceramics',
      unitCost: 4.2,
      currency: 'EUR',
      specs: { capacitanceF: 1.5e-9, tolerance: 0.1, ratedVoltageV: 20e3, esrOhm: 0.2, dielectric: 'ceramic-class1', size: '32 x 18 mm' },
    });
    expect(d).toMatchObject({ kind: 'diode', currency: 'USD', specs: { ratedPivV: 12e3, ratedAvgCurrentA: 0.02, ratedSurgeA: 2, trrS: 150e-9, model: { isA: 1.5e-8, n: 32.7, rsOhm: 28.3, cjoF: 2e-12, ttS: 80e-9 } } });
    expect(d.specs).toMatchObject({ trrS: expect.closeTo(150e-9, 20) });
    expect(res).toMatchObject({ kind: 'resistor', currency: 'EUR', specs: { resistanceOhm: 100e6, tolerance: 0.05, ratedVoltageV: 15e3, ratedPowerW: 1 } });
    expect(norm.specs).toMatchObject({ model: { isA: 1e-14, n: 1.8, rsOhm: 0 } });
  });

  it('takes semicolon- and tab-separated files', () => {
    const semi = ok('kind;part_number;resistance;power;rated_voltage\nresistor;R1;4.7k;0.25;200');
    expect(semi.rows[0].input.specs).toEqual({ resistanceOhm: 4700, ratedPowerW: 0.25, ratedVoltageV: 200 });
    const tab = ok('kind\tpart_number\tresistance\tpower\trated_voltage\nresistor\tR1\t4.7k\t0.25\t200');
    expect(tab.rows).toHaveLength(1);
  });

  it('documents every column it reads', () => {
    expect(PART_CSV_COLUMNS).toHaveLength(23);
    expect(MAX_IMPORT_ROWS).toBe(5000);
  });
});

describe('broken rows', () => {
  const H = 'kind,part_number,capacitance,tolerance,rated_voltage,dielectric,rated_piv,avg_current,is,n,resistance,power';

  it('lists every reason of a row, by line', () => {
    const r = ok([H, 'capacitor,C1,-4.7n,12,abc,paper,,,,,,', 'capacitor,C2,1n,5%,1kV,mica,10kV,,,,,'].join('\n'));
    expect(r.rows).toEqual([]);
    const [a, b] = r.rejected;
    expect(a.line).toBe(2);
    expect(a.partNumber).toBe('C1');
    expect(a.reasons).toEqual(expect.arrayContaining([expect.stringMatching(/^tolerance: .*more than 100 %/), expect.stringMatching(/^rated_voltage: "abc" is not a number/), expect.stringMatching(/^dielectric: unknown dielectric "paper"/)]));
    expect(a.reasons).toHaveLength(3);
    expect(b.reasons).toEqual(['rated_piv: does not apply to a capacitor; leave it empty']);
  });

  it('names schema refusals by their column (a negative capacitance)', () => {
    const r = ok([H, 'capacitor,C1,-4.7n,5%,1kV,mica,,,,,,'].join('\n'));
    expect(r.rejected[0].reasons).toEqual(['capacitance: must be greater than zero']);
  });

  it('unknown kind, missing part number and missing required values', () => {
    const r = ok([H, 'inductor,L1,,,,,,,,,,', 'diode,,,,,,10kV,,,,,', 'resistor,R1,,,,,,,,,1k,'].join('\n'));
    expect(r.rejected.map((x) => x.line)).toEqual([2, 3, 4]);
    expect(r.rejected[0].reasons).toEqual(['kind: unknown kind "inductor" (capacitor, diode or resistor)']);
    expect(r.rejected[1].reasons).toEqual(expect.arrayContaining(['part_number: required', 'avg_current: required for a diode', 'is: required for a diode', 'n: required for a diode']));
    expect(r.rejected[1].partNumber).toBeNull();
    expect(r.rejected[2].reasons).toEqual(['power: required for a resistor', 'rated_voltage: required for a resistor']);
  });

  it('a part number twice in the file (any case) is refused on its second line', () => {
    const r = ok([H, 'resistor,R-1,,,100,,,,,,1k,1', 'resistor,r-1,,,100,,,,,,2k,1'].join('\n'));
    expect(r.rows.map((x) => x.line)).toEqual([2]);
    expect(r.rejected).toEqual([{ line: 3, partNumber: 'r-1', reasons: ['part number r-1 is also on line 2'] }]);
  });

  it('an unclosed quote and extra cells are reasons on their line; the next line still reads', () => {
    const r = ok([H, 'resistor,"R1,,,100,,,,,,1k,1', 'resistor,R2,,,100,,,,,,1k,1,surplus', 'resistor,R3,,,100,,,,,,1k,1'].join('\n'));
    expect(r.rows.map((x) => x.line)).toEqual([4]);
    expect(r.rejected[0].reasons[0]).toMatch(/quoted cell is not closed/);
    expect(r.rejected[1].reasons[0]).toMatch(/13 cells but the header names 12/);
  });
});

describe('files refused as a whole', () => {
  const reason = (t: string) => {
    const r = parsePartsCsv(t);
    return r.ok ? 'ok' : r.reason;
  };
  it('empty, header only, unknown or repeated columns, no kind or part number', () => {
    expect(reason('')).toMatch(/empty/);
    expect(reason('\n# only a comment\n')).toMatch(/empty/);
    expect(reason('kind,part_number\n')).toMatch(/no parts/);
    expect(reason('kind,part_number,capacitence\ncapacitor,C1,1n')).toMatch(/unknown column "capacitence"/);
    expect(reason('kind,part_number,kind\nx,y,z')).toMatch(/"kind" appears twice/);
    expect(reason('part_number,capacitance\nC1,1n')).toMatch(/no "kind" column/);
    expect(reason('kind,capacitance\ncapacitor,1n')).toMatch(/no "part_number" column/);
  });

  it(`more than ${MAX_IMPORT_ROWS} rows`, () => {
    const rows = Array.from({ length: MAX_IMPORT_ROWS + 1 }, (_, i) => `resistor,R${i},1k,1,100`);
    expect(reason(['kind,part_number,resistance,power,rated_voltage', ...rows].join('\n'))).toMatch(/5001 parts; at most 5000/);
    expect(ok(['kind,part_number,resistance,power,rated_voltage', ...rows.slice(1)].join('\n')).rows).toHaveLength(MAX_IMPORT_ROWS);
  });
});
