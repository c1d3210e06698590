/**
 * Binding a design's part to a library part: the values are copied exactly (so the engine and a
 * stored revision use them whatever the library does later), the part id is recorded, a library
 * change shows as drift, a hand edit of a copied value drops the binding, and through the editor
 * store a bind is one undo step.
 */
import { describe, expect, it } from 'vitest';
import { designBlockSchema, halfWaveStarter, fullWaveStarter, type CapacitorSpec, type DesignBlock, type DiodeSpec } from '@/lib/circuit';
import {
  bindCapacitor,
  bindDiode,
  bindResistor,
  bindRole,
  bindingDrift,
  diodeLabel,
  keepBindingAfterEdit,
  partRolesOf,
  specAt,
  unbind,
  unbindRole,
  type PartOf,
} from '@/lib/parts/binding';
import { createEditorStore } from '@/lib/editor/store';

// Invented demo parts (no catalogue parts).
const CAP: PartOf<'capacitor'> = {
  id: 'p-cap-1',
  kind: 'capacitor',
  partNumber: 'TG-C-4n7-10k',
  specs: { capacitanceF: 4.7e-9, tolerance: 0.1, ratedVoltageV: 10_000, esrOhm: 0.4, dielectric: 'ceramic-class1' },
};
const DIODE: PartOf<'diode'> = {
  id: 'p-d-1',
  kind: 'diode',
  partNumber: 'TG-D-400',
  specs: { ratedPivV: 400, ratedAvgCurrentA: 0.5, ratedSurgeA: 15, trrS: 5e-7, model: { isA: 1e-9, n: 1.9, rsOhm: 0.08, cjoF: 20e-12, ttS: 1e-7 } },
};
const RES: PartOf<'resistor'> = {
  id: 'p-r-1',
  kind: 'resistor',
  partNumber: 'TG-R-100M',
  specs: { resistanceOhm: 100e6, tolerance: 0.01, ratedPowerW: 1, ratedVoltageV: 20_000 },
};

const O = { amplitudeV: 1000, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 1e-4, capacitorRatedV: 3000 };
const stageOf = (doc: { blocks: DesignBlock[] }, id = 's1') => doc.blocks.find((b) => b.id === id) as Extract<DesignBlock, { kind: 'stage' }>;

describe('binding copies the library values and the id', () => {
  it('capacitor: capacitance, tolerance, rated voltage, ESR and partId', () => {
    const spec: CapacitorSpec = { capacitanceF: 1e-6, ratedVoltageV: 3000 };
    const bound = bindCapacitor(spec, CAP);
    expect(bound).toEqual({ capacitanceF: 4.7e-9, tolerance: 0.1, ratedVoltageV: 10_000, esrOhm: 0.4, partId: 'p-cap-1' });
    expect(spec).toEqual({ capacitanceF: 1e-6, ratedVoltageV: 3000 });
  });

  it('removes a value the library part leaves out (the copy is exact)', () => {
    const noEsr: PartOf<'capacitor'> = { ...CAP, specs: { ...CAP.specs, esrOhm: undefined } };
    expect('esrOhm' in bindCapacitor({ capacitanceF: 1e-6, esrOhm: 2 }, noEsr)).toBe(false);
    const noSurge: PartOf<'diode'> = { ...DIODE, specs: { ...DIODE.specs, ratedSurgeA: undefined } };
    expect('ratedSurgeA' in bindDiode({ model: { isA: 1e-12, n: 1, rsOhm: 0 }, ratedSurgeA: 50 }, noSurge)).toBe(false);
  });

  it('diode: the whole model, PIV, average and surge ratings, and partId; the model is a copy', () => {
    const spec: DiodeSpec = { model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05, bvV: 1200 }, ratedPivV: 1000, ratedAvgCurrentA: 1 };
    const bound = bindDiode(spec, DIODE);
    expect(bound).toEqual({ model: { isA: 1e-9, n: 1.9, rsOhm: 0.08, cjoF: 20e-12, ttS: 1e-7 }, ratedPivV: 400, ratedAvgCurrentA: 0.5, ratedSurgeA: 15, partId: 'p-d-1' });
    expect(bound.model).not.toBe(DIODE.specs.model);
  });

  it('resistor: resistance, power and voltage ratings, and partId', () => {
    expect(bindResistor({ resistanceOhm: 1e3 }, RES)).toEqual({ resistanceOhm: 100e6, ratedPowerW: 1, ratedVoltageV: 20_000, partId: 'p-r-1' });
  });

  it('gives blocks the schema still accepts', () => {
    const doc = fullWaveStarter(1, O);
    let s = stageOf(doc) as DesignBlock;
    for (const role of partRolesOf(s)) {
      const r = bindRole(s, role, role.endsWith('C') && !role.startsWith('diode') ? CAP : DIODE);
      expect(r.ok).toBe(true);
      if (r.ok) s = r.block;
    }
    expect(designBlockSchema.safeParse(s).success).toBe(true);
    expect(partRolesOf(s)).toEqual(['pumpC', 'smoothC', 'pump2C', 'diodeA', 'diodeB', 'diodeC', 'diodeD']);
    expect(specAt(s, 'diodeD')?.partId).toBe('p-d-1');
    expect(specAt(s, 'pump2C')?.partId).toBe('p-cap-1');
  });
});

