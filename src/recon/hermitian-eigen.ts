/**
 * Eigendecomposition of a complex Hermitian n×n matrix: Householder reduction to tridiagonal form,
 * then the implicit QL iteration with Wilkinson-type shifts on the resulting real tridiagonal
 * (the tred2 / tqli scheme of Numerical Recipes §11.2–11.3, written here for complex Householder
 * vectors as in Golub & Van Loan, "Matrix Computations", §8.3 — both from memory).
 * Written here because the well-kept npm linear-algebra packages offer real symmetric
 * decompositions only; n is small (the Hankel window size, ≤ a few hundred).
 *
 * Reduction: for k = 0…n−3 the reflector H_k = I − τ v vᴴ maps column k below the diagonal onto
 * β e₁ (β = −phase(x₀)·‖x‖, so v₀ = x₀ − β never cancels); A ← H A H by the rank-2 update
 * A − v wᴴ − w vᴴ with p = τ A v, w = p − (τ/2)(vᴴp) v, both on the lower triangle only. The complex sub-diagonal e_k of
 * T = Qᴴ A Q (Q = H_0 H_1 ⋯) is made real by the diagonal phase D, φ_{k+1} = φ_k e_k/|e_k|:
 * Dᴴ T D is real symmetric tridiagonal with off-diagonal |e_k|, and its real plane rotations
 * accumulate on a real matrix W, so A = (Q D W) Λ (Q D W)ᴴ.
 * The eigenvectors are formed only on request (leadingVectors), for as many columns as asked:
 * v_k = H_0(H_1(⋯(D w_k))) by the kept reflectors, about n² complex multiply-adds each — the
 * Hankel solvers need the leading `rank` of them, not all n, and never the complex n×n Q itself.
 * Storage: interleaved complex, row-major, a[2(i·n + j)] = Re a_ij.
 */
export class HermitianEigenSolver {
  readonly n: number;
  /** Working copy of the matrix (destroyed). */
  private readonly a: Float64Array;
  /** Eigenvectors as columns, interleaved complex row-major: v[2(i·n + k)] = Re (v_k)_i. */
  readonly vectors: Float64Array;
  /** Eigenvalues in descending order after `decompose` (or `solve`). */
  readonly values: Float64Array;
  private readonly order: Int32Array;
  /** Householder vector of step k in row k (entries k+1…n−1), and its τ (0 when skipped). */
  private readonly reflectors: Float64Array;
  private readonly tau: Float64Array;
  /** φ_k of D (interleaved complex). */
  private readonly phase: Float64Array;
  /** Wᵀ: row j holds the tridiagonal's eigenvector j in QL order (rotations act on two rows). */
  private readonly rotated: Float64Array;
  private readonly diagonal: Float64Array;
  private readonly offDiagonal: Float64Array;
  private readonly product: Float64Array;
  /** One eigenvector while it is formed. */
  private readonly column: Float64Array;
  /** QL iterations used by the last solve (all eigenvalues together). */
  iterations = 0;

