/**
 * The typed netlist model shared by the parser, the formatter, the canvas compiler, topology
 * recognition and the solver. Values are SI numbers (ohm, farad, volt, ampere, hertz, second).
 *
 * The element set is the common SPICE subset engineers exchange (R, C, D, V, I). Anything the
 * canvas adds beyond it (capacitor ESR, source resistance, stray capacitance) is compiled into
 * plain R and C elements, so every netlist we solve can also be exported and run elsewhere.
 */

/** The ground node name. SPICE also accepts `gnd`; the parser maps it to this. */
export const GROUND = '0';

/** Where an element or node came from on the canvas, so diagnostics and results map back. */
export interface CanvasOrigin {
  /** Canvas block id (`DesignNode.id`). */
  blockId: string;
  /** Role inside the block, e.g. `pumpC`, `smoothC`, `diodeA`, `esr`, `source`, `rs`. */
  role?: string;
}

/** Sinusoidal source `SIN(VO VA FREQ TD THETA PHASE)`; PHASE in degrees as in SPICE 3. */
export interface SineSpec {
  offsetV: number;
  amplitude: number;
  frequencyHz: number;
  delayS: number;
  /** Damping factor THETA (1/s). */
  damping: number;
  phaseDeg: number;
}

interface ElementBase {
  /** Element name as written, including its type letter (`R1`, `Cpump3`, `D2a`). */
  name: string;
  /** 1-based source line (parser) or undefined (compiled). */
  line?: number;
  origin?: CanvasOrigin;
}

export interface ResistorElement extends ElementBase {
  kind: 'R';
  nodes: [string, string];
  resistanceOhm: number;
}

export interface CapacitorElement extends ElementBase {
  kind: 'C';
  nodes: [string, string];
  capacitanceF: number;
  /** Optional initial condition `IC=` in volts (v(n1) − v(n2)). */
  initialV?: number;
}

export interface DiodeElement extends ElementBase {
  kind: 'D';
  /** [anode, cathode] */
  nodes: [string, string];
  /** Name of a `.model NAME D(...)` card. */
  model: string;
  /** Area factor (scales IS, CJO; divides RS). Default 1. */
  area?: number;
}

/** Independent voltage source: v(n+) − v(n−) = dc + sine(t). */
export interface VoltageSourceElement extends ElementBase {
  kind: 'V';
  nodes: [string, string];
  dcV: number;
  sine?: SineSpec;
}

/**
 * Independent current source. SPICE convention: positive current flows from n+ through the
 * source to n− (so `I1 out 0 DC 1m` draws 1 mA out of node `out`).
 */
export interface CurrentSourceElement extends ElementBase {
  kind: 'I';
  nodes: [string, string];
  dcA: number;
  sine?: SineSpec;
}

export type NetlistElement =
  | ResistorElement
  | CapacitorElement
  | DiodeElement
  | VoltageSourceElement
  | CurrentSourceElement;

/**
 * Diode model parameters (SPICE level-1 names). Defaults as in SPICE 3 where a card omits them:
 * IS=1e-14, N=1, RS=0, BV=∞, IBV=1e-3 (SPICE 3 default 1e-3), CJO=0, VJ=1, M=0.5, TT=0, FC=0.5.
 */
export interface DiodeModel {
  name: string;
  /** Saturation current IS (A). */
  isA: number;
  /** Emission coefficient N. */
  n: number;
  /** Series resistance RS (ohm). */
  rsOhm: number;
  /** Reverse breakdown voltage BV (V, positive); undefined = no breakdown modelled. */
  bvV?: number;
  /** Current at breakdown IBV (A). */
  ibvA: number;
  /** Zero-bias junction capacitance CJO (F). */
  cjoF: number;
  /** Junction potential VJ (V). */
  vjV: number;
  /** Grading coefficient M. */
  m: number;
  /** Transit time TT (s). */
  ttS: number;
  /** Forward-bias depletion capacitance coefficient FC. */
  fc: number;
}

/** A dot-card the parser kept but does not act on (`.tran`, `.options`, ...). */
export interface IgnoredCard {
  line: number;
  text: string;
}

export interface Netlist {
  title: string;
  elements: NetlistElement[];
  /** Diode models by upper-cased name. */
  models: Record<string, DiodeModel>;
  /** Cards kept verbatim and reported as ignored. */
  ignored: IgnoredCard[];
  /** Canvas origin of each net, when compiled from a document (net name → ports). */
  nodeOrigins?: Record<string, { blockId: string; port: string }[]>;
}
