/**
 * Programmatic ladder netlists (Cockcroft–Walton / Greinacher cascades) for tests, benchmarks
 * and examples. Node names:
 * - half-wave: source `in` (behind `src` and Rs when a source resistance is set), pumping
 *   column `p1…pn`, smoothing column `s1…sn` (s0 is ground), output `sn`;
 * - full-wave: antiphase drives `ina`/`inb`, pumping columns `pa1…`, `pb1…`, smoothing `s1…`;
 * - bipolar: one drive `in`, positive ladder `p1…`/`s1…`, negative ladder `pn1…`/`sn1…`.
 * Stage k: pumping C from p(k−1) to pk, smoothing C from s(k−1) to sk, diode from s(k−1) to pk
 * and from pk to sk (reversed for negative polarity), as in the canvas document's stage block.
 */
import type { DiodeModel, Netlist, NetlistElement } from './types';

export type LadderKind = 'half-wave' | 'full-wave' | 'bipolar';

export interface LadderOptions {
  kind: LadderKind;
  /** Full stages per ladder (one stage = 2 diodes + 2 capacitors; ×2n at no load). */
  stages: number;
  /** Drive peak voltage Vp (V). */
  peakV: number;
  /** Drive frequency (Hz). */
  frequencyHz: number;
  /** Stage capacitance (F): one value, or per stage k = 1…n. */
  capacitanceF: number | number[];
  /** Smoothing-column capacitance when it differs (F), one value or per stage. */
  smoothingCapacitanceF?: number | number[];
  /** Diode model (defaults to {@link GENERIC_RECTIFIER}). */
  diode?: Partial<DiodeModel>;
  /** Constant-current load (A) from the output to ground (bipolar: from + to − output). */
  loadCurrentA?: number;
  /** Resistive load (ohm), same placement as the current load. */
  loadResistanceOhm?: number;
  /** Series source resistance (ohm) per drive. */
  sourceResistanceOhm?: number;
  /** Stray capacitance (F) from every pumping-column node to ground. */
  strayPumpF?: number;
  /** Stray capacitance (F) from every smoothing-column node to ground. */
  straySmoothF?: number;
  /** Capacitor ESR (ohm), in series with every ladder capacitor. */
  esrOhm?: number;
  /** Output polarity (half-wave and full-wave). */
  polarity?: 'positive' | 'negative';
  /** Drive phase (degrees) of the (first) source. */
  phaseDeg?: number;
  /** Square-free sine delay TD (s). */
  delayS?: number;
}

/** A generic small silicon rectifier (invented demo values, SPICE level-1 names). */
export const GENERIC_RECTIFIER: DiodeModel = {
  name: 'DRECT',
  isA: 2.5e-9,
  n: 1.75,
  rsOhm: 0.05,
  ibvA: 1e-3,
  cjoF: 0,
  vjV: 1,
  m: 0.5,
  ttS: 0,
  fc: 0.5,
};

/** A near-ideal diode: forward drop of a few mV at amperes, 0.05 Ω on-resistance. */
export const NEAR_IDEAL_DIODE: DiodeModel = {
  name: 'DIDEAL',
  isA: 1e-9,
  n: 0.01,
  rsOhm: 0.05,
  ibvA: 1e-3,
  cjoF: 0,
  vjV: 1,
  m: 0.5,
  ttS: 0,
  fc: 0.5,
};

/** Output node(s) of a generated ladder. */
export function ladderOutputs(o: Pick<LadderOptions, 'kind' | 'stages' | 'polarity'>): { node: string; polarity: 'positive' | 'negative' }[] {
  if (o.kind === 'bipolar') {
    return [
      { node: `s${o.stages}`, polarity: 'positive' },
      { node: `sn${o.stages}`, polarity: 'negative' },
    ];
  }
  return [{ node: `s${o.stages}`, polarity: o.polarity ?? 'positive' }];
}

function perStage(v: number | number[] | undefined, k: number, fallback: number): number {
  if (v === undefined) return fallback;
  return Array.isArray(v) ? v[k - 1] : v;
}

