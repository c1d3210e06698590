/**
 * The tray: the blocks a designer drags onto the canvas, with the values a fresh block starts
 * from, and the id helpers the editor uses when it adds blocks and wires. Default values are
 * invented demo values (a generic high-voltage rectifier and film capacitors of the "Tallgrass
 * Instruments" demo), not catalogue parts.
 */
import { DOCUMENT_SCHEMA_VERSION, type CapacitorSpec, type DesignBlock, type DesignDocument, type DiodeSpec } from './schema';

/** Keys of the tray's items (also the `tray-<key>` test ids). */
export type TrayItemKey =
  | 'ac-source'
  | 'ac-source-ct'
  | 'stage-half-pos'
  | 'stage-half-neg'
  | 'stage-full-pos'
  | 'stage-full-neg'
  | 'load-resistor'
  | 'load-current'
  | 'ground'
  | 'capacitor'
  | 'diode'
  | 'resistor';

/** One tray entry: what it is called, a one-line hint, and the tray group it is listed under. */
export interface TrayItem {
  key: TrayItemKey;
  label: string;
  hint: string;
  group: 'drive' | 'ladder' | 'load' | 'parts';
}

/** Everything the tray offers, in display order. */
export const TRAY_ITEMS: TrayItem[] = [
  { key: 'ac-source', label: 'AC drive', hint: 'Sine drive with one hot output and a return', group: 'drive' },
  { key: 'ac-source-ct', label: 'Two-phase drive', hint: 'Centre-tapped sine drive: two hot outputs in antiphase, for full-wave ladders', group: 'drive' },
  { key: 'stage-half-pos', label: 'Stage, half-wave +', hint: 'Two capacitors and two diodes; output rises above ground', group: 'ladder' },
  { key: 'stage-half-neg', label: 'Stage, half-wave −', hint: 'Two capacitors and two diodes, diodes reversed; output falls below ground', group: 'ladder' },
  { key: 'stage-full-pos', label: 'Stage, full-wave +', hint: 'Two driven columns and one smoothing column; pumps on both half-cycles', group: 'ladder' },
  { key: 'stage-full-neg', label: 'Stage, full-wave −', hint: 'Full-wave stage with reversed diodes; negative output', group: 'ladder' },
  { key: 'load-resistor', label: 'Resistive load', hint: 'Resistance across the output', group: 'load' },
  { key: 'load-current', label: 'Current load', hint: 'Constant DC current drawn from the output', group: 'load' },
  { key: 'ground', label: 'Ground', hint: 'The 0 V reference node', group: 'load' },
  { key: 'capacitor', label: 'Capacitor', hint: 'A single capacitor for shapes that are not a plain ladder', group: 'parts' },
  { key: 'diode', label: 'Diode', hint: 'A single rectifier diode', group: 'parts' },
  { key: 'resistor', label: 'Resistor', hint: 'A single resistor', group: 'parts' },
];

/** Default rectifier of a new stage or diode block (invented demo values; PIV rating 3 kV). */
export const TRAY_DIODE: DiodeSpec = {
  model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 },
  ratedPivV: 3000,
  ratedAvgCurrentA: 0.5,
};

/** Default stage capacitor: 10 nF rated 3 kV (invented demo values). */
export const TRAY_CAPACITOR: CapacitorSpec = { capacitanceF: 10e-9, ratedVoltageV: 3000 };

/** Default drive of a new source block: 1 kV peak at 20 kHz (a small inverter, demo values). */
export const TRAY_DRIVE = { amplitudeV: 1000, frequencyHz: 20_000 } as const;

/** Default resistive load (ohm) and current load (A). */
export const TRAY_LOAD = { resistanceOhm: 100e6, currentA: 50e-6 } as const;

const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/**
 * A new block for a tray item, at `position` (canvas px, top-left). With `like`, a new stage copies
 * its capacitors and diodes from the document's last stage (the newest, so a ladder grows with the
 * values its designer chose) and a new drive copies amplitude, frequency and source resistance
 * from the document's first AC source; otherwise the tray defaults are used.
 */
