import { describe, expect, it } from 'vitest';
import {
  addProducts,
  adjoint,
  multiply,
  multiplyInto,
  rowMajor,
  transposed,
} from '../../src/core/complex-matrix.ts';

// Hand-worked 2×2 products (complex arithmetic, common practice):
// A = [[1+2i, 3], [−i, 2−i]], B = [[2, 1−i], [i, 4]].
const A = Float64Array.from([1, 2, 3, 0, 0, -1, 2, -1]);
const B = Float64Array.from([2, 0, 1, -1, 0, 1, 4, 0]);

describe('strided complex matrix products', () => {
  it('A·B = [[2+7i, 15+i], [1, 7−5i]]', () => {
    expect(Array.from(multiply(rowMajor(A, 2), rowMajor(B, 2), 2, 2, 2))).toEqual([2, 7, 15, 1, 1, 0, 7, -5]);
  });

  it('Aᴴ·B = [[1−4i, −1+i], [5+2i, 11+i]] and A·Bᵀ = [[5+i, 10+i], [1−5i, 9−4i]]', () => {
    expect(Array.from(multiply(adjoint(rowMajor(A, 2)), rowMajor(B, 2), 2, 2, 2))).toEqual([
      1, -4, -1, 1, 5, 2, 11, 1,
    ]);
    expect(Array.from(multiply(rowMajor(A, 2), transposed(rowMajor(B, 2)), 2, 2, 2))).toEqual([
      5, 1, 10, 1, 1, -5, 9, -4,
    ]);
  });

  it('writes through an offset view and leaves the rest alone', () => {
    const out = new Float64Array(10).fill(9);
    multiplyInto(rowMajor(out, 2, 1), rowMajor(A, 2), rowMajor(B, 2), 2, 2, 2);
    expect(Array.from(out)).toEqual([9, 9, 2, 7, 15, 1, 1, 0, 7, -5]);
    expect(() => multiplyInto(adjoint(rowMajor(out, 2)), rowMajor(A, 2), rowMajor(B, 2), 2, 2, 2)).toThrow(
      RangeError,
    );
  });

  it('addProducts: 10 − (1+2i)·2 − 3·i = 8 − 7i, and the dot ⟨row 0 of A, column 1 of B⟩ with conj(A)', () => {
    const acc = Float64Array.from([10, 0]);
    addProducts(acc, -1, A, 0, 1, B, 0, 2, 2);
    expect(Array.from(acc)).toEqual([8, -7]);
    acc.fill(0);
    // conj(1+2i)·(1−i) + 3·4 = (1−2i)(1−i) + 12 = −1−3i + 12
    addProducts(acc, 1, A, 0, 1, B, 1, 2, 2, 'a');
    expect(Array.from(acc)).toEqual([11, -3]);
  });
});
