/** The designs-list summary of a document, on the starter ladders (whose shape is known by construction). */
import { describe, expect, it } from 'vitest';
import { fullWaveStarter, halfWaveStarter, symmetricStarter } from '@/lib/circuit/document/starters';
import { summariseTopology } from '@/lib/data/topology';

const o = { amplitudeV: 1000, frequencyHz: 50_000, capacitanceF: 1e-9 };

describe('summariseTopology', () => {
  it('names the starters and counts stages per ladder', () => {
    expect(summariseTopology(halfWaveStarter(5, o))).toEqual({ topology: 'half-wave', stages: 5 });
    expect(summariseTopology(halfWaveStarter(2, { ...o, polarity: 'negative' }))).toEqual({ topology: 'half-wave', stages: 2 });
    expect(summariseTopology(fullWaveStarter(3, o))).toEqual({ topology: 'full-wave', stages: 3 });
    expect(summariseTopology(symmetricStarter(4, o))).toEqual({ topology: 'symmetric', stages: 4 });
  });

  it('gives null for a document without stages and custom for mixtures', () => {
    const empty = { ...halfWaveStarter(1, o), blocks: [], wires: [] };
    expect(summariseTopology(empty)).toEqual({ topology: null, stages: null });
    const mixed = halfWaveStarter(2, o);
    const full = fullWaveStarter(1, o).blocks.find((b) => b.kind === 'stage')!;
    mixed.blocks.push({ ...full, id: 'extra' });
    expect(summariseTopology(mixed)).toEqual({ topology: 'custom', stages: 3 });
  });
});
