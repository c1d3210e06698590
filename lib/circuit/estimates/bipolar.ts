/**
 * The bipolar (±) arrangement: a positive and a negative half-wave ladder of n stages each, fed
 * in phase from one source about a common ground, the load across the two outputs (REFERENCES
 * §3, derivation checked by simulation there). Each ladder carries the full load current and
 * drops as a single ladder does; the crest jumps of the two ladders partly cancel in V+ − V−.
 */
import { halfWaveDropMaxCoefficient, halfWaveDropMeanCoefficient } from './half-wave';

/** No-load voltage across the two outputs, 4n·Vp (V). */
export function bipolarNoLoadV(n: number, drivePeakV: number): number {
  return 4 * n * drivePeakV;
}

/** Total drop of the mean per unit charge: 2 × the single ladder's (1/F) (REFERENCES §3). */
export function bipolarDropMeanCoefficient(pumpC: number[], smoothC: number[]): number {
  return 2 * halfWaveDropMeanCoefficient(pumpC, smoothC);
}

/** Total drop of the maximum per unit charge: 2 × the single ladder's (1/F) (REFERENCES §3, deriv). */
export function bipolarDropMaxCoefficient(pumpC: number[], smoothC: number[]): number {
  return 2 * halfWaveDropMaxCoefficient(pumpC, smoothC);
}

/** Ripple p-p of V+ − V− per unit charge, in-phase drive: Σ 1/C'_k (1/F), at 2f; equal C gives n·u (REFERENCES §3, deriv). */
export function bipolarRippleCoefficient(smoothC: number[]): number {
  return smoothC.reduce((s, c) => s + 1 / c, 0);
}
