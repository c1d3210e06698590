import { describe, expect, it } from 'vitest';
import { fullWaveStarter, halfWaveStarter, symmetricStarter } from '@/lib/circuit/document/starters';
import { summariseDocument } from '@/lib/client/document-summary';

const o = { amplitudeV: 2500, frequencyHz: 20_000, capacitanceF: 10e-9 };

// Part counts per stage are those of the Cockcroft–Walton ladder as drawn in the schema header:
// a half-wave stage has one pumping and one smoothing capacitor and two diodes; a full-wave stage
// adds a second pumping capacitor and two more diodes (common practice).
describe('summariseDocument', () => {
  it('counts a half-wave ladder: 2 capacitors and 2 diodes per stage', () => {
    const s = summariseDocument(halfWaveStarter(4, o));
    expect(s).toMatchObject({ stageCount: 4, positiveStages: 4, negativeStages: 0, halfStages: 4, fullStages: 0, capacitors: 8, diodes: 8, resistors: 0 });
    expect(s.drive).toEqual({ variant: 'single', amplitudeV: 2500, amplitudeMode: 'peak', frequencyHz: 20_000, sourceResistanceOhm: 0 });
    expect(s.capacitancesF).toEqual([10e-9]);
    expect(s.load).toEqual({ mode: 'current', currentA: 0 });
  });

  it('counts a full-wave ladder: 3 capacitors and 4 diodes per stage, centre-tapped drive', () => {
    const s = summariseDocument(fullWaveStarter(3, { ...o, polarity: 'negative', loadResistanceOhm: 1e6 }));
    expect(s).toMatchObject({ stageCount: 3, negativeStages: 3, fullStages: 3, capacitors: 9, diodes: 12 });
    expect(s.drive?.variant).toBe('centreTapped');
    expect(s.load).toEqual({ mode: 'resistor', resistanceOhm: 1e6 });
  });

  it('counts both ladders of a symmetric pair', () => {
    const s = summariseDocument(symmetricStarter(5, o));
    expect(s).toMatchObject({ stageCount: 10, positiveStages: 5, negativeStages: 5, capacitors: 20, diodes: 20 });
  });

  it('counts discrete parts and reports settings', () => {
    const doc = halfWaveStarter(1, { ...o, bleederOhm: 100e6, strayCapacitanceF: 2e-12 });
    doc.blocks.push(
      { id: 'c9', kind: 'capacitor', position: { x: 0, y: 0 }, data: { capacitanceF: 1e-6 } },
      { id: 'd9', kind: 'diode', position: { x: 0, y: 0 }, data: { model: { isA: 1e-14, n: 1, rsOhm: 0 } } },
      { id: 'r9', kind: 'resistor', position: { x: 0, y: 0 }, data: { resistanceOhm: 1000 } },
    );
    const s = summariseDocument(doc);
    expect(s).toMatchObject({ capacitors: 3, diodes: 3, resistors: 1, bleederOhm: 100e6, strayCapacitanceF: 2e-12 });
    expect(s.capacitancesF).toEqual([10e-9, 1e-6]);
    expect(s.blockCount).toBe(doc.blocks.length);
    expect(s.wireCount).toBe(doc.wires.length);
  });
});
