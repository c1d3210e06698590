/**
 * Design equations of the full-wave (symmetrical, two-phase, push-pull) cascade: two pumping
 * columns driven in antiphase sharing one smoothing column. Sources: "Various Voltage
 * Multipliers" [S2] for the textbook forms, and the crest-model derivation of REFERENCES §2
 * (checked there by simulation) for drop of max, drop of mean and ripple. Conventions as in
 * `half-wave.ts`: n full stages (×2n), ripple peak-to-peak, arrays bottom first.
 */

/** [S2] drop of the maximum ΔV = (I/(6fC))(n³ + 2n) (V); its n² term disagrees with the derivation (REFERENCES §2). */
export function fullWaveTextbookDropV(n: number, loadCurrentA: number, frequencyHz: number, capacitanceF: number): number {
  return (loadCurrentA / (6 * frequencyHz * capacitanceF)) * (n ** 3 + 2 * n);
}

/** [S2] ripple p-p I·n/(2fC) (V), agrees with the derivation. */
export function fullWaveTextbookRippleV(n: number, loadCurrentA: number, frequencyHz: number, capacitanceF: number): number {
  return (loadCurrentA * n) / (2 * frequencyHz * capacitanceF);
}

/** Ripple p-p per unit charge: (1/2)·Σ 1/C'_k (1/F) (REFERENCES §2, deriv); the smoothing column is recharged twice a cycle. */
export function fullWaveRippleCoefficient(smoothC: number[]): number {
  return smoothC.reduce((s, c) => s + 1 / c, 0) / 2;
}

/**
 * Drop of the maximum per unit charge: (1/2)·Σ m_k²/C_k (1/F), C_k the pumping capacitance of stage
 * k (the two antiphase columns taken equal; pass their mean). Equal C gives u·(n³/6 + n²/4 + n/12)
 * (REFERENCES §2, deriv). The smoothing capacitors do not enter the drop of the maximum.
 */
export function fullWaveDropMaxCoefficient(pumpC: number[]): number {
  const n = pumpC.length;
  let s = 0;
  for (let k = 1; k <= n; k++) s += (n - k + 1) ** 2 / pumpC[k - 1];
  return s / 2;
}

/** Drop of the mean per unit charge: drop of max + ripple/2; equal C gives u·(n³/6 + n²/4 + n/3) (REFERENCES §2). */
export function fullWaveDropMeanCoefficient(pumpC: number[], smoothC: number[]): number {
  return fullWaveDropMaxCoefficient(pumpC) + fullWaveRippleCoefficient(smoothC) / 2;
}

/** Leading-order optimum stages n_opt = 2·√(Vp·f·C/I) (REFERENCES §2, deriv); V_max = (4/3)·n_opt·Vp. */
export function fullWaveOptimumStagesLeading(drivePeakV: number, frequencyHz: number, capacitanceF: number, loadCurrentA: number): number {
  return 2 * Math.sqrt((drivePeakV * frequencyHz * capacitanceF) / loadCurrentA);
}

/**
 * Optimum stages from the full cubic of the derived mean drop u·(n³/6 + n²/4 + n/3):
 * dV/dn = 0 gives n = −1/2 + √(1/4 − 2/3 + 4Vp·fC/I) (deriv, this file).
 */
export function fullWaveOptimumStagesCubic(drivePeakV: number, frequencyHz: number, capacitanceF: number, loadCurrentA: number): number {
  return -0.5 + Math.sqrt(Math.max(0, 0.25 - 2 / 3 + (4 * drivePeakV * frequencyHz * capacitanceF) / loadCurrentA));
}

/** Warm-up: N90 ≈ 1.4n², N99 ≈ 2.8n² cycles (REFERENCES §6, fits to simulation). */
export function fullWaveWarmupCycles(n: number): { cycles90: number; cycles99: number } {
  return { cycles90: 1.4 * n * n, cycles99: 2.8 * n * n };
}
