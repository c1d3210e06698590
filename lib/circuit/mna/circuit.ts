/**
 * Builds the modified-nodal-analysis system of a netlist (Ho, Ruehli, Brennan, "The modified
 * nodal approach to network analysis", IEEE Trans. CAS 22(6), 1975): devices declare their
 * unknowns and entries, the unknowns are reordered by reverse Cuthill–McKee, the band matrix is
 * sized from the reordered pattern, and every device binds its storage positions once.
 */
import { CapacitorDevice } from '../devices/capacitor';
import { DiodeDevice } from '../devices/diode';
import type { BindContext, Device, SetupContext, SourceDevice } from '../devices/device';
import { GROUND_LOGICAL } from '../devices/device';
import { ResistorDevice } from '../devices/resistor';
import { CurrentSourceDevice, VoltageSourceDevice } from '../devices/sources';
import { ChargeStore, type ChargeKind } from '../integration/charge-store';
import type { IntegrationMethod } from '../integration/methods';
import { BandMatrix } from '../linalg/band-lu';
import { bandwidths, reverseCuthillMcKee } from '../linalg/rcm';
import { GROUND, type Netlist } from '../netlist/types';

/** A problem found while building the system, named by element or node. */
export interface SolverDiagnostic {
  severity: 'error' | 'warning' | 'info';
  code: string;
  message: string;
  element?: string;
  node?: string;
}

export interface Circuit {
  devices: Device[];
  resistors: ResistorDevice[];
  capacitors: CapacitorDevice[];
  diodes: DiodeDevice[];
  voltageSources: VoltageSourceDevice[];
  currentSources: CurrentSourceDevice[];
  sources: SourceDevice[];
  /** Devices with their own convergence test. */
  nonlinear: DiodeDevice[];
  /** Number of unknowns; solution vectors have one more cell (ground, always 0). */
  size: number;
  matrix: BandMatrix;
  rhs: Float64Array;
  /** Netlist node name → solution offset (ground → `size`). */
  nodeOffset: Map<string, number>;
  /** Names of the netlist's nodes except ground, in first-seen order. */
  nodeNames: string[];
  /** 1 where the unknown at that offset is a node voltage, 0 for a branch current. */
  isVoltage: Uint8Array;
  /** Matrix offsets of the diagonal of every node-voltage unknown (for GMIN shunts). */
  nodeDiagonal: Int32Array;
  /** Charge-state slots (capacitors, diode charges) with logical terminals. */
  slots: { pos: number; neg: number; owner: string; kind: ChargeKind }[];
  /** Logical → solution offset. */
  unknown: (logical: number) => number;
  /** Creates an integration state store for this circuit. */
  createChargeStore(method: IntegrationMethod): ChargeStore;
  /** Structural bandwidths after ordering. */
  band: { lower: number; upper: number };
}

export type BuildOutcome = { ok: true; circuit: Circuit } | { ok: false; reason: string; diagnostics: SolverDiagnostic[] };

/** Largest |offset| + amplitude of any voltage source (V): the scale of the drive. */
export function driveAmplitudeV(circuit: Pick<Circuit, 'voltageSources'>): number {
  let amplitude = 0;
  for (const v of circuit.voltageSources) amplitude = Math.max(amplitude, Math.abs(v.sine?.amplitude ?? 0) + Math.abs(v.sine?.offsetV ?? v.dcV));
  return amplitude;
}

