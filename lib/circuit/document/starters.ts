/**
 * Starter ladders: build a complete canvas document for a half-wave, full-wave or symmetric
 * (bipolar) ladder of n stages in one call. Used by the editor's "start from" action, the demo
 * data and the tests. The diode defaults are a generic small silicon rectifier (invented
 * demo values, not a catalogue part).
 */
import {
  DOCUMENT_SCHEMA_VERSION,
  type CapacitorSpec,
  type DesignBlock,
  type DesignDocument,
  type DiodeSpec,
  type Wire,
} from './schema';

export interface StarterOptions {
  /** Drive amplitude (V), read as peak or RMS per `amplitudeMode`. */
  amplitudeV: number;
  amplitudeMode?: 'peak' | 'rms';
  frequencyHz: number;
  /** Capacitance of every stage capacitor (F). */
  capacitanceF: number;
  capacitorRatedV?: number;
  diode?: DiodeSpec;
  /** DC load current (A); mutually exclusive with `loadResistanceOhm`. Default: no load (0 A). */
  loadCurrentA?: number;
  loadResistanceOhm?: number;
  sourceResistanceOhm?: number;
  strayCapacitanceF?: number;
  bleederOhm?: number;
  /** Output polarity of a half-wave or full-wave ladder. */
  polarity?: 'positive' | 'negative';
}

/** Generic small silicon rectifier (demo values). */
export const GENERIC_DIODE: DiodeSpec = {
  model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 },
  ratedPivV: 1000,
  ratedAvgCurrentA: 1,
};

const STAGE_DX = 220;
const STAGE_Y = 120;

function cap(o: StarterOptions): CapacitorSpec {
  return { capacitanceF: o.capacitanceF, ...(o.capacitorRatedV ? { ratedVoltageV: o.capacitorRatedV } : {}) };
}

class Builder {
  blocks: DesignBlock[] = [];
  wires: Wire[] = [];
  private wireCount = 0;
  wire(source: string, sourcePort: string, target: string, targetPort: string): void {
    this.wireCount += 1;
    this.wires.push({ id: `w${this.wireCount}`, source, sourcePort, target, targetPort });
  }
  load(o: StarterOptions, id: string, x: number, y: number): DesignBlock {
    const data =
      o.loadResistanceOhm !== undefined
        ? { mode: 'resistor' as const, resistanceOhm: o.loadResistanceOhm }
        : { mode: 'current' as const, currentA: o.loadCurrentA ?? 0 };
    const block: DesignBlock = { id, kind: 'load', position: { x, y }, label: 'Load', data };
    this.blocks.push(block);
    return block;
  }
  doc(o: StarterOptions): DesignDocument {
    return {
      schemaVersion: DOCUMENT_SCHEMA_VERSION,
      blocks: this.blocks,
      wires: this.wires,
      settings: {
        strayCapacitanceF: o.strayCapacitanceF ?? 0,
        deratingFraction: 0.8,
        ...(o.bleederOhm ? { bleederOhm: o.bleederOhm } : {}),
      },
    };
  }
}

function stageBlock(
  id: string,
  o: StarterOptions,
  variant: 'half' | 'full',
  polarity: 'positive' | 'negative',
  x: number,
  y: number,
  labelText: string,
): DesignBlock {
  const d = o.diode ?? GENERIC_DIODE;
  return {
    id,
    kind: 'stage',
    position: { x, y },
    label: labelText,
    data: {
      variant,
      polarity,
      pumpC: cap(o),
      smoothC: cap(o),
      diodeA: d,
      diodeB: d,
      ...(variant === 'full' ? { pump2C: cap(o), diodeC: d, diodeD: d } : {}),
    },
  };
}

function source(o: StarterOptions, variant: 'single' | 'centreTapped'): DesignBlock {
  return {
    id: 'src',
    kind: 'acSource',
    position: { x: 0, y: STAGE_Y },
    label: 'Drive',
    data: {
      variant,
      amplitudeV: o.amplitudeV,
      amplitudeMode: o.amplitudeMode ?? 'peak',
      frequencyHz: o.frequencyHz,
      phaseDeg: 0,
      sourceResistanceOhm: o.sourceResistanceOhm ?? 0,
    },
  };
}

function ground(b: Builder): void {
  b.blocks.push({ id: 'gnd', kind: 'ground', position: { x: 0, y: STAGE_Y + 200 }, label: 'Ground', data: {} });
}

