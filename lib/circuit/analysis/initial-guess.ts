/**
 * Initial state for the periodic steady state: the no-load, ideal-diode charge state of a
 * diode–capacitor ladder, found for any netlist in two steps (deriv; the ladder result is the
 * textbook no-load picture, C_1 at Vp and every other capacitor at 2·Vp, Kuffel, Zaengl &
 * Kuffel 2000 §2.2.2 (mem)):
 *
 * 1. the sinusoidal (phasor) solution of the linear part with every diode junction open,
 *    giving each node's AC swing (`phasorSolution`);
 * 2. each diode at no load just touches conduction at its crest, so its cathode sits
 *    |V_anode − V_cathode| (phasor difference) above its anode; these offsets are propagated
 *    from ground along diodes and resistors.
 */
import { BandMatrix } from '../linalg/band-lu';
import type { Circuit } from '../mna/circuit';

export interface InitialGuess {
  /** Node voltages and branch currents at t = 0 (solution layout). */
  x: Float64Array;
  /** Branch voltage of every charge slot at t = 0. */
  branchV: Float64Array;
}

/** AC phasor of every unknown (drive at one frequency), diodes open; ground reads 0. */
export interface PhasorSolution {
  re: (offset: number) => number;
  im: (offset: number) => number;
}

/**
 * Sinusoidal steady state of the linear part at `frequencyHz` with every diode junction open
 * (a conductance of 1e-8·ωC_min keeps nodes fed only through diodes defined), by modified
 * nodal analysis with complex admittances written as a real system of twice the size in an
 * interleaved, still banded, ordering. A phasor V stands for v(t) = Im(V·e^{jωt}).
 */
export function phasorSolution(circuit: Circuit, frequencyHz: number): PhasorSolution | null {
  const n = circuit.size;
  const omega = 2 * Math.PI * frequencyHz;
  const band = new BandMatrix(2 * n, 2 * circuit.band.lower + 1, 2 * circuit.band.upper + 1);
  const rhs = new Float64Array(2 * n);
  let cMin = Infinity;
  for (const c of circuit.capacitors) cMin = Math.min(cMin, c.capacitanceF);
  const g0 = Number.isFinite(cMin) ? 1e-8 * omega * cMin : 1e-12;
  const add = (r: number, c: number, g: number, b: number) => {
    if (r >= n || c >= n) return;
    band.data[band.offset(2 * r, 2 * c)] += g;
    band.data[band.offset(2 * r, 2 * c + 1)] -= b;
    band.data[band.offset(2 * r + 1, 2 * c)] += b;
    band.data[band.offset(2 * r + 1, 2 * c + 1)] += g;
  };
  const admittance = (a: number, b: number, g: number, s: number) => {
    add(a, a, g, s);
    add(a, b, -g, -s);
    add(b, a, -g, -s);
    add(b, b, g, s);
  };
  for (let i = 0; i < n; i++) if (circuit.isVoltage[i]) add(i, i, g0, 0);
  for (const r of circuit.resistors) admittance(r.ia, r.ib, r.conductanceS, 0);
  for (const c of circuit.capacitors) admittance(c.ia, c.ib, 0, omega * c.capacitanceF);
  for (const d of circuit.diodes) {
    if (d.ij !== d.ia) admittance(d.ia, d.ij, 1 / d.rsOhm, 0);
    admittance(d.ij, d.ik, g0, 0);
  }
  for (const v of circuit.voltageSources) {
    add(v.ip, v.ibr, 1, 0);
    add(v.in, v.ibr, -1, 0);
    add(v.ibr, v.ip, 1, 0);
    add(v.ibr, v.in, -1, 0);
    const s = v.sine;
    if (s && Math.abs(s.frequencyHz - frequencyHz) <= 1e-9 * frequencyHz) {
      // v(t) = Im(V·e^{jωt}) with V = A·e^{j(φ − ω·TD)}.
      const phi = (s.phaseDeg * Math.PI) / 180 - omega * s.delayS;
      rhs[2 * v.ibr] += s.amplitude * Math.cos(phi);
      rhs[2 * v.ibr + 1] += s.amplitude * Math.sin(phi);
    }
  }
  if (!band.factor().ok) return null;
  band.solve(rhs);
  return { re: (i) => (i >= n ? 0 : rhs[2 * i]), im: (i) => (i >= n ? 0 : rhs[2 * i + 1]) };
}

export function noLoadGuess(circuit: Circuit, frequencyHz: number): InitialGuess | null {
  const n = circuit.size;
  const phasor = phasorSolution(circuit, frequencyHz);
  if (!phasor) return null;
  const { re, im } = phasor;

  // DC offsets propagated from ground.
  const dc = new Float64Array(n + 1);
  const known = new Uint8Array(n + 1);
  known[n] = 1;
  for (const v of circuit.voltageSources) {
    if (v.in === n) {
      known[v.ip] = 1;
      dc[v.ip] = v.sine ? v.sine.offsetV : v.dcV;
    }
  }
  // Diodes and sources fix offsets first; resistors (no DC drop assumed) only fill in nodes the
  // diodes leave open, so a load resistor cannot pull the output to ground.
  type Link = { a: number; b: number; offset: number };
  const strong: Link[] = [];
  const weak: Link[] = [];
  for (const d of circuit.diodes) {
    const peak = Math.hypot(re(d.ia) - re(d.ik), im(d.ia) - im(d.ik));
    strong.push({ a: d.ij, b: d.ik, offset: peak });
    if (d.ij !== d.ia) strong.push({ a: d.ia, b: d.ij, offset: 0 });
  }
  for (const v of circuit.voltageSources) strong.push({ a: v.in, b: v.ip, offset: v.sine ? v.sine.offsetV : v.dcV });
  for (const r of circuit.resistors) weak.push({ a: r.ia, b: r.ib, offset: 0 });
  const propagate = (links: Link[], once: boolean): boolean => {
    let any = false;
    for (let changed = true; changed; ) {
      changed = false;
      for (const l of links) {
        if (known[l.a] && !known[l.b]) {
          dc[l.b] = dc[l.a] + l.offset;
          known[l.b] = 1;
          changed = true;
        } else if (known[l.b] && !known[l.a]) {
          dc[l.a] = dc[l.b] - l.offset;
          known[l.a] = 1;
          changed = true;
        }
      }
      any ||= changed;
      if (once) break;
    }
    return any;
  };
  do propagate(strong, false);
  while (propagate(weak, true));
  const x = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) x[i] = circuit.isVoltage[i] ? dc[i] + im(i) : 0;
  const branchV = new Float64Array(circuit.slots.length);
  const store = circuit.createChargeStore({ name: 'none', order: 1, coefficients: () => undefined, truncationError: () => 0 });
  for (let s = 0; s < branchV.length; s++) branchV[s] = x[store.pos[s]] - x[store.neg[s]];
  return { x, branchV };
}
