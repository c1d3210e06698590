/** The designs-list summary of a document, on the starter ladders (whose shape is known by construction). */
import { describe, expect, it } from 'vitest';
import { fullWaveStarter, halfWaveStarter, symmetricStarter } from '@/lib/circuit/document/starters';
import { summariseTopology } from '@/lib/data/topology';

const o = { amplitudeV: 1000, frequencyHz: 50_000, capacitanceF: 1e-9, loadCurrentA: 1e-4 };

describe('summariseTopology', () => {
  it('names the starters and counts stages per ladder', () => {
    expect(summariseTopology(halfWaveStarter(5, o))).toEqual({ topology: 'half-wave', stages: 5 });
    expect(summariseTopology(halfWaveStarter(2, { ...o, polarity: 'negative' }))).toEqual({ topology: 'half-wave', stages: 2 });
    expect(summariseTopology(fullWaveStarter(3, o))).toEqual({ topology: 'full-wave', stages: 3 });
    expect(summariseTopology(symmetricStarter(4, o))).toEqual({ topology: 'symmetric', stages: 4 });
  });

  it('gives null for a document that does not compile', () => {
    const empty = { ...halfWaveStarter(1, o), blocks: [], wires: [] };
    expect(summariseTopology(empty)).toEqual({ topology: null, stages: null });
    const unwired = halfWaveStarter(3, o);
    unwired.wires = unwired.wires.filter((w) => w.target !== 's2' && w.source !== 's2');
    expect(summariseTopology(unwired).topology).not.toBe('half-wave');
  });
});
