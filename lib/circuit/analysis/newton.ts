/**
 * The Newton–Raphson loop of circuit simulation, written out as in SPICE's NIiter (Nagel,
 * SPICE2, UCB/ERL M520, 1975, §5; SpiceSharp's `BiasingSimulation`): load every device at the
 * current iterate, factor, solve, and declare convergence when no device limited its junction
 * voltage, every node voltage moved less than reltol·|v| + vntol, and every nonlinear
 * device's own current test passes. A singular matrix or an exhausted iteration budget is
 * returned as a value.
 */
import type { LoadState } from '../devices/device';
import type { ChargeStore } from '../integration/charge-store';
import type { Circuit } from '../mna/circuit';

export interface NewtonTolerances {
  /** Relative tolerance on unknowns. */
  reltol: number;
  /** Relative tolerance of the diodes' current test (SPICE RELTOL). */
  deviceReltol: number;
  /** Absolute tolerance on node voltages (V). */
  vntolV: number;
  /** Absolute tolerance on currents (A). */
  abstolA: number;
  /** Junction GMIN (S). */
  gmin: number;
  maxIterations: number;
}

export const DEFAULT_TOLERANCES: NewtonTolerances = {
  reltol: 1e-6,
  deviceReltol: 1e-3,
  vntolV: 1e-7,
  abstolA: 1e-12,
  gmin: 1e-12,
  maxIterations: 60,
};

export type NewtonOutcome =
  | { ok: true; iterations: number }
  | { ok: false; reason: 'singular' | 'no-convergence' | 'not-finite'; iterations: number; unknown?: number };

/** Reusable state for repeated Newton solves on one circuit. */
export class NewtonSolver {
  readonly state: LoadState;
  private readonly xNew: Float64Array;
  /** Extra conductance from every node to ground (GMIN stepping), S. */
  gshunt = 0;
  totalIterations = 0;
  factorizations = 0;

  constructor(
    readonly circuit: Circuit,
    readonly tol: NewtonTolerances,
  ) {
    const n = circuit.size + 1;
    this.state = {
      matrix: circuit.matrix.data,
      rhs: circuit.rhs,
      x: new Float64Array(n),
      mode: 'dc',
      time: 0,
      sourceFactor: 1,
      gmin: tol.gmin,
      iteration: 0,
      noncon: 0,
      reltol: tol.deviceReltol,
      abstolA: tol.abstolA,
      charges: null,
    };
    this.xNew = new Float64Array(n);
  }

  setMode(mode: 'dc' | 'transient', charges: ChargeStore | null): void {
    this.state.mode = mode;
    this.state.charges = charges;
  }

  /** Runs Newton–Raphson from the iterate in `state.x`; the solution is left there. */
  solve(maxIterations = this.tol.maxIterations): NewtonOutcome {
    const { circuit, state, xNew, tol } = this;
    const size = circuit.size;
    const x = state.x;
    const linear = circuit.nonlinear.length === 0;
    for (let it = 0; it < maxIterations; it++) {
      state.iteration = it;
      state.noncon = 0;
      circuit.matrix.clear();
      circuit.rhs.fill(0);
      for (const d of circuit.devices) d.load(state);
      if (this.gshunt > 0) for (const o of circuit.nodeDiagonal) state.matrix[o] += this.gshunt;
      const f = circuit.matrix.factor();
      this.factorizations++;
      this.totalIterations++;
      if (!f.ok) return { ok: false, reason: 'singular', iterations: it + 1, unknown: f.pivotRow };
      xNew.set(circuit.rhs);
      xNew[size] = 0;
      circuit.matrix.solve(xNew);
      let converged = state.noncon === 0;
      for (let i = 0; i < size; i++) {
        const a = xNew[i];
        if (!Number.isFinite(a)) return { ok: false, reason: 'not-finite', iterations: it + 1, unknown: i };
        // Branch currents are linear in the node voltages, so once the voltages and every
        // device have converged they have too; testing them against ABSTOL only chases the
        // round-off of kilovolt nodes times siemens-sized conductances.
        if (converged && circuit.isVoltage[i]) {
          const b = x[i];
          if (Math.abs(a - b) > tol.reltol * Math.max(Math.abs(a), Math.abs(b)) + tol.vntolV) converged = false;
        }
      }
      if (converged || linear) {
        for (const d of circuit.nonlinear) {
          if (!d.converged(state, xNew)) {
            converged = false;
            break;
          }
        }
      }
      x.set(xNew);
      if (converged || linear) return { ok: true, iterations: it + 1 };
    }
    return { ok: false, reason: 'no-convergence', iterations: maxIterations };
  }
}
