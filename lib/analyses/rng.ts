/**
 * Seeded pseudo-random numbers for the tolerance spread. mulberry32 (Tommy Ettinger's 32-bit
 * generator, public domain; a common choice for small reproducible streams) gives uniform draws
 * in [0, 1); normal draws use the Box–Muller transform. Every sample of a spread has its own
 * stream, seeded from the run's seed and the sample's index ({@link sampleSeed}), so sample k is
 * the same whether it is computed first, last, or again after a worker restart.
 */

/** A function returning uniform numbers in [0, 1). */
export type Rng = () => number;

/** mulberry32 seeded with the 32-bit integer `seed`. */
export function mulberry32(seed: number): Rng {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The seed of sample `index` of a run seeded `seed` (a murmur3-style finaliser of both). */
export function sampleSeed(seed: number, index: number): number {
  let h = (seed >>> 0) ^ Math.imul(index + 1, 0x9e3779b1);
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/** A standard normal draw (mean 0, σ 1) by Box–Muller from two uniform draws of `rng`. */
export function normal(rng: Rng): number {
  let u = rng();
  while (u <= 0) u = rng();
  const v = rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
