/**
 * DC operating point with the SPICE fallbacks (Nagel 1975 §5.3; ngspice manual §15.3.2): plain
 * Newton–Raphson first, then GMIN stepping (a conductance from every node to ground, reduced a
 * decade at a time from 1e-2 S), then source stepping (all independent sources ramped from
 * 0 to 100 %). Capacitors are open. Failures come back as values.
 */
import type { Circuit } from '../mna/circuit';
import { NewtonSolver, DEFAULT_TOLERANCES, type NewtonTolerances } from './newton';

export type OperatingPointOutcome =
  | { ok: true; x: Float64Array; method: 'newton' | 'gmin-stepping' | 'source-stepping'; iterations: number }
  | { ok: false; reason: string; iterations: number };

export function solveOperatingPoint(circuit: Circuit, tol: NewtonTolerances = DEFAULT_TOLERANCES): OperatingPointOutcome {
  const solver = new NewtonSolver(circuit, tol);
  solver.setMode('dc', null);
  const accept = () => {
    for (const d of circuit.devices) d.accept?.();
  };
  let total = 0;
  const first = solver.solve();
  total += first.iterations;
  if (first.ok) {
    accept();
    return { ok: true, x: Float64Array.from(solver.state.x), method: 'newton', iterations: total };
  }
  // GMIN stepping.
  solver.state.x.fill(0);
  for (const d of circuit.devices) d.rollback?.();
  let ok = true;
  for (let g = 1e-2; g >= 1e-13; g /= 10) {
    solver.gshunt = g < 1e-12 ? 0 : g;
    const r = solver.solve();
    total += r.iterations;
    if (!r.ok) {
      ok = false;
      break;
    }
    accept();
  }
  solver.gshunt = 0;
  if (ok) return { ok: true, x: Float64Array.from(solver.state.x), method: 'gmin-stepping', iterations: total };
  // Source stepping.
  solver.state.x.fill(0);
  for (const d of circuit.devices) d.rollback?.();
  const steps = 20;
  for (let k = 1; k <= steps; k++) {
    solver.state.sourceFactor = k / steps;
    const r = solver.solve();
    total += r.iterations;
    if (!r.ok) {
      solver.state.sourceFactor = 1;
      return { ok: false, reason: `operating point failed (${r.reason}) during source stepping at ${(100 * k) / steps} %`, iterations: total };
    }
    accept();
  }
  solver.state.sourceFactor = 1;
  return { ok: true, x: Float64Array.from(solver.state.x), method: 'source-stepping', iterations: total };
}