/** Builds a ladder netlist. */
export function generateLadder(o: LadderOptions): Netlist {
  const n = o.stages;
  if (!Number.isInteger(n) || n < 1) throw new Error('stages must be a positive integer');
  const model: DiodeModel = { ...GENERIC_RECTIFIER, ...o.diode };
  const mname = model.name.toUpperCase();
  const els: NetlistElement[] = [];
  const cap = (name: string, a: string, b: string, c: number) => {
    if (o.esrOhm && o.esrOhm > 0) {
      const mid = `${name}_esr`;
      els.push({ kind: 'C', name, nodes: [a, mid], capacitanceF: c });
      els.push({ kind: 'R', name: `R${name.slice(1)}_esr`, nodes: [mid, b], resistanceOhm: o.esrOhm });
    } else {
      els.push({ kind: 'C', name, nodes: [a, b], capacitanceF: c });
    }
  };
  const diode = (name: string, anode: string, cathode: string) => els.push({ kind: 'D', name, nodes: [anode, cathode], model: mname });
  const source = (name: string, node: string, phaseDeg: number) => {
    const rs = o.sourceResistanceOhm ?? 0;
    const hot = rs > 0 ? `${node}_src` : node;
    els.push({
      kind: 'V',
      name,
      nodes: [hot, '0'],
      dcV: 0,
      sine: { offsetV: 0, amplitude: o.peakV, frequencyHz: o.frequencyHz, delayS: o.delayS ?? 0, damping: 0, phaseDeg },
    });
    if (rs > 0) els.push({ kind: 'R', name: `Rs_${name}`, nodes: [hot, node], resistanceOhm: rs });
  };
  const column = (pumpPrefix: string, smoothPrefix: string, drive: string, negative: boolean, tag: string, withSmoothing = true) => {
    for (let k = 1; k <= n; k++) {
      const pPrev = k === 1 ? drive : `${pumpPrefix}${k - 1}`;
      const sPrev = k === 1 ? '0' : `${smoothPrefix}${k - 1}`;
      const p = `${pumpPrefix}${k}`;
      const s = `${smoothPrefix}${k}`;
      cap(`C${tag}p${k}`, pPrev, p, perStage(o.capacitanceF, k, 0));
      if (withSmoothing) cap(`C${tag}s${k}`, sPrev, s, perStage(o.smoothingCapacitanceF ?? o.capacitanceF, k, 0));
      if (negative) {
        diode(`D${tag}${2 * k - 1}`, p, sPrev);
        diode(`D${tag}${2 * k}`, s, p);
      } else {
        diode(`D${tag}${2 * k - 1}`, sPrev, p);
        diode(`D${tag}${2 * k}`, p, s);
      }
      if (o.strayPumpF && o.strayPumpF > 0) els.push({ kind: 'C', name: `Cstray_${p}`, nodes: [p, '0'], capacitanceF: o.strayPumpF });
      if (withSmoothing && o.straySmoothF && o.straySmoothF > 0) els.push({ kind: 'C', name: `Cstray_${s}`, nodes: [s, '0'], capacitanceF: o.straySmoothF });
    }
  };
  const phase = o.phaseDeg ?? 0;
  const negative = o.polarity === 'negative';
  if (o.kind === 'half-wave') {
    source('V1', 'in', phase);
    column('p', 's', 'in', negative, '');
  } else if (o.kind === 'full-wave') {
    source('V1', 'ina', phase);
    source('V2', 'inb', phase + 180);
    column('pa', 's', 'ina', negative, 'a');
    column('pb', 's', 'inb', negative, 'b', false);
  } else {
    source('V1', 'in', phase);
    column('p', 's', 'in', false, '');
    column('pn', 'sn', 'in', true, 'n');
  }
  const outs = ladderOutputs(o);
  const top = outs[0].node;
  const bottom = o.kind === 'bipolar' ? outs[1].node : '0';
  if (o.loadCurrentA && o.loadCurrentA > 0) {
    // SPICE convention: current flows from n+ through the source to n−.
    const [from, to] = negative && o.kind !== 'bipolar' ? [bottom, top] : [top, bottom];
    els.push({ kind: 'I', name: 'Iload', nodes: [from, to], dcA: o.loadCurrentA });
  }
  if (o.loadResistanceOhm && o.loadResistanceOhm > 0) els.push({ kind: 'R', name: 'Rload', nodes: [top, bottom], resistanceOhm: o.loadResistanceOhm });
  return {
    title: `${o.kind} ladder, ${n} stage${n === 1 ? '' : 's'}, ${o.peakV} V peak at ${o.frequencyHz} Hz`,
    elements: els,
    models: { [mname]: { ...model, name: mname } },
    ignored: [],
  };
}
