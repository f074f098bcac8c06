/**
 * Eigendecomposition of a complex Hermitian n×n matrix: Householder reduction to tridiagonal form,
 * then the implicit QL iteration with Wilkinson-type shifts on the resulting real tridiagonal
 * (the tred2 / tqli scheme of Numerical Recipes §11.2–11.3, written here for complex Householder
 * vectors as in Golub & Van Loan, "Matrix Computations", §8.3 — both from memory).
 * Written here because the well-kept npm linear-algebra packages offer real symmetric
 * decompositions only; n is small (the Hankel window size, ≤ a few hundred).
 *
 * Reduction: for k = 0…n−3 the reflector H = I − τ v vᴴ maps column k below the diagonal onto
 * β e₁ (β = −phase(x₀)·‖x‖, so v₀ = x₀ − β never cancels); A ← H A H by the rank-2 update
 * A − v wᴴ − w vᴴ with p = τ A v, w = p − (τ/2)(vᴴp) v; Q ← Q H. The complex sub-diagonal e_k of
 * T = Qᴴ A Q is made real by the diagonal phase D, φ_{k+1} = φ_k e_k/|e_k|: Dᴴ T D is real
 * symmetric tridiagonal with off-diagonal |e_k|, and its real plane rotations accumulate on Z = Q D.
 * About (8/3)n³ complex multiply-adds for the reduction and Q, against ~10 sweeps of 2n³ for the
 * cyclic Jacobi method this replaced.
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
  /** Z = Q D, then the eigenvectors in QL order. */
  private readonly z: Float64Array;
  private readonly diagonal: Float64Array;
  private readonly offDiagonal: Float64Array;
  private readonly householder: Float64Array;
  private readonly product: Float64Array;
  /** QL iterations used by the last solve (all eigenvalues together). */
  iterations = 0;

  constructor(n: number) {
    if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be a positive integer, got ${n}`);
    this.n = n;
    this.a = new Float64Array(2 * n * n);
    this.vectors = new Float64Array(2 * n * n);
    this.values = new Float64Array(n);
    this.order = new Int32Array(n);
    this.z = new Float64Array(2 * n * n);
    this.diagonal = new Float64Array(n);
    this.offDiagonal = new Float64Array(n);
    this.householder = new Float64Array(2 * n);
    this.product = new Float64Array(2 * n);
  }

  /**
   * Decomposes `matrix` (Hermitian; only its values are read, the upper triangle is trusted):
   * afterwards `values[k]` (descending) and column k of `vectors` satisfy A v_k = λ_k v_k.
   */
  solve(matrix: Float64Array): void {
    const { n, a } = this;
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
    this.tridiagonalize();
    this.implicitQl();
    // Sort descending (insertion sort of indices; n is small, no allocation).
    const { order, diagonal, z } = this;
    for (let i = 0; i < n; i++) order[i] = i;
    for (let i = 1; i < n; i++) {
      const key = order[i];
      const value = diagonal[key];
      let j = i - 1;
      while (j >= 0 && diagonal[order[j]] < value) {
        order[j + 1] = order[j];
        j--;
      }
      order[j + 1] = key;
    }
    for (let k = 0; k < n; k++) {
      const src = order[k];
      this.values[k] = diagonal[src];
      for (let i = 0; i < n; i++) {
        this.vectors[2 * (i * n + k)] = z[2 * (i * n + src)];
        this.vectors[2 * (i * n + k) + 1] = z[2 * (i * n + src) + 1];
      }
    }
  }

  /** a → Qᴴ a Q tridiagonal; diagonal / offDiagonal (real, e_k between k and k+1) and z = Q D. */
  private tridiagonalize(): void {
    const { n, a, z, diagonal, offDiagonal } = this;
    const v = this.householder;
    const p = this.product;
    z.fill(0);
    for (let i = 0; i < n; i++) z[2 * (i * n + i)] = 1;
    for (let k = 0; k + 2 < n; k++) {
      const k1 = k + 1;
      let tail = 0;
      for (let i = k + 2; i < n; i++) tail += a[2 * (i * n + k)] ** 2 + a[2 * (i * n + k) + 1] ** 2;
      if (tail === 0) continue;
      const x0r = a[2 * (k1 * n + k)];
      const x0i = a[2 * (k1 * n + k) + 1];
      const x0 = Math.hypot(x0r, x0i);
      const norm = Math.sqrt(x0 * x0 + tail);
      const phr = x0 > 0 ? x0r / x0 : 1;
      const phi = x0 > 0 ? x0i / x0 : 0;
      // v = x − β e₁ with β = −phase·norm; vᴴv = (x0 + norm)² + tail.
      v[2 * k1] = phr * (x0 + norm);
      v[2 * k1 + 1] = phi * (x0 + norm);
      for (let i = k + 2; i < n; i++) {
        v[2 * i] = a[2 * (i * n + k)];
        v[2 * i + 1] = a[2 * (i * n + k) + 1];
      }
      const tau = 2 / ((x0 + norm) ** 2 + tail);
      // p = τ B v over the trailing block, and vᴴ p.
      let vp = 0;
      for (let i = k1; i < n; i++) {
        let re = 0;
        let im = 0;
        const row = 2 * i * n;
        for (let j = k1; j < n; j++) {
          const br = a[row + 2 * j];
          const bi = a[row + 2 * j + 1];
          re += br * v[2 * j] - bi * v[2 * j + 1];
          im += br * v[2 * j + 1] + bi * v[2 * j];
        }
        p[2 * i] = tau * re;
        p[2 * i + 1] = tau * im;
        vp += v[2 * i] * p[2 * i] + v[2 * i + 1] * p[2 * i + 1];
      }
      const half = (tau / 2) * vp;
      for (let i = k1; i < n; i++) {
        p[2 * i] -= half * v[2 * i];
        p[2 * i + 1] -= half * v[2 * i + 1];
      }
      // B ← B − v wᴴ − w vᴴ (w in p).
      for (let i = k1; i < n; i++) {
        const vr = v[2 * i];
        const vi = v[2 * i + 1];
        const wr = p[2 * i];
        const wi = p[2 * i + 1];
        const row = 2 * i * n;
        for (let j = k1; j < n; j++) {
          const wjr = p[2 * j];
          const wji = -p[2 * j + 1];
          const vjr = v[2 * j];
          const vji = -v[2 * j + 1];
          a[row + 2 * j] -= vr * wjr - vi * wji + wr * vjr - wi * vji;
          a[row + 2 * j + 1] -= vr * wji + vi * wjr + wr * vji + wi * vjr;
        }
      }
      a[2 * (k1 * n + k)] = -phr * norm;
      a[2 * (k1 * n + k) + 1] = -phi * norm;
      for (let i = k + 2; i < n; i++) {
        a[2 * (i * n + k)] = 0;
        a[2 * (i * n + k) + 1] = 0;
      }
      // Z ← Z H: each row r of Z loses τ (Z_r · v) vᴴ.
      for (let r = 0; r < n; r++) {
        const row = 2 * r * n;
        let re = 0;
        let im = 0;
        for (let j = k1; j < n; j++) {
          const zr = z[row + 2 * j];
          const zi = z[row + 2 * j + 1];
          re += zr * v[2 * j] - zi * v[2 * j + 1];
          im += zr * v[2 * j + 1] + zi * v[2 * j];
        }
        re *= tau;
        im *= tau;
        for (let j = k1; j < n; j++) {
          const vr = v[2 * j];
          const vi = -v[2 * j + 1];
          z[row + 2 * j] -= re * vr - im * vi;
          z[row + 2 * j + 1] -= re * vi + im * vr;
        }
      }
    }
    // Real tridiagonal through the phases φ: column k of Z is multiplied by φ_k.
    let fr = 1;
    let fi = 0;
    for (let k = 0; k < n; k++) {
      diagonal[k] = a[2 * (k * n + k)];
      if (k > 0) {
        const er = a[2 * (k * n + k - 1)];
        const ei = a[2 * (k * n + k - 1) + 1];
        const mod = Math.hypot(er, ei);
        offDiagonal[k - 1] = mod;
        if (mod > 0) {
          const nr = (fr * er - fi * ei) / mod;
          const ni = (fr * ei + fi * er) / mod;
          fr = nr;
          fi = ni;
        }
        for (let r = 0; r < n; r++) {
          const i = 2 * (r * n + k);
          const zr = z[i];
          const zi = z[i + 1];
          z[i] = zr * fr - zi * fi;
          z[i + 1] = zr * fi + zi * fr;
        }
      }
    }
    offDiagonal[n - 1] = 0;
  }

  /** Implicit QL with shifts on (diagonal, offDiagonal); rotations accumulate on the columns of z. */
  private implicitQl(): void {
    const { n, z, diagonal: d, offDiagonal: e } = this;
    let total = 0;
    for (let l = 0; l < n; l++) {
      let iter = 0;
      for (;;) {
        let m = l;
        for (; m < n - 1; m++) {
          const dd = Math.abs(d[m]) + Math.abs(d[m + 1]);
          if (Math.abs(e[m]) <= Number.EPSILON * dd) break;
        }
        if (m === l) break;
        // Two or three iterations per eigenvalue are usual; like the 60-sweep cap of the Jacobi
        // method before, a cap keeps non-finite input from looping forever (values then stay as they are).
        if (iter++ === 60) break;
        total++;
        let g = (d[l + 1] - d[l]) / (2 * e[l]);
        let r = Math.sqrt(g * g + 1);
        g = d[m] - d[l] + e[l] / (g + (g >= 0 ? r : -r));
        let s = 1;
        let c = 1;
        let p = 0;
        let i = m - 1;
        let underflow = false;
        for (; i >= l; i--) {
          let f = s * e[i];
          const b = c * e[i];
          r = Math.sqrt(f * f + g * g);
          e[i + 1] = r;
          if (r === 0) {
            d[i + 1] -= p;
            e[m] = 0;
            underflow = true;
            break;
          }
          s = f / r;
          c = g / r;
          g = d[i + 1] - p;
          r = (d[i] - g) * s + 2 * c * b;
          p = s * r;
          d[i + 1] = g + p;
          g = c * r - b;
          for (let k = 0; k < n; k++) {
            const i0 = 2 * (k * n + i);
            const i1 = i0 + 2;
            f = z[i1];
            z[i1] = s * z[i0] + c * f;
            z[i0] = c * z[i0] - s * f;
            f = z[i1 + 1];
            z[i1 + 1] = s * z[i0 + 1] + c * f;
            z[i0 + 1] = c * z[i0 + 1] - s * f;
          }
        }
        if (underflow) continue;
        d[l] -= p;
        e[l] = g;
        e[m] = 0;
      }
    }
    this.iterations = total;
  }
}
