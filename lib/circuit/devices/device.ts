/**
 * The device contract, after SpiceSharp's behaviours (S. Bogaerts, SpiceSharp, MIT): each
 * device declares the unknowns and matrix entries it needs once (`setup`), resolves their
 * storage positions once (`bind`), and on every Newton–Raphson iteration only adds numbers
 * (`load`). Nonlinear devices also own their convergence test. Modified nodal analysis rows are
 * "sum of currents leaving the node = 0" (Ho, Ruehli, Brennan, IEEE Trans. CAS 22(6), 1975).
 */
import type { ChargeStore } from '../integration/charge-store';

/** Declares structure before the unknowns are ordered. Indices are logical (pre-ordering). */
export interface SetupContext {
  /** Unknown index of a netlist node; the ground node returns {@link GROUND_LOGICAL}. */
  node(name: string): number;
  /** A device-private node (e.g. a diode's junction behind RS). */
  internalNode(name: string): number;
  /** A branch-current unknown (voltage sources). */
  branch(name: string): number;
  /** Declares a structural matrix entry (row, col); entries touching ground are ignored. */
  entry(row: number, col: number): void;
  /** Allocates one charge state (a two-terminal charge q(v) between `pos` and `neg`). */
  chargeSlot(pos: number, neg: number, owner: string, kind: 'capacitor' | 'junction'): number;
}

/** Logical index of ground. */
export const GROUND_LOGICAL = -1;

/** Resolves logical indices to storage after ordering. Ground maps to a write-only trash cell. */
export interface BindContext {
  /** Offset into {@link LoadState.matrix} of entry (row, col). */
  position(row: number, col: number): number;
  /** Offset into the solution / right-hand-side vectors of a logical unknown. */
  unknown(logical: number): number;
}

/** What `load` reads and writes on one Newton–Raphson iteration. */
export interface LoadState {
  /** Band matrix storage (plus one trash cell for ground entries). */
  matrix: Float64Array;
  /** Right-hand side (plus one trash cell). */
  rhs: Float64Array;
  /** Current iterate; the ground cell reads 0. */
  x: Float64Array;
  /** 'dc': capacitors open; 'transient': charges go through the integration method. */
  mode: 'dc' | 'transient';
  /** Simulation time (s). */
  time: number;
  /** Scales every independent source (source stepping), 1 normally. */
  sourceFactor: number;
  /** Conductance across every junction (SPICE GMIN), S. */
  gmin: number;
  /** Iteration number within this Newton solve (0 = first). */
  iteration: number;
  /** Set by devices that limited their junction voltage this iteration (SPICE CKTnoncon). */
  noncon: number;
  /** Relative and absolute current tolerances for device convergence tests (SPICE RELTOL, ABSTOL). */
  reltol: number;
  abstolA: number;
  /** Integration state; null in DC. */
  charges: ChargeStore | null;
}

export interface Device {
  readonly name: string;
  setup(ctx: SetupContext): void;
  bind(ctx: BindContext): void;
  load(state: LoadState): void;
  /** Device convergence test against the new solution (nonlinear devices only). */
  converged?(state: LoadState, xNew: Float64Array): boolean;
  /** Called when a time step (or operating point) is accepted. */
  accept?(): void;
  /** Called when a time step is rejected and will be retried. */
  rollback?(): void;
}

/** Independent sources expose their waveform so analyses can find the period and breakpoints. */
export interface SourceDevice extends Device {
  /** Drive frequency (Hz) of a sine source, or 0 for DC. */
  frequencyHz(): number;
  /** Times (s) where the waveform has a kink (SIN delay). */
  breakpoints(): number[];
}
