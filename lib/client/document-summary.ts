/**
 * A short, read-only summary of a stored canvas document for the design page (until the canvas
 * itself arrives): stage blocks by polarity, the drive, the load and part counts. It counts what
 * the document holds; it does not compile or simulate.
 */
import type { DesignDocument } from '@/lib/circuit/document/schema';

export interface DocumentSummary {
  /** Number of ladder stage blocks. */
  stageCount: number;
  positiveStages: number;
  negativeStages: number;
  halfStages: number;
  fullStages: number;
  /** First AC drive in the document, if any. Amplitude in V (peak or RMS per `amplitudeMode`), frequency in Hz. */
  drive: { variant: 'single' | 'centreTapped'; amplitudeV: number; amplitudeMode: 'peak' | 'rms'; frequencyHz: number; sourceResistanceOhm: number } | null;
  /** DC sources (V). */
  dcSourcesV: number[];
  /** The load: a resistance (ohm) or a constant current (A). */
  load: { mode: 'resistor'; resistanceOhm: number } | { mode: 'current'; currentA: number } | null;
  capacitors: number;
  diodes: number;
  resistors: number;
  /** Distinct capacitances used in stages and discrete capacitors (F), ascending. */
  capacitancesF: number[];
  blockCount: number;
  wireCount: number;
  strayCapacitanceF: number;
  bleederOhm: number | null;
}

/** Counts and picks out the main values of a design document. */
export function summariseDocument(doc: DesignDocument): DocumentSummary {
  const s: DocumentSummary = {
    stageCount: 0,
    positiveStages: 0,
    negativeStages: 0,
    halfStages: 0,
    fullStages: 0,
    drive: null,
    dcSourcesV: [],
    load: null,
    capacitors: 0,
    diodes: 0,
    resistors: 0,
    capacitancesF: [],
    blockCount: doc.blocks.length,
    wireCount: doc.wires.length,
    strayCapacitanceF: doc.settings?.strayCapacitanceF ?? 0,
    bleederOhm: doc.settings?.bleederOhm ?? null,
  };
  const caps = new Set<number>();
  for (const b of doc.blocks) {
    switch (b.kind) {
      case 'stage': {
        s.stageCount += 1;
        if (b.data.polarity === 'positive') s.positiveStages += 1;
        else s.negativeStages += 1;
        const full = b.data.variant === 'full';
        if (full) s.fullStages += 1;
        else s.halfStages += 1;
        caps.add(b.data.pumpC.capacitanceF);
        caps.add(b.data.smoothC.capacitanceF);
        if (b.data.pump2C) caps.add(b.data.pump2C.capacitanceF);
        s.capacitors += full ? 3 : 2;
        s.diodes += full ? 4 : 2;
        break;
      }
      case 'acSource':
        if (!s.drive) {
          s.drive = {
            variant: b.data.variant,
            amplitudeV: b.data.amplitudeV,
            amplitudeMode: b.data.amplitudeMode,
            frequencyHz: b.data.frequencyHz,
            sourceResistanceOhm: b.data.sourceResistanceOhm ?? 0,
          };
        }
        break;
      case 'dcSource':
        s.dcSourcesV.push(b.data.voltageV);
        break;
      case 'load':
        if (!s.load) s.load = b.data;
        break;
      case 'capacitor':
        s.capacitors += 1;
        caps.add(b.data.capacitanceF);
        break;
      case 'diode':
        s.diodes += 1;
        break;
      case 'resistor':
        s.resistors += 1;
        break;
      case 'ground':
        break;
    }
  }
  s.capacitancesF = [...caps].sort((a, b) => a - b);
  return s;
}