describe('roles and kinds', () => {
  it('refuses a part of the wrong kind and leaves the block alone', () => {
    const s = stageOf(halfWaveStarter(1, O));
    const r = bindRole(s, 'pumpC', DIODE);
    expect(r).toEqual({ ok: false, reason: 'TG-D-400 is a diode; this place takes a capacitor' });
    expect(bindRole(s, 'pump2C', CAP).ok).toBe(false);
  });

  it('binds a single part block', () => {
    const block: DesignBlock = { id: 'r1', kind: 'resistor', position: { x: 0, y: 0 }, data: { resistanceOhm: 1e3 } };
    expect(partRolesOf(block)).toEqual(['resistor']);
    const r = bindRole(block, 'resistor', RES);
    expect(r.ok && r.block.kind === 'resistor' && r.block.data).toEqual({ resistanceOhm: 100e6, ratedPowerW: 1, ratedVoltageV: 20_000, partId: 'p-r-1' });
    expect(partRolesOf({ id: 'g', kind: 'ground', position: { x: 0, y: 0 }, data: {} })).toEqual([]);
  });
});

describe('unbinding and hand edits', () => {
  it('unbind keeps the values and drops only partId', () => {
    const bound = bindDiode({ model: { isA: 1e-12, n: 1, rsOhm: 0 } }, DIODE);
    const { partId: _p, ...values } = bound;
    expect(unbind(bound)).toEqual(values);
    const s = stageOf(halfWaveStarter(1, O));
    const r = bindRole(s, 'diodeB', DIODE);
    if (!r.ok) throw new Error(r.reason);
    const un = unbindRole(r.block, 'diodeB');
    expect(specAt(un, 'diodeB')?.partId).toBeUndefined();
    expect(specAt(un, 'diodeB')).toEqual(values);
    expect(unbindRole(s, 'diodeA')).toBe(s);
  });

  it('a hand edit of a copied value drops the binding; an unchanged value keeps it', () => {
    const bound = bindCapacitor({ capacitanceF: 1e-6 }, CAP);
    expect(keepBindingAfterEdit('capacitor', bound, { ...bound, capacitanceF: 10e-9 }).partId).toBeUndefined();
    expect(keepBindingAfterEdit('capacitor', bound, { ...bound }).partId).toBe('p-cap-1');
    const d = bindDiode({ model: { isA: 1e-12, n: 1, rsOhm: 0 } }, DIODE);
    expect(keepBindingAfterEdit('diode', d, { ...d, model: { ...d.model, n: 2 } }).partId).toBeUndefined();
    expect(keepBindingAfterEdit('diode', d, { ...d, ratedSurgeA: undefined }).partId).toBeUndefined();
    // An unbound part is returned as edited.
    const free: CapacitorSpec = { capacitanceF: 1e-6 };
    const next = { capacitanceF: 2e-6 };
    expect(keepBindingAfterEdit('capacitor', free, next)).toBe(next);
  });
});

