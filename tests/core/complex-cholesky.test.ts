import { describe, expect, it } from 'vitest';
import {
  choleskyLower,
  hermitianInverseFromCholesky,
  invertLower,
  solveLower,
  solveLowerConjugateTranspose,
} from '../../src/core/complex-cholesky.ts';
import { SeededRandom } from '../../src/core/random.ts';

/** C = A·B for interleaved complex n×n. */
function multiply(a: Float64Array, b: Float64Array, n: number, conjugateB = false): Float64Array {
  const out = new Float64Array(2 * n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < n; k++) {
        const ar = a[2 * (i * n + k)];
        const ai = a[2 * (i * n + k) + 1];
        // B or Bᴴ: (Bᴴ)_kj = conj(B_jk)
        const br = conjugateB ? b[2 * (j * n + k)] : b[2 * (k * n + j)];
        const bi = conjugateB ? -b[2 * (j * n + k) + 1] : b[2 * (k * n + j) + 1];
        re += ar * br - ai * bi;
        im += ar * bi + ai * br;
      }
      out[2 * (i * n + j)] = re;
      out[2 * (i * n + j) + 1] = im;
    }
  }
  return out;
}

/** A random Hermitian positive definite matrix G·Gᴴ + n·I. */
function randomHpd(n: number, seed: number): Float64Array {
  const rng = new SeededRandom(seed);
  const g = Float64Array.from({ length: 2 * n * n }, () => rng.normal());
  const a = multiply(g, g, n, true);
  for (let i = 0; i < n; i++) a[2 * (i * n + i)] += n;
  return a;
}

const maxDiff = (a: Float64Array, b: Float64Array) =>
  a.reduce((m, v, i) => Math.max(m, Math.abs(v - b[i])), 0);

describe('complex Cholesky and triangular solves (Golub & Van Loan §4.2; identities are common practice)', () => {
  it('factorises a hand-worked 2×2: [[4, 2+2i], [2−2i, 6]] = L·Lᴴ with L = [[2, 0], [1−i, 2]]', () => {
    const a = Float64Array.from([4, 0, 2, 2, 2, -2, 6, 0]);
    const l = new Float64Array(8);
    expect(choleskyLower(a, 2, l)).toBe(-1);
    expect(Array.from(l)).toEqual([2, 0, 0, 0, 1, -1, 2, 0]);
  });

  for (const n of [1, 3, 8, 17]) {
    it(`L·Lᴴ = A, solves and inverse for a random ${n}×${n} HPD matrix`, () => {
      const a = randomHpd(n, n);
      const l = new Float64Array(a.length);
      expect(choleskyLower(a, n, l)).toBe(-1);
      const scale = Math.max(...a.map(Math.abs));
      expect(maxDiff(multiply(l, l, n, true), a) / scale).toBeLessThan(1e-14);

      const rng = new SeededRandom(100 + n);
      const b = Float64Array.from({ length: 2 * n }, () => rng.normal());
      const x = b.slice();
      solveLower(l, n, x);
      solveLowerConjugateTranspose(l, n, x);
      // A·x = b
      const ax = new Float64Array(2 * n);
      for (let i = 0; i < n; i++) {
        for (let k = 0; k < n; k++) {
          const ar = a[2 * (i * n + k)];
          const ai = a[2 * (i * n + k) + 1];
          ax[2 * i] += ar * x[2 * k] - ai * x[2 * k + 1];
          ax[2 * i + 1] += ar * x[2 * k + 1] + ai * x[2 * k];
        }
      }
      expect(maxDiff(ax, b)).toBeLessThan(1e-12);

      const inverse = new Float64Array(a.length);
      hermitianInverseFromCholesky(l, n, inverse);
      const identity = new Float64Array(a.length);
      for (let i = 0; i < n; i++) identity[2 * (i * n + i)] = 1;
      expect(maxDiff(multiply(a, inverse, n), identity)).toBeLessThan(1e-12);
      const lInverse = new Float64Array(a.length);
      invertLower(l, n, lInverse);
      expect(maxDiff(multiply(l, lInverse, n), identity)).toBeLessThan(1e-12);
    });
  }

  it('reports the first pivot of a singular or indefinite matrix', () => {
    // Rank one: [[1, 1], [1, 1]]
    expect(choleskyLower(Float64Array.from([1, 0, 1, 0, 1, 0, 1, 0]), 2, new Float64Array(8))).toBe(1);
    // Indefinite: [[1, 2], [2, 1]]
    expect(choleskyLower(Float64Array.from([1, 0, 2, 0, 2, 0, 1, 0]), 2, new Float64Array(8))).toBe(1);
    expect(choleskyLower(new Float64Array(2), 1, new Float64Array(2))).toBe(0);
  });
});
