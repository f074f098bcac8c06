import { addProducts, adjoint, multiply, rowMajor } from '../../src/core/complex-matrix.ts';
import { SeededRandom } from '../../src/core/random.ts';

/** Test matrices, interleaved complex n×n row-major like src/core/complex-matrix.ts reads them. */

/** A random Hermitian positive definite matrix G·Gᴴ + n·I, G with standard normal entries. */
export function randomHpd(n: number, seed: number): Float64Array {
  const rng = new SeededRandom(seed);
  const g = Float64Array.from({ length: 2 * n * n }, () => rng.normal());
  const a = multiply(rowMajor(g, n), adjoint(rowMajor(g, n)), n, n, n);
  for (let i = 0; i < n; i++) a[2 * (i * n + i)] += n;
  return a;
}

/** Random unitary n×n by Gram–Schmidt on random complex columns. */
export function randomUnitary(n: number, seed: number): Float64Array {
  const rng = new SeededRandom(seed);
  const q = new Float64Array(2 * n * n);
  for (let i = 0; i < q.length; i++) q[i] = rng.normal();
  const dot = new Float64Array(2);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < k; j++) {
      // ⟨q_j, q_k⟩ = Σ_i conj(q_ij)·q_ik, down columns j and k.
      dot.fill(0);
      addProducts(dot, 1, q, j, n, q, k, n, n, 'a');
      const [re, im] = dot;
      for (let i = 0; i < n; i++) {
        const ar = q[2 * (i * n + j)];
        const ai = q[2 * (i * n + j) + 1];
        q[2 * (i * n + k)] -= re * ar - im * ai;
        q[2 * (i * n + k) + 1] -= re * ai + im * ar;
      }
    }
    let norm = 0;
    for (let i = 0; i < n; i++) norm += q[2 * (i * n + k)] ** 2 + q[2 * (i * n + k) + 1] ** 2;
    norm = Math.sqrt(norm);
    for (let i = 0; i < n; i++) {
      q[2 * (i * n + k)] /= norm;
      q[2 * (i * n + k) + 1] /= norm;
    }
  }
  return q;
}

/** The n×n identity. */
export function identity(n: number): Float64Array {
  const out = new Float64Array(2 * n * n);
  for (let i = 0; i < n; i++) out[2 * (i * n + i)] = 1;
  return out;
}
