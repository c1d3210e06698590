/**
 * Banded LU factorisation with partial (row) pivoting, the scheme of LAPACK's xGBTRF/xGBTRS
 * (Anderson et al., LAPACK Users' Guide, 3rd ed., SIAM 1999, §2.4.2 and §5.3.2; Golub & Van
 * Loan, Matrix Computations, 4th ed., §4.3): with lower bandwidth kl and upper bandwidth ku,
 * row interchanges widen U to kl + ku, so each row keeps a window of 2·kl + ku + 1 entries.
 *
 * Decompose once, solve many: the factors stay in the object and `solve` may be called for any
 * number of right-hand sides (the shooting method's sensitivity columns use that).
 */

/** Outcome of a factorisation: a value, never an exception. */
export type FactorOutcome = { ok: true } | { ok: false; reason: 'singular'; pivotRow: number };

export class BandMatrix {
  /** Row-major band storage, row i holds columns i−kl … i+kl+ku. */
  readonly data: Float64Array;
  readonly width: number;
  readonly pivots: Int32Array;
  private factored = false;

  constructor(
    readonly size: number,
    readonly lower: number,
    readonly upper: number,
  ) {
    this.width = 2 * lower + upper + 1;
    // One extra cell past the band: a write-only sink for stamps that touch ground.
    this.data = new Float64Array(size * this.width + 1);
    this.pivots = new Int32Array(size);
  }

  /** Offset of the write-only sink cell (entries in a ground row or column land here). */
  get trashOffset(): number {
    return this.size * this.width;
  }

  /** Storage offset of entry (row, col), or −1 when it lies outside the band. */
  offset(row: number, col: number): number {
    const d = col - row + this.lower;
    if (row < 0 || col < 0 || row >= this.size || col >= this.size || d < 0 || d >= this.width) return -1;
    return row * this.width + d;
  }

  /** Offset of an entry of the original (unfactored) pattern; must lie within kl/ku. */
  patternOffset(row: number, col: number): number {
    if (col - row > this.upper || row - col > this.lower) {
      throw new Error(`entry (${row},${col}) outside the band kl=${this.lower} ku=${this.upper}`);
    }
    return this.offset(row, col);
  }

  clear(): void {
    this.data.fill(0);
    this.factored = false;
  }

  get(row: number, col: number): number {
    const o = this.offset(row, col);
    return o < 0 ? 0 : this.data[o];
  }

  /** Factorises in place. A pivot below `pivotFloor`·(largest entry of its column) counts as singular. */
  factor(pivotFloor = 1e-300): FactorOutcome {
    const n = this.size;
    const kl = this.lower;
    const w = this.width;
    const a = this.data;
    const span = kl + this.upper;
    for (let k = 0; k < n; k++) {
      const lastRow = Math.min(k + kl, n - 1);
      let p = k;
      let best = Math.abs(a[k * w + kl]);
      for (let r = k + 1; r <= lastRow; r++) {
        const v = Math.abs(a[r * w + k - r + kl]);
        if (v > best) {
          best = v;
          p = r;
        }
      }
      this.pivots[k] = p;
      if (!(best > pivotFloor)) {
        this.factored = false;
        return { ok: false, reason: 'singular', pivotRow: k };
      }
      const lastCol = Math.min(k + span, n - 1);
      if (p !== k) {
        for (let c = k; c <= lastCol; c++) {
          const ok = k * w + c - k + kl;
          const op = p * w + c - p + kl;
          const t = a[ok];
          a[ok] = a[op];
          a[op] = t;
        }
      }
      const pivot = a[k * w + kl];
      const rowK = k * w - k + kl;
      for (let r = k + 1; r <= lastRow; r++) {
        const rowR = r * w - r + kl;
        const lo = rowR + k;
        const l = a[lo] / pivot;
        a[lo] = l;
        if (l === 0) continue;
        for (let c = k + 1; c <= lastCol; c++) a[rowR + c] -= l * a[rowK + c];
      }
    }
    this.factored = true;
    return { ok: true };
  }