export function createBlock(item: TrayItemKey, id: string, position: { x: number; y: number }, like?: DesignDocument): DesignBlock {
  const at = { x: position.x, y: position.y };
  switch (item) {
    case 'ac-source':
    case 'ac-source-ct': {
      const other = like?.blocks.find((b): b is Extract<DesignBlock, { kind: 'acSource' }> => b.kind === 'acSource');
      const base = other
        ? { amplitudeV: other.data.amplitudeV, amplitudeMode: other.data.amplitudeMode, frequencyHz: other.data.frequencyHz, sourceResistanceOhm: other.data.sourceResistanceOhm ?? 0 }
        : { amplitudeV: TRAY_DRIVE.amplitudeV, amplitudeMode: 'peak' as const, frequencyHz: TRAY_DRIVE.frequencyHz, sourceResistanceOhm: 0 };
      return {
        id,
        kind: 'acSource',
        position: at,
        label: item === 'ac-source' ? 'Drive' : 'Two-phase drive',
        data: { variant: item === 'ac-source' ? 'single' : 'centreTapped', ...base, phaseDeg: 0 },
      };
    }
    case 'stage-half-pos':
    case 'stage-half-neg':
    case 'stage-full-pos':
    case 'stage-full-neg': {
      const variant = item.startsWith('stage-full') ? 'full' : 'half';
      const polarity = item.endsWith('-neg') ? 'negative' : 'positive';
      const stages = (like?.blocks ?? []).filter((b): b is Extract<DesignBlock, { kind: 'stage' }> => b.kind === 'stage');
      const source = stages.filter((s) => s.data.polarity === polarity).pop() ?? stages.pop();
      const d = source?.data;
      const pumpC = clone(d?.pumpC ?? TRAY_CAPACITOR);
      const smoothC = clone(d?.smoothC ?? TRAY_CAPACITOR);
      const diodeA = clone(d?.diodeA ?? TRAY_DIODE);
      const diodeB = clone(d?.diodeB ?? TRAY_DIODE);
      const count = stages.filter((s) => s.data.polarity === polarity).length + 1;
      return {
        id,
        kind: 'stage',
        position: at,
        label: `${polarity === 'positive' ? 'Stage' : '− stage'} ${count}`,
        data: {
          variant,
          polarity,
          pumpC,
          smoothC,
          diodeA,
          diodeB,
          ...(variant === 'full'
            ? { pump2C: clone(d?.pump2C ?? pumpC), diodeC: clone(d?.diodeC ?? diodeA), diodeD: clone(d?.diodeD ?? diodeB) }
            : {}),
        },
      };
    }
    case 'load-resistor':
      return { id, kind: 'load', position: at, label: 'Load', data: { mode: 'resistor', resistanceOhm: TRAY_LOAD.resistanceOhm } };
    case 'load-current':
      return { id, kind: 'load', position: at, label: 'Load', data: { mode: 'current', currentA: TRAY_LOAD.currentA } };
    case 'ground':
      return { id, kind: 'ground', position: at, label: 'Ground', data: {} };
    case 'capacitor':
      return { id, kind: 'capacitor', position: at, label: 'Capacitor', data: clone(TRAY_CAPACITOR) };
    case 'diode':
      return { id, kind: 'diode', position: at, label: 'Diode', data: clone(TRAY_DIODE) };
    case 'resistor':
      return { id, kind: 'resistor', position: at, label: 'Resistor', data: { resistanceOhm: 1e6 } };
  }
}

/** Id prefix the editor uses for each tray item's blocks (`s4`, `src2`, `load`, ...). */
export const TRAY_ID_PREFIX: Record<TrayItemKey, string> = {
  'ac-source': 'src',
  'ac-source-ct': 'src',
  'stage-half-pos': 's',
  'stage-half-neg': 'm',
  'stage-full-pos': 's',
  'stage-full-neg': 'm',
  'load-resistor': 'load',
  'load-current': 'load',
  ground: 'gnd',
  capacitor: 'c',
  diode: 'd',
  resistor: 'r',
};

/** Largest number `k` among ids of the form `<prefix><k>` (0 when none; a bare `<prefix>` counts as 1). */
function highestIndex(ids: Iterable<string>, prefix: string): number {
  let best = 0;
  for (const id of ids) {
    if (!id.startsWith(prefix)) continue;
    const rest = id.slice(prefix.length);
    if (rest === '') best = Math.max(best, 1);
    else if (/^\d+$/.test(rest)) best = Math.max(best, Number(rest));
  }
  return best;
}

/**
 * A block id not used in the document: `<prefix><k>` with k one above the highest in use, so an id
 * freed by a delete is not handed to a new block (net names derive from block ids).
 */
export function nextBlockId(doc: DesignDocument, prefix: string): string {
  const ids = new Set(doc.blocks.map((b) => b.id));
  let k = highestIndex(ids, prefix) + 1;
  while (ids.has(`${prefix}${k}`)) k++;
  return `${prefix}${k}`;
}

/** A wire id not used in the document: `w<k>`, k one above the highest in use. */
export function nextWireId(doc: DesignDocument): string {
  const ids = new Set(doc.wires.map((w) => w.id));
  let k = highestIndex(ids, 'w') + 1;
  while (ids.has(`w${k}`)) k++;
  return `w${k}`;
}

/** An empty document (no blocks, no wires, default settings). */
export function emptyDocument(): DesignDocument {
  return { schemaVersion: DOCUMENT_SCHEMA_VERSION, blocks: [], wires: [], settings: { strayCapacitanceF: 0, deratingFraction: 0.8 } };
}
