/**
 * The parts library form and table text: engineering-notation entries become SI numbers, every
 * refused entry is named by the same dot path the server's `field` uses, a stored part fills the
 * form and reads back unchanged, and the table columns say what the part is.
 */
import { describe, expect, it } from 'vitest';
import {
  costText,
  emptyPartForm,
  filterParts,
  keyValue,
  partForm,
  partSummary,
  ratingsText,
  readPartForm,
  serverFieldKey,
  toleranceText,
  withKind,
} from '@/components/parts/part-form-model';
import type { PartInput } from '@/lib/parts/schema';

function fill(kind: 'capacitor' | 'diode' | 'resistor', values: Record<string, string>) {
  const s = emptyPartForm(kind);
  return { ...s, values: { ...s.values, ...values } };
}

describe('reading the form', () => {
  it('reads a capacitor in engineering notation into SI numbers', () => {
    const r = readPartForm(fill('capacitor', { partNumber: 'TG-C-4n7', maker: 'Bramblewood', 'specs.capacitanceF': '4.7n', 'specs.ratedVoltageV': '15k', 'specs.tolerance': '10', 'specs.esrOhm': '', unitCost: '1.25', currency: 'eur' }));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.input).toMatchObject({ kind: 'capacitor', partNumber: 'TG-C-4n7', maker: 'Bramblewood', currency: 'EUR', unitCost: 1.25 });
    expect(r.input.kind === 'capacitor' && r.input.specs).toEqual({ capacitanceF: 4.7e-9, ratedVoltageV: 15e3, tolerance: 0.1, dielectric: 'ceramic-class1' });
  });

  it('reads a diode with its model', () => {
    const r = readPartForm(
      fill('diode', { partNumber: 'TG-D-12K', 'specs.ratedPivV': '12kV', 'specs.ratedAvgCurrentA': '20m', 'specs.ratedSurgeA': '2', 'specs.model.isA': '5n', 'specs.model.n': '8', 'specs.model.rsOhm': '20', 'specs.model.cjoF': '3p' }),
    );
    expect(r.ok && r.input.kind === 'diode' && r.input.specs).toEqual({ ratedPivV: 12e3, ratedAvgCurrentA: 0.02, ratedSurgeA: 2, model: { isA: 5e-9, n: 8, rsOhm: 20, cjoF: 3e-12 } });
  });

  it('names every refused entry by its dot path', () => {
    const r = readPartForm(fill('diode', { partNumber: '', 'specs.ratedPivV': '-5', 'specs.ratedAvgCurrentA': 'lots', 'specs.model.isA': '1e-9', 'specs.model.n': '', 'specs.model.rsOhm': '0' }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(Object.keys(r.errors).sort()).toEqual(['partNumber', 'specs.model.n', 'specs.ratedAvgCurrentA', 'specs.ratedPivV']);
    expect(r.errors['specs.ratedPivV']).toBe('must be greater than zero');
    expect(r.errors['specs.model.n']).toBe('required');
  });

  it('refuses what the server schema refuses: tolerance above 100 %, a bad currency, a bad part number', () => {
    const r = readPartForm(fill('resistor', { partNumber: '-bad', currency: 'EURO', 'specs.resistanceOhm': '100meg', 'specs.ratedPowerW': '1', 'specs.ratedVoltageV': '20k', 'specs.tolerance': '150' }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors['specs.tolerance']).toBe('must be at most 1 (100 %)');
    expect(r.errors.currency).toBe('a three-letter currency code');
    expect(r.errors.partNumber).toMatch(/letters, digits/);
  });

  it('a stored part fills the form and reads back the same', () => {
    const part: PartInput = {
      kind: 'diode',
      partNumber: 'TG-D-1K2',
      description: 'fast rectifier',
      maker: 'Heronsgate',
      unitCost: 0.42,
      currency: 'EUR',
      specs: { ratedPivV: 1200, ratedAvgCurrentA: 0.5, trrS: 75e-9, model: { isA: 1.2e-9, n: 1.9, rsOhm: 0.08, bvV: 1400 } },
    };
    const form = partForm(part);
    expect(form.values['specs.ratedPivV']).toBe('1.2k');
    expect(form.values['specs.trrS']).toBe('75n');
    const r = readPartForm(form);
    expect(r.ok && r.input).toEqual(part);
    const cap: PartInput = { kind: 'capacitor', partNumber: 'C1', description: '', maker: '', currency: 'EUR', specs: { capacitanceF: 2.2e-9, tolerance: 0.05, ratedVoltageV: 10e3, dielectric: 'mica', size: '20 × 8 mm' } };
    expect(partForm(cap).values['specs.tolerance']).toBe('5');
    expect(readPartForm(partForm(cap))).toEqual({ ok: true, input: cap });
  });

  it('switching the kind keeps the common fields and clears the kind fields', () => {
    const s = withKind(fill('capacitor', { partNumber: 'X1', maker: 'M', 'specs.capacitanceF': '1n' }), 'diode');
    expect(s.kind).toBe('diode');
    expect(s.values.partNumber).toBe('X1');
    expect(s.values['specs.capacitanceF']).toBeUndefined();
    expect(s.values['specs.ratedPivV']).toBe('');
  });

  it('places a server field error on its field, or on the form when the form has no such field', () => {
    const s = emptyPartForm('capacitor');
    expect(serverFieldKey('specs.capacitanceF', s)).toBe('specs.capacitanceF');
    expect(serverFieldKey('partNumber', s)).toBe('partNumber');
    expect(serverFieldKey('specs.model.isA', s)).toBeNull();
    expect(serverFieldKey(undefined, s)).toBeNull();
  });
});

describe('table text and picker filter', () => {
  const parts: PartInput[] = [
    { kind: 'capacitor', partNumber: 'TG-C-2n2', description: 'doorknob', maker: 'Bramblewood', currency: 'EUR', unitCost: 3.5, specs: { capacitanceF: 2.2e-9, tolerance: 0.1, ratedVoltageV: 15e3, dielectric: 'ceramic-class1' } },
    { kind: 'diode', partNumber: 'TG-D-400', description: '', maker: 'Heronsgate', currency: 'EUR', specs: { ratedPivV: 400, ratedAvgCurrentA: 1, ratedSurgeA: 30, model: { isA: 1e-9, n: 1.8, rsOhm: 0.05 } } },
    { kind: 'resistor', partNumber: 'TG-R-100M', description: 'bleeder', maker: '', currency: 'EUR', unitCost: 0.125, specs: { resistanceOhm: 100e6, ratedPowerW: 1, ratedVoltageV: 20e3 } },
  ];
  it('shows the key value, ratings, tolerance and cost per kind', () => {
    expect(parts.map(keyValue)).toEqual(['2.2 nF', '400 V PIV', '100 MΩ']);
    expect(parts.map(ratingsText)).toEqual(['15 kV DC', '1 A avg · 30 A surge', '1 W · 20 kV']);
    expect(parts.map(toleranceText)).toEqual(['±10 %', '—', '—']);
    expect(parts.map(costText)).toEqual(['EUR 3.50', '—', 'EUR 0.125']);
    expect(partSummary(parts[1])).toBe('TG-D-400 · 400 V PIV · 1 A avg · 30 A surge · Heronsgate');
  });
  it('filters by kind and by part number, maker or description', () => {
    expect(filterParts(parts, 'diode', '').map((p) => p.partNumber)).toEqual(['TG-D-400']);
    expect(filterParts(parts, 'capacitor', 'door').map((p) => p.partNumber)).toEqual(['TG-C-2n2']);
    expect(filterParts(parts, 'capacitor', 'heron')).toEqual([]);
    expect(filterParts(parts, 'diode', 'HERON').length).toBe(1);
  });
});
