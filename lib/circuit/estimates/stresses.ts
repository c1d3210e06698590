/**
 * Part stresses, stored energy, stray-capacitance efficiency and diode-drop correction of a
 * ladder (REFERENCES §5, derivations there; the stray formula is the exact discrete solution
 * checked against simulation, cf. Everhart & Lorrain, Rev. Sci. Instrum. 24, 221 (1953) [S4] for
 * the transmission-line view). Voltages are no-load values at the stated drive peak.
 */

/** No-load DC voltage across a stage capacitor (V): the bottom pumping capacitors see Vp, all others 2Vp (REFERENCES §5). */
export function capacitorNoLoadV(role: 'pumpC' | 'pump2C' | 'smoothC', stage: number, drivePeakV: number, diodeForwardDropV = 0): number {
  return (role !== 'smoothC' && stage === 1 ? 1 : 2) * (drivePeakV - diodeForwardDropV);
}

/** Peak inverse voltage of every ladder diode, 2Vp (V) ([S7]; REFERENCES §5). */
export function diodePivV(drivePeakV: number): number {
  return 2 * drivePeakV;
}

/**
 * Output efficiency with stray capacitance Cs from every pumping-column node to ground, r = Cs/C:
 * cosh θ = 1 + r/2, V0 = Vp·sinh(nθ) / (sinh(θ/2)·cosh((n+½)θ)), η = V0/(2nVp)
 * (REFERENCES §5, exact discrete result; the continuum tanh form is 4–16 % high). η = 1 at r = 0.
 */
export function strayEfficiency(n: number, strayRatio: number): number {
  if (!(strayRatio > 0)) return 1;
  const theta = Math.acosh(1 + strayRatio / 2);
  const v0OverVp = Math.sinh(n * theta) / (Math.sinh(theta / 2) * Math.cosh((n + 0.5) * theta));
  return v0OverVp / (2 * n);
}

/** Constant-Vf diode-drop correction to the output, −2n·Vf (V) ([S5], [S10]; REFERENCES §5). */
export function diodeDropCorrectionV(n: number, forwardDropV: number): number {
  return -2 * n * forwardDropV;
}

/** Energy ½CV² (J). */
export function capacitorEnergyJ(capacitanceF: number, voltageV: number): number {
  return 0.5 * capacitanceF * voltageV * voltageV;
}

/**
 * The smoothing stack seen from the output: C_eq = (Σ 1/C'_k)⁻¹ (F), its charge Q = C_eq·V0 (C)
 * and energy E = ½·C_eq·V0² (J) (REFERENCES §5; equal C gives C/n, Q = 2CVp, E = 2nCVp²).
 */
export function outputStack(smoothC: number[], outputV: number): { equivalentF: number; chargeC: number; energyJ: number } {
  const equivalentF = 1 / smoothC.reduce((s, c) => s + 1 / c, 0);
  return { equivalentF, chargeC: equivalentF * Math.abs(outputV), energyJ: capacitorEnergyJ(equivalentF, outputV) };
}