  /** Solves A·x = b in place (b becomes x) with the stored factors. */
  solve(b: Float64Array): void {
    if (!this.factored) throw new Error('BandMatrix.solve called before a successful factor()');
    const n = this.size;
    const kl = this.lower;
    const w = this.width;
    const a = this.data;
    const span = kl + this.upper;
    for (let k = 0; k < n; k++) {
      const p = this.pivots[k];
      if (p !== k) {
        const t = b[k];
        b[k] = b[p];
        b[p] = t;
      }
      const bk = b[k];
      if (bk === 0) continue;
      const lastRow = Math.min(k + kl, n - 1);
      for (let r = k + 1; r <= lastRow; r++) b[r] -= a[r * w + k - r + kl] * bk;
    }
    for (let k = n - 1; k >= 0; k--) {
      const rowK = k * w - k + kl;
      const lastCol = Math.min(k + span, n - 1);
      let s = b[k];
      for (let c = k + 1; c <= lastCol; c++) s -= a[rowK + c] * b[c];
      b[k] = s / a[rowK + k];
    }
  }

  /**
   * Solves A·X = B in place for `count` right-hand sides at once (B becomes X). B is row-major
   * with `count` values per row (row i holds unknown i of every right-hand side), so each
   * elimination step updates whole contiguous rows: the same arithmetic as `count` calls of
   * `solve`, with one pass over the factors instead of one per column.
   */
  solveMany(b: Float64Array, count: number): void {
    if (!this.factored) throw new Error('BandMatrix.solveMany called before a successful factor()');
    const n = this.size;
    const kl = this.lower;
    const w = this.width;
    const a = this.data;
    const span = kl + this.upper;
    for (let k = 0; k < n; k++) {
      const p = this.pivots[k];
      const rk = k * count;
      if (p !== k) {
        const rp = p * count;
        for (let j = 0; j < count; j++) {
          const t = b[rk + j];
          b[rk + j] = b[rp + j];
          b[rp + j] = t;
        }
      }
      const lastRow = Math.min(k + kl, n - 1);
      for (let r = k + 1; r <= lastRow; r++) {
        const l = a[r * w + k - r + kl];
        if (l === 0) continue;
        const rr = r * count;
        for (let j = 0; j < count; j++) b[rr + j] -= l * b[rk + j];
      }
    }
    for (let k = n - 1; k >= 0; k--) {
      const rowK = k * w - k + kl;
      const lastCol = Math.min(k + span, n - 1);
      const rk = k * count;
      for (let c = k + 1; c <= lastCol; c++) {
        const u = a[rowK + c];
        if (u === 0) continue;
        const rc = c * count;
        for (let j = 0; j < count; j++) b[rk + j] -= u * b[rc + j];
      }
      const inv = 1 / a[rowK + k];
      for (let j = 0; j < count; j++) b[rk + j] *= inv;
    }
  }

  /**
   * Dense P, L, U with P·A = L·U, rebuilt from the interleaved LAPACK-style storage by applying
   * each later interchange to the earlier multiplier columns (for tests and diagnostics).
   */
  denseFactors(): { perm: Int32Array; lower: number[][]; upper: number[][] } {
    const n = this.size;
    const L: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j): number => (i === j ? 1 : 0)));
    const U = Array.from({ length: n }, () => new Array<number>(n).fill(0));
    const perm = Int32Array.from({ length: n }, (_, i) => i);
    for (let k = 0; k < n; k++) {
      const p = this.pivots[k];
      if (p !== k) {
        const t = perm[k];
        perm[k] = perm[p];
        perm[p] = t;
        for (let c = 0; c < k; c++) {
          const u = L[k][c];
          L[k][c] = L[p][c];
          L[p][c] = u;
        }
      }
      for (let r = k + 1; r <= Math.min(k + this.lower, n - 1); r++) L[r][k] = this.get(r, k);
    }
    for (let i = 0; i < n; i++) for (let j = i; j <= Math.min(i + this.lower + this.upper, n - 1); j++) U[i][j] = this.get(i, j);
    return { perm, lower: L, upper: U };
  }
}