describe('drift: the library part changed after binding', () => {
  it('is empty right after binding and names each value that changed since', () => {
    const bound = bindDiode({ model: { isA: 1e-12, n: 1, rsOhm: 0 } }, DIODE);
    expect(bindingDrift(bound, DIODE)).toEqual([]);
    const changed: PartOf<'diode'> = { ...DIODE, specs: { ...DIODE.specs, ratedPivV: 600, model: { ...DIODE.specs.model, rsOhm: 0.1 } } };
    expect(bindingDrift(bound, changed)).toEqual([
      { path: 'model.rsOhm', label: 'RS', design: 0.08, library: 0.1 },
      { path: 'ratedPivV', label: 'rated PIV', design: 400, library: 600 },
    ]);
    // Refreshing copies the new values: in step again.
    expect(bindingDrift(bindDiode(bound, changed), changed)).toEqual([]);
  });

  it('ignores library fields binding does not copy (dielectric, size, trr)', () => {
    const bound = bindCapacitor({ capacitanceF: 1e-6 }, CAP);
    expect(bindingDrift(bound, { ...CAP, specs: { ...CAP.specs, dielectric: 'mica', size: '20 mm' } })).toEqual([]);
    expect(bindingDrift(bound, { ...CAP, specs: { ...CAP.specs, esrOhm: undefined } }).map((d) => d.path)).toEqual(['esrOhm']);
  });
});

describe('through the editor store', () => {
  it('a bind is one undo step, and undo brings the old values back', () => {
    const doc = halfWaveStarter(2, O);
    const store = createEditorStore({ document: doc, readOnly: false });
    const r = bindRole(stageOf(doc, 's2'), 'diodeA', DIODE);
    if (!r.ok) throw new Error(r.reason);
    expect(store.getState().updateBlock(r.block).ok).toBe(true);
    const s = store.getState();
    expect(s.version).toBe(1);
    expect(s.past).toHaveLength(1);
    expect(stageOf(s.document, 's2').data.diodeA).toMatchObject({ partId: 'p-d-1', ratedPivV: 400 });
    s.undo();
    expect(stageOf(store.getState().document, 's2').data.diodeA).toEqual(stageOf(doc, 's2').data.diodeA);
    store.getState().redo();
    expect(stageOf(store.getState().document, 's2').data.diodeA.partId).toBe('p-d-1');
  });

  it('a read-only editor refuses the bind', () => {
    const doc = halfWaveStarter(1, O);
    const store = createEditorStore({ document: doc, readOnly: true });
    const r = bindRole(stageOf(doc), 'pumpC', CAP);
    if (!r.ok) throw new Error(r.reason);
    expect(store.getState().updateBlock(r.block).ok).toBe(false);
    expect(store.getState().document).toBe(doc);
  });
});

describe('diodeLabel (a single diode on the canvas)', () => {
  const numbers = new Map([['0b0e0000-0000-4000-8000-000000000001', 'TGD-1K0-1A']]);
  const lookup = (id: string) => numbers.get(id);
  it('shows the bound part number, else the rated PIV, never the raw part id', () => {
    expect(diodeLabel({ partId: '0b0e0000-0000-4000-8000-000000000001', ratedPivV: 1000 }, lookup)).toBe('TGD-1K0-1A');
    expect(diodeLabel({ partId: 'ffffffff-0000-4000-8000-000000000009', ratedPivV: 12_000 }, lookup)).toBe('12 kV PIV');
    expect(diodeLabel({ partId: 'ffffffff-0000-4000-8000-000000000009' }, lookup)).toBeUndefined();
    expect(diodeLabel({ ratedPivV: 400 }, lookup)).toBe('400 V PIV');
  });
});
