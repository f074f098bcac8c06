import { addProducts } from '../core/complex-matrix.ts';

/**
 * Least-squares pseudo-inverse B⁺ = R⁻¹·Qᴴ of a tall complex n×m matrix B (n ≥ m, full column rank)
 * through its thin QR factorisation by modified Gram–Schmidt with one reorthogonalisation pass
 * ("twice is enough", Giraud, Langou & Rozložník 2005 — from memory), which keeps Q orthonormal to
 * rounding even for the moderately ill-conditioned Fourier bases of the trigonometric fit.
 * B is interleaved row-major (b[2(i·m + k)] = Re b_ik); the result is m×n, interleaved row-major.
 * Returns null when the basis is numerically dependent: a column keeps less than 1e-10 of its norm
 * after orthogonalisation, or the computed B⁺ fails B⁺·B = I by more than PSEUDO_INVERSE_TOLERANCE.
 */
export function pseudoInverse(b: Float64Array, n: number, m: number): Float64Array | null {
  if (b.length !== 2 * n * m) throw new RangeError(`b must hold 2·n·m = ${2 * n * m} numbers`);
  if (n < m) throw new RangeError(`pseudoInverse needs n ≥ m, got ${n} < ${m}`);
  // Q stored column-major (column k at 2·k·n) for contiguous dot products.
  const q = new Float64Array(2 * n * m);
  const r = new Float64Array(2 * m * m);
  const acc = new Float64Array(2);
  for (let k = 0; k < m; k++) {
    const col = 2 * k * n;
    let original = 0;
    for (let i = 0; i < n; i++) {
      q[col + 2 * i] = b[2 * (i * m + k)];
      q[col + 2 * i + 1] = b[2 * (i * m + k) + 1];
      original += b[2 * (i * m + k)] ** 2 + b[2 * (i * m + k) + 1] ** 2;
    }
    for (let pass = 0; pass < 2; pass++) {
      for (let j = 0; j < k; j++) {
        const qj = 2 * j * n;
        // ⟨q_j, v⟩ = Σ_i conj(q_ij)·v_i
        acc.fill(0);
        addProducts(acc, 1, q, j * n, 1, q, k * n, 1, n, 'a');
        const [re, im] = acc;
        for (let i = 0; i < n; i++) {
          const ar = q[qj + 2 * i];
          const ai = q[qj + 2 * i + 1];
          q[col + 2 * i] -= re * ar - im * ai;
          q[col + 2 * i + 1] -= re * ai + im * ar;
        }
        r[2 * (j * m + k)] += re;
        r[2 * (j * m + k) + 1] += im;
      }
    }
    let norm = 0;
    for (let i = 0; i < 2 * n; i++) norm += q[col + i] * q[col + i];
    if (!(norm > 1e-20 * original)) return null;
    norm = Math.sqrt(norm);
    r[2 * (k * m + k)] = norm;
    for (let i = 0; i < 2 * n; i++) q[col + i] /= norm;
  }
  // X = R⁻¹·Qᴴ by back substitution, one column of Qᴴ (= conj of one row of Q) at a time.
  const x = new Float64Array(2 * m * n);
  for (let i = 0; i < n; i++) {
    for (let k = m - 1; k >= 0; k--) {
      acc[0] = q[2 * (k * n + i)];
      acc[1] = -q[2 * (k * n + i) + 1];
      addProducts(acc, -1, r, k * m + k + 1, 1, x, (k + 1) * n + i, n, m - 1 - k);
      const d = r[2 * (k * m + k)];
      x[2 * (k * n + i)] = acc[0] / d;
      x[2 * (k * n + i) + 1] = acc[1] / d;
    }
  }
  // Rounding can still defeat a basis that is nearly dependent without any one column being so:
  // accept the result only if it inverts B on its range, B⁺·B = I to PSEUDO_INVERSE_TOLERANCE (the
  // deviation grows like cond(B)²·ε: 5e-5 for 25 harmonics of period 4 on 64 points, 31 for period 6).
  for (let a = 0; a < m; a++) {
    for (let c = 0; c < m; c++) {
      acc[0] = a === c ? -1 : 0;
      acc[1] = 0;
      addProducts(acc, 1, x, a * n, 1, b, c, m, n);
      if (!(Math.hypot(acc[0], acc[1]) <= PSEUDO_INVERSE_TOLERANCE)) return null;
    }
  }
  return x;
}

/** How far B⁺·B may be from the identity before the basis counts as numerically dependent. */
export const PSEUDO_INVERSE_TOLERANCE = 1e-3;
