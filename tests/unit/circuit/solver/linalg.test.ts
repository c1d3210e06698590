// Invariants of the linear solvers (Golub & Van Loan, Matrix Computations, 4th ed., §3.4, §4.3):
// residual ‖A·x − b‖ small, P·A = L·U, singular matrices reported as values.
import { describe, expect, it } from 'vitest';
import { BandMatrix } from '@/lib/circuit/linalg/band-lu';
import { DenseLu } from '@/lib/circuit/linalg/dense-lu';
import { bandwidths, reverseCuthillMcKee } from '@/lib/circuit/linalg/rcm';

function rng(seed: number) {
  let s = seed;
  return () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647 - 0.5;
  };
}

describe('banded LU with partial pivoting', () => {
  for (const [n, kl, ku] of [
    [12, 2, 3],
    [40, 4, 4],
    [60, 1, 5],
  ]) {
    it(`n=${n} kl=${kl} ku=${ku}: ‖Ax−b‖ and P·A = L·U`, () => {
      const r = rng(n * 31 + kl);
      const A = Array.from({ length: n }, () => new Array<number>(n).fill(0));
      const m = new BandMatrix(n, kl, ku);
      for (let i = 0; i < n; i++)
        for (let j = Math.max(0, i - kl); j <= Math.min(n - 1, i + ku); j++) {
          // Weak diagonal forces row interchanges.
          const v = (i === j ? 0.05 : 1) * r();
          A[i][j] = v;
          m.data[m.patternOffset(i, j)] = v;
        }
      const b = Float64Array.from({ length: n }, r);
      expect(m.factor().ok).toBe(true);
      expect(Array.from(m.pivots).some((p, k) => p !== k)).toBe(true);
      const x = Float64Array.from(b);
      m.solve(x);
      // Normwise backward error ‖Ax − b‖ / (‖A‖·‖x‖ + ‖b‖), which a stable LU keeps near ε.
      let res = 0;
      let normA = 0;
      let normX = 0;
      let normB = 0;
      for (let i = 0; i < n; i++) {
        let s = -b[i];
        for (let j = 0; j < n; j++) {
          s += A[i][j] * x[j];
          normA = Math.max(normA, Math.abs(A[i][j]));
        }
        res = Math.max(res, Math.abs(s));
        normX = Math.max(normX, Math.abs(x[i]));
        normB = Math.max(normB, Math.abs(b[i]));
      }
      expect(res / (n * normA * normX + normB)).toBeLessThan(1e-13);
      const { perm, lower, upper } = m.denseFactors();
      let worst = 0;
      for (let i = 0; i < n; i++)
        for (let j = 0; j < n; j++) {
          let s = 0;
          for (let k = 0; k < n; k++) s += lower[i][k] * upper[k][j];
          worst = Math.max(worst, Math.abs(s - A[perm[i]][j]));
        }
      expect(worst).toBeLessThan(1e-10);
    });
  }

  it('reports a singular matrix as a value', () => {
    const m = new BandMatrix(3, 1, 1);
    m.data[m.patternOffset(0, 0)] = 1;
    m.data[m.patternOffset(1, 0)] = 1;
    m.data[m.patternOffset(2, 2)] = 1;
    const f = m.factor();
    expect(f.ok).toBe(false);
  });
});

describe('dense LU', () => {
  it('solves a known 3×3 system', () => {
    const f = DenseLu.factor(Float64Array.from([2, 1, 1, 4, -6, 0, -2, 7, 2]), 3);
    expect(f.ok).toBe(true);
    if (!f.ok) return;
    const x = f.lu.solve([5, -2, 9]);
    // Golub & Van Loan style hand check: x = (1, 1, 2).
    expect(Array.from(x).map((v) => Math.round(v * 1e12) / 1e12)).toEqual([1, 1, 2]);
  });

  for (const n of [5, 30, 80]) {
    it(`n=${n} with row interchanges at many steps: ‖Ax−b‖ small`, () => {
      // A weak diagonal makes partial pivoting swap rows after multipliers exist, which the
      // solve must apply before the forward substitution (LAPACK xGETRF/xGETRS).
      const r = rng(n * 7 + 3);
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = (i === j ? 1e-3 : 1) * r();
      const b = Array.from({ length: n }, () => r());
      const f = DenseLu.factor(a, n);
      expect(f.ok).toBe(true);
      if (!f.ok) return;
      const x = f.lu.solve(b);
      let worst = 0;
      let scale = 0;
      for (let i = 0; i < n; i++) {
        let s = -b[i];
        for (let j = 0; j < n; j++) s += a[i * n + j] * x[j];
        worst = Math.max(worst, Math.abs(s));
        scale = Math.max(scale, Math.abs(x[i]));
      }
      expect(worst / Math.max(1, scale)).toBeLessThan(1e-10);
    });
  }
});

describe('reverse Cuthill–McKee', () => {
  it('brings a shuffled chain back to bandwidth 1', () => {
    const n = 30;
    const shuffle = Array.from({ length: n }, (_, i) => (i * 7) % n);
    const edges: [number, number][] = [];
    for (let i = 0; i + 1 < n; i++) edges.push([shuffle[i], shuffle[i + 1]]);
    const identity = Int32Array.from({ length: n }, (_, i) => i);
    expect(bandwidths(edges, identity).upper).toBeGreaterThan(5);
    const order = reverseCuthillMcKee(n, edges);
    const pos = new Int32Array(n);
    order.forEach((old, k) => (pos[old] = k));
    const bw = bandwidths(edges, pos);
    expect(Math.max(bw.lower, bw.upper)).toBe(1);
  });
});
