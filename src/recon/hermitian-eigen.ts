/**
 * Eigendecomposition of a complex Hermitian n×n matrix by the cyclic Jacobi method
 * (Jacobi 1846; the complex form as in Golub & Van Loan, "Matrix Computations", §8.5 — from memory).
 * Written here because the well-kept npm linear-algebra packages offer real symmetric
 * decompositions only; n is small (the Hankel window size, ≤ a few hundred).
 *
 * Each rotation zeroes a_pq: with ω = conj(a_pq)/|a_pq| the phase D = diag(1, ω) makes the pivot
 * real, then the real Jacobi rotation (c, s) of Numerical Recipes §11.1 (from memory) annihilates it:
 *   G = D·[[c, s], [−s, c]],  A ← Gᴴ A G,  V ← V G.
 * Sweeps stop when the off-diagonal Frobenius norm is below 1e-15 of the total (or after 60 sweeps).
 * Storage: interleaved complex, row-major, a[2(i·n + j)] = Re a_ij.
 */
export class HermitianEigenSolver {
  readonly n: number;
  /** Working copy of the matrix (destroyed). */
  private readonly a: Float64Array;
  /** Eigenvectors as columns, interleaved complex row-major: v[2(i·n + k)] = Re (v_k)_i. */
  readonly vectors: Float64Array;
  /** Eigenvalues in descending order after `solve`. */
  readonly values: Float64Array;
  private readonly order: Int32Array;
  private readonly sortedVectors: Float64Array;
  sweeps = 0;

  constructor(n: number) {
    if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be a positive integer, got ${n}`);
    this.n = n;
    this.a = new Float64Array(2 * n * n);
    this.vectors = new Float64Array(2 * n * n);
    this.values = new Float64Array(n);
    this.order = new Int32Array(n);
    this.sortedVectors = new Float64Array(2 * n * n);
  }

  /**
   * Decomposes `matrix` (Hermitian; only its values are read, the upper triangle is trusted):
   * afterwards `values[k]` (descending) and column k of `vectors` satisfy A v_k = λ_k v_k.
   */
  solve(matrix: Float64Array): void {
    const { n, a } = this;
    const v = this.sortedVectors;
    if (matrix.length !== 2 * n * n) throw new RangeError(`matrix must hold 2·n² = ${2 * n * n} numbers`);
    // Symmetrise from the upper triangle so tiny asymmetries from summation order do not matter.
    for (let i = 0; i < n; i++) {
      a[2 * (i * n + i)] = matrix[2 * (i * n + i)];
      a[2 * (i * n + i) + 1] = 0;
      for (let j = i + 1; j < n; j++) {
        const re = matrix[2 * (i * n + j)];
        const im = matrix[2 * (i * n + j) + 1];
        a[2 * (i * n + j)] = re;
        a[2 * (i * n + j) + 1] = im;
        a[2 * (j * n + i)] = re;
        a[2 * (j * n + i) + 1] = -im;
      }
    }
    v.fill(0);
    for (let i = 0; i < n; i++) v[2 * (i * n + i)] = 1;
    let total = 0;
    for (let i = 0; i < 2 * n * n; i++) total += a[i] * a[i];
    const threshold = total * 1e-30;
    let sweep = 0;
    for (; sweep < 60; sweep++) {
      let off = 0;
      for (let p = 0; p < n; p++) {
        for (let q = p + 1; q < n; q++) {
          const k = 2 * (p * n + q);
          off += a[k] * a[k] + a[k + 1] * a[k + 1];
        }
      }
      if (2 * off <= threshold) break;
      for (let p = 0; p < n - 1; p++) {
        for (let q = p + 1; q < n; q++) this.rotate(p, q, v);
      }
    }
    this.sweeps = sweep;
    // Sort descending.
    const order = this.order;
    for (let i = 0; i < n; i++) order[i] = i;
    // Insertion sort of the indices by diagonal value, descending (n is small; no allocation).
    for (let i = 1; i < n; i++) {
      const key = order[i];
      const value = a[2 * (key * n + key)];
      let j = i - 1;
      while (j >= 0 && a[2 * (order[j] * n + order[j])] < value) {
        order[j + 1] = order[j];
        j--;
      }
      order[j + 1] = key;
    }
    for (let k = 0; k < n; k++) {
      const src = order[k];
      this.values[k] = a[2 * (src * n + src)];
      for (let i = 0; i < n; i++) {
        this.vectors[2 * (i * n + k)] = v[2 * (i * n + src)];
        this.vectors[2 * (i * n + k) + 1] = v[2 * (i * n + src) + 1];
      }
    }
  }

  private rotate(p: number, q: number, v: Float64Array): void {
    const { n, a } = this;
    const kpq = 2 * (p * n + q);
    const re = a[kpq];
    const im = a[kpq + 1];
    const mod = Math.hypot(re, im);
    if (mod === 0) return;
    const app = a[2 * (p * n + p)];
    const aqq = a[2 * (q * n + q)];
    // ω = conj(a_pq)/|a_pq| = wr + i·wi.
    const wr = re / mod;
    const wi = -im / mod;
    const theta = (aqq - app) / (2 * mod);
    const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
    const c = 1 / Math.sqrt(t * t + 1);
    const s = t * c;
    // Columns: A ← A G for rows r ≠ p, q; then rows by Hermitian symmetry.
    for (let r = 0; r < n; r++) {
      if (r === p || r === q) continue;
      const kp = 2 * (r * n + p);
      const kq = 2 * (r * n + q);
      const rpr = a[kp];
      const rpi = a[kp + 1];
      // ω·a_rq
      const wqr = wr * a[kq] - wi * a[kq + 1];
      const wqi = wr * a[kq + 1] + wi * a[kq];
      const npr = c * rpr - s * wqr;
      const npi = c * rpi - s * wqi;
      const nqr = s * rpr + c * wqr;
      const nqi = s * rpi + c * wqi;
      a[kp] = npr;
      a[kp + 1] = npi;
      a[kq] = nqr;
      a[kq + 1] = nqi;
      const kpT = 2 * (p * n + r);
      const kqT = 2 * (q * n + r);
      a[kpT] = npr;
      a[kpT + 1] = -npi;
      a[kqT] = nqr;
      a[kqT + 1] = -nqi;
    }
    a[2 * (p * n + p)] = app - t * mod;
    a[2 * (q * n + q)] = aqq + t * mod;
    a[kpq] = 0;
    a[kpq + 1] = 0;
    a[2 * (q * n + p)] = 0;
    a[2 * (q * n + p) + 1] = 0;
    for (let r = 0; r < n; r++) {
      const kp = 2 * (r * n + p);
      const kq = 2 * (r * n + q);
      const rpr = v[kp];
      const rpi = v[kp + 1];
      const wqr = wr * v[kq] - wi * v[kq + 1];
      const wqi = wr * v[kq + 1] + wi * v[kq];
      v[kp] = c * rpr - s * wqr;
      v[kp + 1] = c * rpi - s * wqi;
      v[kq] = s * rpr + c * wqr;
      v[kq + 1] = s * rpi + c * wqi;
    }
  }
}