/** Half-wave (single-phase) ladder of `n` stages fed from one AC source. */
export function halfWaveStarter(n: number, o: StarterOptions): DesignDocument {
  assertStages(n);
  const b = new Builder();
  b.blocks.push(source(o, 'single'));
  ground(b);
  b.wire('src', 'ret', 'gnd', 'g');
  const pol = o.polarity ?? 'positive';
  let prev: { id: string; x: string; y: string } = { id: 'src', x: 'hot', y: '' };
  for (let k = 1; k <= n; k++) {
    const id = `s${k}`;
    b.blocks.push(stageBlock(id, o, 'half', pol, 200 + (k - 1) * STAGE_DX, STAGE_Y, `Stage ${k}`));
    b.wire(prev.id, prev.x, id, 'xIn');
    if (k === 1) b.wire('gnd', 'g', id, 'yIn');
    else b.wire(prev.id, 'yOut', id, 'yIn');
    prev = { id, x: 'xOut', y: 'yOut' };
  }
  b.load(o, 'load', 200 + n * STAGE_DX, STAGE_Y + 100);
  b.wire(`s${n}`, 'yOut', 'load', 'a');
  b.wire('load', 'b', 'gnd', 'g');
  return b.doc(o);
}

/** Full-wave (symmetrical, two-phase) ladder: centre-tapped drive, two pumping columns, one smoothing column. */
export function fullWaveStarter(n: number, o: StarterOptions): DesignDocument {
  assertStages(n);
  const b = new Builder();
  b.blocks.push(source(o, 'centreTapped'));
  ground(b);
  b.wire('src', 'ct', 'gnd', 'g');
  const pol = o.polarity ?? 'positive';
  for (let k = 1; k <= n; k++) {
    const id = `s${k}`;
    b.blocks.push(stageBlock(id, o, 'full', pol, 200 + (k - 1) * STAGE_DX, STAGE_Y, `Stage ${k}`));
    if (k === 1) {
      b.wire('src', 'hot', id, 'xIn');
      b.wire('src', 'hotB', id, 'x2In');
      b.wire('gnd', 'g', id, 'yIn');
    } else {
      b.wire(`s${k - 1}`, 'xOut', id, 'xIn');
      b.wire(`s${k - 1}`, 'x2Out', id, 'x2In');
      b.wire(`s${k - 1}`, 'yOut', id, 'yIn');
    }
  }
  b.load(o, 'load', 200 + n * STAGE_DX, STAGE_Y + 100);
  b.wire(`s${n}`, 'yOut', 'load', 'a');
  b.wire('load', 'b', 'gnd', 'g');
  return b.doc(o);
}

/**
 * Symmetric (bipolar) pair: a positive and a negative half-wave ladder of `n` stages each, fed
 * in phase from one AC source about a common ground; the load sits across the two outputs.
 */
export function symmetricStarter(n: number, o: StarterOptions): DesignDocument {
  assertStages(n);
  const b = new Builder();
  b.blocks.push(source(o, 'single'));
  ground(b);
  b.wire('src', 'ret', 'gnd', 'g');
  for (const [prefix, pol, y] of [
    ['p', 'positive', STAGE_Y - 160],
    ['m', 'negative', STAGE_Y + 260],
  ] as const) {
    for (let k = 1; k <= n; k++) {
      const id = `${prefix}${k}`;
      b.blocks.push(stageBlock(id, o, 'half', pol, 200 + (k - 1) * STAGE_DX, y, `${pol === 'positive' ? '+' : '−'} stage ${k}`));
      if (k === 1) {
        b.wire('src', 'hot', id, 'xIn');
        b.wire('gnd', 'g', id, 'yIn');
      } else {
        b.wire(`${prefix}${k - 1}`, 'xOut', id, 'xIn');
        b.wire(`${prefix}${k - 1}`, 'yOut', id, 'yIn');
      }
    }
  }
  b.load(o, 'load', 200 + n * STAGE_DX, STAGE_Y + 50);
  b.wire(`p${n}`, 'yOut', 'load', 'a');
  b.wire('load', 'b', `m${n}`, 'yOut');
  return b.doc(o);
}

function assertStages(n: number): void {
  if (!Number.isInteger(n) || n < 1 || n > 200) throw new RangeError(`stage count must be an integer 1..200, got ${n}`);
}
