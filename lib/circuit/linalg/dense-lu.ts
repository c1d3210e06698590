/**
 * Dense LU factorisation with partial pivoting (Doolittle form, Golub & Van Loan, Matrix
 * Computations, 4th ed., Algorithm 3.4.1). Used for the small monodromy systems of the shooting
 * method (one unknown per capacitor), where the matrix is genuinely dense.
 */

export type DenseSolveOutcome = { ok: true; x: Float64Array } | { ok: false; reason: 'singular'; pivotRow: number };

export class DenseLu {
  private readonly lu: Float64Array;
  private readonly piv: Int32Array;

  private constructor(
    readonly size: number,
    lu: Float64Array,
    piv: Int32Array,
  ) {
    this.lu = lu;
    this.piv = piv;
  }

  /** Factorises a row-major n×n matrix (the input is copied). */
  static factor(matrix: Float64Array, n: number): { ok: true; lu: DenseLu } | { ok: false; reason: 'singular'; pivotRow: number } {
    const a = Float64Array.from(matrix);
    const piv = new Int32Array(n);
    let scale = 0;
    for (let i = 0; i < a.length; i++) scale = Math.max(scale, Math.abs(a[i]));
    const floor = scale * 1e-15 + 1e-300;
    for (let k = 0; k < n; k++) {
      let p = k;
      let best = Math.abs(a[k * n + k]);
      for (let r = k + 1; r < n; r++) {
        const v = Math.abs(a[r * n + k]);
        if (v > best) {
          best = v;
          p = r;
        }
      }
      piv[k] = p;
      if (!(best > floor)) return { ok: false, reason: 'singular', pivotRow: k };
      if (p !== k) {
        for (let c = 0; c < n; c++) {
          const t = a[k * n + c];
          a[k * n + c] = a[p * n + c];
          a[p * n + c] = t;
        }
      }
      const pivot = a[k * n + k];
      for (let r = k + 1; r < n; r++) {
        const l = (a[r * n + k] /= pivot);
        if (l === 0) continue;
        for (let c = k + 1; c < n; c++) a[r * n + c] -= l * a[k * n + c];
      }
    }
    return { ok: true, lu: new DenseLu(n, a, piv) };
  }

  /** Solves A·x = b; returns a new vector. */
  solve(b: ArrayLike<number>): Float64Array {
    const n = this.size;
    const a = this.lu;
    const x = Float64Array.from(b);
    // The factorisation swaps whole rows (multipliers included, as LAPACK's xGETRF), so the
    // stored L belongs to the fully permuted matrix: apply every interchange first (xGETRS).
    for (let k = 0; k < n; k++) {
      const p = this.piv[k];
      if (p !== k) {
        const t = x[k];
        x[k] = x[p];
        x[p] = t;
      }
    }
    for (let k = 0; k < n; k++) {
      const xk = x[k];
      if (xk === 0) continue;
      for (let r = k + 1; r < n; r++) x[r] -= a[r * n + k] * xk;
    }
    for (let k = n - 1; k >= 0; k--) {
      let s = x[k];
      for (let c = k + 1; c < n; c++) s -= a[k * n + c] * x[c];
      x[k] = s / a[k * n + k];
    }
    return x;
  }
}

/** Solves a dense system once; singular systems come back as a value. */
export function solveDense(matrix: Float64Array, n: number, b: ArrayLike<number>): DenseSolveOutcome {
  const f = DenseLu.factor(matrix, n);
  if (!f.ok) return f;
  return { ok: true, x: f.lu.solve(b) };
}
