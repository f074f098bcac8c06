import { describe, expect, it } from 'vitest';
import {
  choleskyLower,
  hermitianInverseFromCholesky,
  invertLower,
  solveLower,
  solveLowerConjugateTranspose,
} from '../../src/core/complex-cholesky.ts';
import { adjoint, multiply, rowMajor } from '../../src/core/complex-matrix.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { maxAbsDifference } from '../error-measures.ts';
import { identity, randomHpd } from './complex-matrices.ts';

/** C = A·B, or A·Bᴴ, for interleaved complex n×n. */
const product = (a: Float64Array, b: Float64Array, n: number, conjugateB = false): Float64Array =>
  multiply(rowMajor(a, n), conjugateB ? adjoint(rowMajor(b, n)) : rowMajor(b, n), n, n, n);

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
      expect(maxAbsDifference(product(l, l, n, true), a) / scale).toBeLessThan(1e-14);

      const rng = new SeededRandom(100 + n);
      const b = Float64Array.from({ length: 2 * n }, () => rng.normal());
      const x = b.slice();
      solveLower(l, n, x);
      solveLowerConjugateTranspose(l, n, x);
      // A·x = b
      const ax = multiply(rowMajor(a, n), rowMajor(x, 1), n, n, 1);
      expect(maxAbsDifference(ax, b)).toBeLessThan(1e-12);

      const inverse = new Float64Array(a.length);
      hermitianInverseFromCholesky(l, n, inverse);
      expect(maxAbsDifference(product(a, inverse, n), identity(n))).toBeLessThan(1e-12);
      const lInverse = new Float64Array(a.length);
      invertLower(l, n, lInverse);
      expect(maxAbsDifference(product(l, lInverse, n), identity(n))).toBeLessThan(1e-12);
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
