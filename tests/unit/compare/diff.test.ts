import { describe, expect, it } from 'vitest';
import { appendStages, halfWaveStarter, type DesignBlock, type DesignDocument } from '@/lib/circuit';
import { diffDesigns, diffFields, formatFieldValue } from '@/lib/compare';

/** Invented demo values: 1 kV peak at 20 kHz, 10 nF stages, 100 µA load. */
const O = { amplitudeV: 1000, frequencyHz: 20e3, capacitanceF: 10e-9, capacitorRatedV: 3000, loadCurrentA: 100e-6 };

function clone(doc: DesignDocument): DesignDocument {
  return structuredClone(doc);
}

function block<K extends DesignBlock['kind']>(doc: DesignDocument, id: string): Extract<DesignBlock, { kind: K }> {
  const b = doc.blocks.find((x) => x.id === id);
  if (!b) throw new Error(`no block ${id}`);
  return b as Extract<DesignBlock, { kind: K }>;
}

describe('diffDesigns', () => {
  it('finds nothing between a document and its copy with keys reordered', () => {
    const a = halfWaveStarter(3, O);
    const b2: DesignDocument = { ...clone(a), blocks: clone(a).blocks.map((x) => ({ data: x.data, position: x.position, kind: x.kind, id: x.id, label: x.label }) as DesignBlock) };
    expect(diffDesigns(a, clone(a)).identical).toBe(true);
    expect(diffDesigns(a, b2).identical).toBe(true);
  });

  it('reports a capacitor value change on the stage, field by field, with engineering units', () => {
    const a = halfWaveStarter(3, O);
    const b = clone(a);
    block<'stage'>(b, 's2').data.smoothC.capacitanceF = 22e-9;
    const d = diffDesigns(a, b);
    expect(d.identical).toBe(false);
    expect(d.changes).toHaveLength(1);
    const c = d.changes[0];
    expect(c).toMatchObject({ kind: 'changed', blockId: 's2', designator: 'Stage 2', blockKind: 'stage', category: 'part' });
    expect(c.fields).toEqual([
      { path: 'smoothC.capacitanceF', label: 'smoothing C · capacitance', before: '10 nF', after: '22 nF', beforeValue: 10e-9, afterValue: 22e-9 },
    ]);
    expect(c.summary).toBe('smoothing C · capacitance 10 nF → 22 nF');
    expect(d.wires).toEqual({ added: 0, removed: 0 });
  });

  it('reports ESR and diode model parameters added or changed', () => {
    const a = halfWaveStarter(2, O);
    const b = clone(a);
    const s1 = block<'stage'>(b, 's1');
    s1.data.pumpC = { ...s1.data.pumpC, esrOhm: 0.5 };
    s1.data.diodeB = { ...s1.data.diodeB, model: { ...s1.data.diodeB.model, rsOhm: 2 } };
    const [c] = diffDesigns(a, b).changes;
    const byPath = new Map(c.fields.map((f) => [f.path, f] as const));
    expect(byPath.get('pumpC.esrOhm')).toMatchObject({ label: 'pumping C · ESR', before: '—', after: '500 mΩ' });
    expect(byPath.get('diodeB.model.rsOhm')).toMatchObject({ label: 'diode B · model · series resistance RS', after: '2 Ω' });
    expect(c.fields).toHaveLength(2);
  });

  it('reports an added stage as added, with the wiring it brings as wire counts', () => {
    const a = halfWaveStarter(3, O);
    const grown = appendStages(a, 1);
    if (!grown.ok) throw new Error(grown.reason);
    const b = grown.document;
    const d = diffDesigns(a, b);
    const added = d.changes.filter((c) => c.kind === 'added');
    expect(added).toHaveLength(1);
    expect(added[0]).toMatchObject({ blockId: grown.added[0], blockKind: 'stage', category: 'part' });
    expect(added[0].summary).toMatch(/^added stage \(half-wave positive, pumping 10 nF, smoothing 10 nF\)$/);
    // The load moved to the new top: two wires into the new stage, one to the load changed ends.
    expect(d.wires.added).toBeGreaterThanOrEqual(2);
    expect(d.wires.removed).toBeGreaterThanOrEqual(1);
    // The load block was shifted right, which is a move and not a change of the circuit.
    expect(d.moved).toContain('load');
    expect(d.changes.some((c) => c.blockId === 'load')).toBe(false);
    // And the other way round the stage is removed.
    const back = diffDesigns(b, a);
    expect(back.changes.filter((c) => c.kind === 'removed').map((c) => c.blockId)).toEqual(grown.added);
    expect(back.wires).toEqual({ added: d.wires.removed, removed: d.wires.added });
  });

  it('reports a drive frequency change as a drive change', () => {
    const a = halfWaveStarter(2, O);
    const b = clone(a);
    block<'acSource'>(b, 'src').data.frequencyHz = 40e3;
    const [c] = diffDesigns(a, b).changes;
    expect(c).toMatchObject({ kind: 'changed', blockId: 'src', designator: 'Drive', category: 'drive' });
    expect(c.summary).toBe('frequency 20 kHz → 40 kHz');
  });

  it('reports a load change, including a change of load type', () => {
    const a = halfWaveStarter(2, O);
    const b = clone(a);
    block<'load'>(b, 'load').data = { mode: 'current', currentA: 250e-6 };
    const [c] = diffDesigns(a, b).changes;
    expect(c).toMatchObject({ kind: 'changed', blockId: 'load', designator: 'Load', category: 'load', summary: 'current 100 µA → 250 µA' });
    const r = clone(a);
    block<'load'>(r, 'load').data = { mode: 'resistor', resistanceOhm: 50e6 };
    const [t] = diffDesigns(a, r).changes;
    expect(t.fields.map((f) => [f.path, f.before, f.after])).toEqual([
      ['mode', 'current', 'resistor'],
      ['resistanceOhm', '—', '50 MΩ'],
      ['currentA', '100 µA', '—'],
    ]);
  });

  it('reports settings (bleeder, strays) separately from the blocks', () => {
    const a = halfWaveStarter(2, O);
    const b = clone(a);
    b.settings = { ...b.settings, bleederOhm: 1e9, strayCapacitanceF: 5e-12 };
    const d = diffDesigns(a, b);
    expect(d.changes).toEqual([]);
    expect(d.settings.map((f) => `${f.label}: ${f.before} → ${f.after}`)).toEqual(['stray capacitance to ground: 0 F → 5 pF', 'bleeder: — → 1 GΩ']);
  });

  it('reports a relabelled block with its old and new designator', () => {
    const a = halfWaveStarter(2, O);
    const b = clone(a);
    block<'stage'>(b, 's1').label = 'Bottom stage';
    const [c] = diffDesigns(a, b).changes;
    expect(c).toMatchObject({ kind: 'changed', designator: 'Bottom stage', summary: 'label Stage 1 → Bottom stage' });
  });
});

describe('diffFields / formatFieldValue', () => {
  it('writes SI values with prefixes and fractions as per cent', () => {
    expect(formatFieldValue('capacitanceF', 4.7e-9)).toBe('4.7 nF');
    expect(formatFieldValue('capacitanceF', 4.72e-9)).toBe('4.72 nF');
    expect(formatFieldValue('amplitudeV', 2500)).toBe('2.5 kV');
    expect(formatFieldValue('tolerance', 0.1)).toBe('10 %');
    expect(formatFieldValue('phaseDeg', 90)).toBe('90°');
    expect(formatFieldValue('n', 1.75)).toBe('1.75');
    expect(formatFieldValue('isA', 2.5e-9)).toBe('2.5 nA');
  });

  it('lists nothing for equal objects and every leaf for a missing side', () => {
    expect(diffFields({ a: { capacitanceF: 1e-9 } }, { a: { capacitanceF: 1e-9 } })).toEqual([]);
    expect(diffFields(undefined, { capacitanceF: 1e-9, esrOhm: 1 }).map((f) => f.path)).toEqual(['capacitanceF', 'esrOhm']);
  });
});
