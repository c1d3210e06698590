/**
 * Design equations of the classic half-wave (single-phase) Cockcroft–Walton / Greinacher
 * cascade. Sources: textbook drop and ripple as printed by J. Lux, "Cockroft Walton Voltage
 * Multipliers" [S1] and "Various Voltage Multipliers" [S2] (also Kuffel, Zaengl & Kuffel 2000
 * §2.2.2 and Naidu & Kamaraju §6.1.3, from memory); the exact crest-model drop and ripple for
 * arbitrary capacitors are the derivation of REFERENCES §1.3 (charge moves only at the crests,
 * every diode passes q = I/f per cycle). Conventions: n counts full stages (two diodes, two
 * capacitors, ×2 each), ripple is peak-to-peak, "drop of max" is the fall of the output maximum
 * below 2nVp and "drop of mean" the fall of the DC level. Arrays are indexed by stage, bottom
 * first (index 0 = stage 1, m_k = n − k + 1 stages from k to the top).
 */

/** Charge delivered to the load per cycle q = I/f (C). */
export function chargePerCycleC(loadCurrentA: number, frequencyHz: number): number {
  return loadCurrentA / frequencyHz;
}

/** Textbook drop ΔV = (I/fC)(2n³/3 + n²/2 − n/6) (V) [S1][S2]; matches the exact drop of the mean in n³, n². */
export function textbookDropV(n: number, loadCurrentA: number, frequencyHz: number, capacitanceF: number): number {
  const u = loadCurrentA / (frequencyHz * capacitanceF);
  return u * ((2 * n ** 3) / 3 + n ** 2 / 2 - n / 6);
}

/** Textbook ripple, peak-to-peak, δV = (I/fC)·n(n+1)/2 (V) [S1][S2]; Kuffel's δV is half of this (mem). */
export function textbookRippleV(n: number, loadCurrentA: number, frequencyHz: number, capacitanceF: number): number {
  const u = loadCurrentA / (frequencyHz * capacitanceF);
  return (u * n * (n + 1)) / 2;
}

/** Stages from stage k (1-based) to the top, m_k = n − k + 1. */
function m(n: number, k: number): number {
  return n - k + 1;
}

/** Exact crest-model ripple p-p per unit charge: Σ m_k / C'_k (1/F); multiply by q (REFERENCES §1.3, deriv). */
export function halfWaveRippleCoefficient(smoothC: number[]): number {
  const n = smoothC.length;
  let s = 0;
  for (let k = 1; k <= n; k++) s += m(n, k) / smoothC[k - 1];
  return s;
}

/**
 * Exact crest-model drop of the output maximum per unit charge (1/F), arbitrary capacitors:
 * Σ m_k²/C_k + Σ ((m_k−1)² + (m_k−1)/2)/C'_k (REFERENCES §1.3, deriv); multiply by q = I/f.
 */
export function halfWaveDropMaxCoefficient(pumpC: number[], smoothC: number[]): number {
  const n = pumpC.length;
  let s = 0;
  for (let k = 1; k <= n; k++) {
    const mk = m(n, k);
    s += (mk * mk) / pumpC[k - 1] + ((mk - 1) ** 2 + (mk - 1) / 2) / smoothC[k - 1];
  }
  return s;
}

/** Exact crest-model drop of the output mean per unit charge (1/F): drop of max + ripple/2 (REFERENCES §1.3). */
export function halfWaveDropMeanCoefficient(pumpC: number[], smoothC: number[]): number {
  return halfWaveDropMaxCoefficient(pumpC, smoothC) + halfWaveRippleCoefficient(smoothC) / 2;
}

/** Leading-order optimum stage count n_opt = √(Vp·f·C/I) (Kuffel, Naidu, mem; [S2] "for n > 5"). */
export function optimumStagesLeading(drivePeakV: number, frequencyHz: number, capacitanceF: number, loadCurrentA: number): number {
  return Math.sqrt((drivePeakV * frequencyHz * capacitanceF) / loadCurrentA);
}

/** Optimum stage count from the full textbook cubic, n_opt = −1/4 + √(7/48 + Vp·f·C/I) ([S2], simplified in REFERENCES §1.1). */
export function optimumStagesCubic(drivePeakV: number, frequencyHz: number, capacitanceF: number, loadCurrentA: number): number {
  return -0.25 + Math.sqrt(7 / 48 + (drivePeakV * frequencyHz * capacitanceF) / loadCurrentA);
}

/** Optimum stage count with the exact drop of the mean, n_opt = −1/4 + √(Vp·f·C/I − 5/48) (REFERENCES §1.3, deriv). */
export function optimumStagesExactMean(drivePeakV: number, frequencyHz: number, capacitanceF: number, loadCurrentA: number): number {
  return -0.25 + Math.sqrt(Math.max(0, (drivePeakV * frequencyHz * capacitanceF) / loadCurrentA - 5 / 48));
}

/** Maximum output at the leading-order optimum, V_max = (4/3)·n_opt·Vp (V) (Kuffel, Naidu, mem). */
export function maxOutputLeadingV(optimumStages: number, drivePeakV: number): number {
  return (4 / 3) * optimumStages * drivePeakV;
}

/** Loaded output with the textbook drop, 2nVp − ΔV_textbook (V), for non-integer n too (to evaluate at n_opt). */
export function textbookLoadedOutputV(n: number, drivePeakV: number, loadCurrentA: number, frequencyHz: number, capacitanceF: number): number {
  return 2 * n * drivePeakV - textbookDropV(n, loadCurrentA, frequencyHz, capacitanceF);
}

/**
 * Cycles to reach 90 % and 99 % of the final 2nVp from power-on, ideal source, no load:
 * N90 ≈ 3.4n², N99 ≈ 7.1n² (REFERENCES §6, fits to simulation; no published estimate found).
 */
export function halfWaveWarmupCycles(n: number): { cycles90: number; cycles99: number } {
  return { cycles90: 3.4 * n * n, cycles99: 7.1 * n * n };
}

/**
 * A component manufacturer's ripple formula [S3], Vrip = I·(N² + N/2)/(8·f·C), with N the number of
 * DIODES (= 2n full stages). Kept to show the convention conflict of REFERENCES §1.2/§8 E3: its n²
 * term agrees with the textbook ripple, its linear term does not (it sits closer to square-wave drive).
 */
export function manufacturerRippleV(diodes: number, loadCurrentA: number, frequencyHz: number, capacitanceF: number): number {
  return (loadCurrentA * (diodes * diodes + diodes / 2)) / (8 * frequencyHz * capacitanceF);
}