/** Creates devices for every element and binds them into one MNA system. */
export function buildCircuit(netlist: Netlist): BuildOutcome {
  const diagnostics: SolverDiagnostic[] = [];
  const devices: Device[] = [];
  const c: Omit<Circuit, 'size' | 'matrix' | 'rhs' | 'nodeOffset' | 'nodeNames' | 'isVoltage' | 'nodeDiagonal' | 'slots' | 'unknown' | 'createChargeStore' | 'band'> = {
    devices,
    resistors: [],
    capacitors: [],
    diodes: [],
    voltageSources: [],
    currentSources: [],
    sources: [],
    nonlinear: [],
  };
  let touchesGround = false;
  for (const el of netlist.elements) {
    if (el.nodes.some((n) => n === GROUND)) touchesGround = true;
    switch (el.kind) {
      case 'R': {
        if (!(el.resistanceOhm > 0) || !Number.isFinite(el.resistanceOhm)) {
          diagnostics.push({ severity: 'error', code: 'bad-value', element: el.name, message: `${el.name}: resistance must be positive and finite` });
          continue;
        }
        const d = new ResistorDevice(el.name, el.nodes, el.resistanceOhm);
        c.resistors.push(d);
        devices.push(d);
        break;
      }
      case 'C': {
        if (!(el.capacitanceF > 0) || !Number.isFinite(el.capacitanceF)) {
          diagnostics.push({ severity: 'error', code: 'bad-value', element: el.name, message: `${el.name}: capacitance must be positive and finite` });
          continue;
        }
        const d = new CapacitorDevice(el.name, el.nodes, el.capacitanceF);
        c.capacitors.push(d);
        devices.push(d);
        break;
      }
      case 'D': {
        const model = netlist.models[el.model.toUpperCase()] ?? netlist.models[el.model];
        if (!model) {
          diagnostics.push({ severity: 'error', code: 'missing-model', element: el.name, message: `${el.name}: no .model card named ${el.model}` });
          continue;
        }
        const d = new DiodeDevice(el.name, el.nodes, model, el.area ?? 1);
        c.diodes.push(d);
        c.nonlinear.push(d);
        devices.push(d);
        break;
      }
      case 'V': {
        const d = new VoltageSourceDevice(el.name, el.nodes, el.dcV, el.sine);
        c.voltageSources.push(d);
        c.sources.push(d);
        devices.push(d);
        break;
      }
      case 'I': {
        const d = new CurrentSourceDevice(el.name, el.nodes, el.dcA, el.sine);
        c.currentSources.push(d);
        c.sources.push(d);
        devices.push(d);
        break;
      }
    }
  }
  if (!touchesGround) diagnostics.push({ severity: 'error', code: 'no-ground', message: 'no element connects to ground (node 0)' });
  if (devices.length === 0) diagnostics.push({ severity: 'error', code: 'empty', message: 'the netlist has no elements' });
  if (diagnostics.some((d) => d.severity === 'error')) return { ok: false, reason: diagnostics.find((d) => d.severity === 'error')!.message, diagnostics };

  const logicalIndex = new Map<string, number>();
  const nodeNames: string[] = [];
  const kinds: ('node' | 'internal' | 'branch')[] = [];
  const entries: [number, number][] = [];
  const slots: Circuit['slots'] = [];
  const newUnknown = (key: string, kind: 'node' | 'internal' | 'branch'): number => {
    const existing = logicalIndex.get(key);
    if (existing !== undefined) return existing;
    const idx = kinds.length;
    kinds.push(kind);
    logicalIndex.set(key, idx);
    return idx;
  };
  const setup: SetupContext = {
    node(name) {
      if (name === GROUND) return GROUND_LOGICAL;
      if (!logicalIndex.has(`n:${name}`)) nodeNames.push(name);
      return newUnknown(`n:${name}`, 'node');
    },
    internalNode: (name) => newUnknown(`i:${name}`, 'internal'),
    branch: (name) => newUnknown(`b:${name}`, 'branch'),
    entry(row, col) {
      if (row >= 0 && col >= 0) entries.push([row, col]);
    },
    chargeSlot(pos, neg, owner, kind) {
      slots.push({ pos, neg, owner, kind });
      return slots.length - 1;
    },
  };
  for (const d of devices) d.setup(setup);
  const size = kinds.length;
  for (let i = 0; i < size; i++) entries.push([i, i]);
  const order = reverseCuthillMcKee(size, entries);
  const position = new Int32Array(size);
  for (let k = 0; k < size; k++) position[order[k]] = k;
  const band = bandwidths(entries, position);
  const matrix = new BandMatrix(size, band.lower, band.upper);
  const unknown = (logical: number): number => (logical < 0 ? size : position[logical]);
  const bind: BindContext = {
    position: (row, col) => (row < 0 || col < 0 ? matrix.trashOffset : matrix.patternOffset(position[row], position[col])),
    unknown,
  };
  for (const d of devices) d.bind(bind);
  const nodeOffset = new Map<string, number>([[GROUND, size]]);
  for (const name of nodeNames) nodeOffset.set(name, unknown(logicalIndex.get(`n:${name}`)!));
  const isVoltage = new Uint8Array(size + 1);
  const diag: number[] = [];
  for (let l = 0; l < size; l++) {
    if (kinds[l] !== 'branch') {
      isVoltage[position[l]] = 1;
      diag.push(matrix.patternOffset(position[l], position[l]));
    }
  }
  const circuit: Circuit = {
    ...c,
    size,
    matrix,
    rhs: new Float64Array(size + 1),
    nodeOffset,
    nodeNames,
    isVoltage,
    nodeDiagonal: Int32Array.from(diag),
    slots,
    unknown,
    band,
    createChargeStore(method) {
      const store = new ChargeStore(slots, method);
      store.bindTerminals(
        unknown,
        slots.map((s) => s.pos),
        slots.map((s) => s.neg),
      );
      return store;
    },
  };
  return { ok: true, circuit };
}
