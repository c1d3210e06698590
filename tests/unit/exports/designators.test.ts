/**
 * Designators from the document alone. The counts are the hand count of each drawing: a half-wave
 * stage holds two capacitors (pumping, smoothing) and two diodes (A, B); a full-wave stage three
 * capacitors (two pumping, one smoothing) and four diodes (common practice for the two-phase
 * ladder, Kind & Kuffel, High Voltage Engineering, 2nd ed., §2.2, from memory).
 */
import { describe, expect, it } from 'vitest';
import { fullWaveStarter, halfWaveStarter, symmetricStarter, type DesignBlock, type DesignDocument } from '@/lib/circuit';
import { compareDesignators, designateParts, designatorMap, stageOrder } from '@/lib/circuit/document/designators';

const O = { amplitudeV: 1000, frequencyHz: 10_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 };

describe('designateParts', () => {
  it('a 3-stage half-wave ladder has C1–C6 and D1–D6, bottom stage first, pumping before smoothing', () => {
    const parts = designateParts(halfWaveStarter(3, O));
    expect(parts.map((p) => p.designator)).toEqual(['C1', 'C2', 'C3', 'C4', 'C5', 'C6', 'D1', 'D2', 'D3', 'D4', 'D5', 'D6']);
    const m = designatorMap(halfWaveStarter(3, O));
    expect(m.get('s1:pumpC')).toBe('C1');
    expect(m.get('s1:smoothC')).toBe('C2');
    expect(m.get('s3:smoothC')).toBe('C6');
    expect(m.get('s1:diodeA')).toBe('D1');
    expect(m.get('s2:diodeB')).toBe('D4');
  });

  it('a 2-stage full-wave ladder has 6 capacitors and 8 diodes in column order', () => {
    const m = designatorMap(fullWaveStarter(2, O));
    expect([...m.values()].filter((d) => d.startsWith('C'))).toHaveLength(6);
    expect([...m.values()].filter((d) => d.startsWith('D'))).toHaveLength(8);
    expect(m.get('s1:pumpC')).toBe('C1');
    expect(m.get('s1:pump2C')).toBe('C2');
    expect(m.get('s1:smoothC')).toBe('C3');
    expect(m.get('s1:diodeD')).toBe('D4');
    expect(m.get('s2:diodeA')).toBe('D5');
  });

  it('a symmetric pair numbers the upper (positive) ladder first, then the lower one', () => {
    const m = designatorMap(symmetricStarter(2, O));
    expect(m.get('p1:pumpC')).toBe('C1');
    expect(m.get('p2:smoothC')).toBe('C4');
    expect(m.get('m1:pumpC')).toBe('C5');
    expect(m.get('m2:diodeB')).toBe('D8');
  });

  it('follows the wires, not the block order or the x position, and numbers single parts after the stages', () => {
    const doc = halfWaveStarter(3, O);
    // stage blocks listed backwards and stage 3 dragged to the far left: the chain still starts at s1
    const s3 = doc.blocks.find((b) => b.id === 's3') as DesignBlock;
    const shuffled: DesignDocument = { ...doc, blocks: [...doc.blocks].reverse().map((b) => (b === s3 ? { ...b, position: { x: -900, y: b.position.y } } : b)) };
    expect(stageOrder(shuffled).map((s) => s.id)).toEqual(['s1', 's2', 's3']);
    shuffled.blocks.push(
      { id: 'rb', kind: 'resistor', position: { x: 0, y: 900 }, data: { resistanceOhm: 1e9, ratedPowerW: 1, ratedVoltageV: 10_000 } },
      { id: 'cx', kind: 'capacitor', position: { x: 50, y: 800 }, data: { capacitanceF: 1e-9 } },
      { id: 'cw', kind: 'capacitor', position: { x: 10, y: 800 }, data: { capacitanceF: 1e-9 } },
    );
    const m = designatorMap(shuffled);
    expect(m.get('cw')).toBe('C7');
    expect(m.get('cx')).toBe('C8');
    expect(m.get('rb')).toBe('R1');
  });

  it('is stable: the same document gives the same designators', () => {
    const doc = halfWaveStarter(5, O);
    expect(designateParts(structuredClone(doc)).map((p) => p.designator)).toEqual(designateParts(doc).map((p) => p.designator));
  });

  it('sorts designators naturally', () => {
    expect(['C10', 'C2', 'D1', 'C1', 'R3'].sort(compareDesignators)).toEqual(['C1', 'C2', 'C10', 'D1', 'R3']);
  });
});
