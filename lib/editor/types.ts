/**
 * What the design editor's parts agree on: the engine bridge (Web Worker) produces an
 * {@link EngineSnapshot} for each edit of the document; the canvas, the hover reading and the side
 * panel only read it. All values SI (V, A, W, J, F, Ω, s, Hz); engineering notation exists only
 * where a component formats a number for display.
 */
import type { Diagnostic, EstimateResult, SafetySummary, TopologyKind } from '@/lib/circuit';
import type { EffectiveDerating } from '@/lib/parts/derating';

/** `${blockId}:${port}` — one port on the canvas. */
export type PortKey = `${string}:${string}`;

/** The topology badge above the canvas. */
export interface TopologyBadge {
  kind: TopologyKind;
  /** Stages per ladder (null for custom or when nothing is recognised). */
  stages: number | null;
  /** `bipolar` for a symmetric pair. */
  polarity: 'positive' | 'negative' | 'bipolar' | null;
  /** Short text for the badge, e.g. "Symmetric · 3 stages · ±" or "Custom". */
  label: string;
}

/** What the compiler made of the drawing (cheap; arrives first). */
export interface CompileView {
  ok: boolean;
  /** First error when `ok` is false. */
  reason?: string;
  badge: TopologyBadge;
  diagnostics: Diagnostic[];
  /** Netlist node of every wired port; absent ports are not on any net. */
  nodeOfPort: Record<PortKey, string>;
  /** Human label of every netlist node (e.g. "Stage 3 smoothing column (y3)", "Output +", "Ground"). */
  nodeLabels: Record<string, string>;
  /** Output node names (positive first). */
  outputs: { node: string; polarity: 'positive' | 'negative' }[];
  /** The netlist as SPICE-subset text (what "export netlist" writes; what `npm run solve` reads). */
  netlistText: string | null;
}

/** One node's voltages to ground. */
export interface NodeReading {
  node: string;
  label: string;
  /** Ports on this net (so the canvas can place the reading). */
  ports: PortKey[];
  meanV: number;
  /** Peak-to-peak ripple (V). */
  rippleV: number;
  minV: number;
  maxV: number;
  /** One period of the waveform (t from the period start, s; v in V), when the solver sent one. */
  waveform?: { t: number[]; v: number[] };
}

/** One quantity of a part checked against its rating. */
export interface StressCheck {
  quantity: 'voltage' | 'piv' | 'averageCurrent' | 'peakCurrent' | 'power';
  /** Magnitude found by the solve (or the estimate). */
  actual: number;
  unit: 'V' | 'A' | 'W';
  /** The part's rating, when it has one. */
  rating?: number;
  /** derating × rating (the team's derating fraction, common practice 0.8). */
  allowed?: number;
  /** (allowed − actual) / allowed; negative = over the derated limit. */
  margin?: number;
}

/** Stress of one part (a capacitor or diode inside a stage block, or a single part). */
export interface PartStress {
  blockId: string;
  /** Role in the block: `pumpC`, `smoothC`, `pump2C`, `diodeA`…`diodeD`, `capacitor`, `diode`, `resistor`, `load`. */
  role: string;
  /** Netlist element name. */
  element: string;
  kind: 'C' | 'D' | 'R';
  /** Human label, e.g. "Stage 2 · pumping C". */
  label: string;
  checks: StressCheck[];
  /** Smallest margin over the rated checks; null when the part has no ratings. */
  worstMargin: number | null;
  /** `over`: a check is past the derated limit; `tight`: margin < 0.1; `unrated`: no ratings given. */
  status: 'ok' | 'tight' | 'over' | 'unrated';
  /** The team library part this part is bound to (its values were copied from it), when bound. */
  partId?: string;
}

/** The closed-form estimate (arrives right after the compile). */
export interface EstimateView {
  result: EstimateResult;
}

/** The full periodic steady-state solve. */
export interface SolveView {
  periodS: number;
  frequencyHz: number;
  outputs: { node: string; polarity: 'positive' | 'negative' }[];
  nodes: Record<string, NodeReading>;
  parts: PartStress[];
  /** The derating the stress was judged at: the stricter of the design's and the team's (lib/parts/derating.ts). */
  derating?: EffectiveDerating;
  power: { sourceW: number; loadW: number; lossW: number; efficiency: number | null };
  safety: SafetySummary;
  /** Output warm-up from power-on (arrives in a second message after the steady state). */
  warmup?: { t90S: number | null; t99S: number | null; cycles90: number | null; cycles99: number | null; curve: { cycles: number[]; meanV: number[] } };
  stats: { solveMs: number; shootingIterations: number; unknowns: number; steps: number };
}

/**
 * Where the editor's results stand.
 * - `compiling`: the latest edit is being compiled (older results may still be shown, marked stale).
 * - `solving`: compile and estimate are current; the full solve is running.
 * - `solved`: everything shown belongs to the latest edit.
 * - `cannot-solve`: the drawing compiles with errors, or the solver gave up; `reason` says why.
 */
export type EngineStatus = 'idle' | 'compiling' | 'solving' | 'solved' | 'cannot-solve';

export interface EngineSnapshot {
  status: EngineStatus;
  reason?: string;
  /** Edit counter of the document the shown compile/estimate/solve belong to. */
  compiledVersion: number | null;
  solvedVersion: number | null;
  /** Edit counter of the document on the canvas now. */
  currentVersion: number;
  compile: CompileView | null;
  estimate: EstimateView | null;
  solve: SolveView | null;
  /** Whether the warm-up run for the shown solve is still going. */
  warmupPending: boolean;
  /**
   * Wall times (ms) of the last run: worker compute (compile, estimate, steady-state solve,
   * warm-up) and edit → reply received on the main thread (from when `useEngine` first saw the version).
   */
  timings: { compileMs?: number; estimateMs?: number; solveMs?: number; warmupMs?: number; editToEstimateMs?: number; editToSolveMs?: number };
}