  constructor(n: number) {
    if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be a positive integer, got ${n}`);
    this.n = n;
    this.a = new Float64Array(2 * n * n);
    this.vectors = new Float64Array(2 * n * n);
    this.values = new Float64Array(n);
    this.order = new Int32Array(n);
    this.reflectors = new Float64Array(2 * n * n);
    this.tau = new Float64Array(n);
    this.phase = new Float64Array(2 * n);
    this.rotated = new Float64Array(n * n);
    this.diagonal = new Float64Array(n);
    this.offDiagonal = new Float64Array(n);
    this.product = new Float64Array(2 * n);
    this.column = new Float64Array(2 * n);
  }

  /**
   * Decomposes `matrix` (Hermitian; only its values are read, the upper triangle is trusted):
   * afterwards `values[k]` (descending) and column k of `vectors` satisfy A v_k = λ_k v_k.
   */
  solve(matrix: Float64Array): void {
    this.decompose(matrix);
    this.leadingVectors(this.n);
  }

  /**
   * The eigenvalues of `matrix` (into `values`, descending) and what leadingVectors needs; the
   * columns of `vectors` are left as they were.
   */
  decompose(matrix: Float64Array): void {
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
    const { order, diagonal } = this;
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
    for (let k = 0; k < n; k++) this.values[k] = diagonal[order[k]];
  }

  /**
   * Columns 0…count−1 of `vectors` ← the eigenvectors of the leading `count` eigenvalues of the
   * last decompose: v = H_0 H_1 ⋯ H_{n−3} D w, the reflectors applied last to first.
   */
  leadingVectors(count: number): void {
    const { n, reflectors: v, tau, phase, rotated, order, vectors } = this;
    const x = this.column;
    if (!Number.isInteger(count) || count < 0 || count > n)
      throw new RangeError(`count must be in [0, ${n}]`);
    for (let k = 0; k < count; k++) {
      const row = order[k] * n;
      for (let j = 0; j < n; j++) {
        x[2 * j] = phase[2 * j] * rotated[row + j];
        x[2 * j + 1] = phase[2 * j + 1] * rotated[row + j];
      }
      for (let h = n - 3; h >= 0; h--) {
        const t = tau[h];
        if (t === 0) continue;
        // x ← x − τ v (vᴴ x), v in row h from h + 1 on.
        const base = 2 * h * n;
        let re = 0;
        let im = 0;
        for (let j = h + 1; j < n; j++) {
          const vr = v[base + 2 * j];
          const vi = v[base + 2 * j + 1];
          re += vr * x[2 * j] + vi * x[2 * j + 1];
          im += vr * x[2 * j + 1] - vi * x[2 * j];
        }
        re *= t;
        im *= t;
        for (let j = h + 1; j < n; j++) {
          const vr = v[base + 2 * j];
          const vi = v[base + 2 * j + 1];
          x[2 * j] -= re * vr - im * vi;
          x[2 * j + 1] -= re * vi + im * vr;
        }
      }
      for (let i = 0; i < n; i++) {
        vectors[2 * (i * n + k)] = x[2 * i];
        vectors[2 * (i * n + k) + 1] = x[2 * i + 1];
      }
    }
  }

  /**
   * a → Qᴴ a Q tridiagonal; diagonal / offDiagonal (real, e_k between k and k+1), the reflectors
   * of Q and the phases of D.
   */
  private tridiagonalize(): void {
    const { n, a, diagonal, offDiagonal, reflectors, tau, phase } = this;
    const p = this.product;
    tau.fill(0);
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
      // v = x − β e₁ with β = −phase·norm; vᴴv = (x0 + norm)² + tail. Kept in row k.
      const v = reflectors.subarray(2 * k * n, 2 * (k + 1) * n);
      v[2 * k1] = phr * (x0 + norm);
      v[2 * k1 + 1] = phi * (x0 + norm);
      for (let i = k + 2; i < n; i++) {
        v[2 * i] = a[2 * (i * n + k)];
        v[2 * i + 1] = a[2 * (i * n + k) + 1];
      }
      const t = 2 / ((x0 + norm) ** 2 + tail);
      tau[k] = t;
      // p = τ B v over the trailing block from its lower triangle (B Hermitian), and vᴴ p.
      p.fill(0, 2 * k1, 2 * n);
      for (let i = k1; i < n; i++) {
        const row = 2 * i * n;
        const vr = v[2 * i];
        const vi = v[2 * i + 1];
        let re = 0;
        let im = 0;
        for (let j = k1; j < i; j++) {
          const br = a[row + 2 * j];
          const bi = a[row + 2 * j + 1];
          re += br * v[2 * j] - bi * v[2 * j + 1];
          im += br * v[2 * j + 1] + bi * v[2 * j];
          // B_ji = conj(B_ij) contributes to p_j.
          p[2 * j] += br * vr + bi * vi;
          p[2 * j + 1] += br * vi - bi * vr;
        }
        const dr = a[row + 2 * i];
        const di = a[row + 2 * i + 1];
        p[2 * i] += re + dr * vr - di * vi;
        p[2 * i + 1] += im + dr * vi + di * vr;
      }
      let vp = 0;
      for (let i = k1; i < n; i++) {
        p[2 * i] *= t;
        p[2 * i + 1] *= t;
        vp += v[2 * i] * p[2 * i] + v[2 * i + 1] * p[2 * i + 1];
      }
      const half = (t / 2) * vp;
      for (let i = k1; i < n; i++) {
        p[2 * i] -= half * v[2 * i];
        p[2 * i + 1] -= half * v[2 * i + 1];
      }
      // B ← B − v wᴴ − w vᴴ (w in p), lower triangle only: nothing reads the upper one again.
      for (let i = k1; i < n; i++) {
        const vr = v[2 * i];
        const vi = v[2 * i + 1];
        const wr = p[2 * i];
        const wi = p[2 * i + 1];
        const row = 2 * i * n;
        for (let j = k1; j <= i; j++) {
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
    }
    // Real tridiagonal through the phases φ (φ_0 = 1).
    let fr = 1;
    let fi = 0;
    phase[0] = 1;
    phase[1] = 0;
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
        phase[2 * k] = fr;
        phase[2 * k + 1] = fi;
      }
    }
    offDiagonal[n - 1] = 0;
  }

  /** Implicit QL with shifts on (diagonal, offDiagonal); rotations accumulate on the rows of Wᵀ. */
  private implicitQl(): void {
    const { n, rotated: w, diagonal: d, offDiagonal: e } = this;
    w.fill(0);
    for (let i = 0; i < n; i++) w[i * n + i] = 1;
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
          for (let i0 = i * n, i1 = i0 + n, end = i1; i0 < end; i0++, i1++) {
            f = w[i1];
            w[i1] = s * w[i0] + c * f;
            w[i0] = c * w[i0] - s * f;
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
