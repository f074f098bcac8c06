import { describe, expect, it } from 'vitest';
import { adjoint, multiply, rowMajor } from '../../src/core/complex-matrix.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { HermitianEigenSolver } from '../../src/recon/hermitian-eigen.ts';
import { randomUnitary } from '../core/complex-matrices.ts';

/** U diag(λ) Uᴴ. */
function withSpectrum(u: Float64Array, values: number[]): Float64Array {
  const n = values.length;
  const scaled = u.map((v, at) => v * values[(at >> 1) % n]); // column k times λ_k
  return multiply(rowMajor(scaled, n), adjoint(rowMajor(u, n)), n, n, n);
}

/** max_k ‖A v_k − λ_k v_k‖ and max |V ᴴV − I|. */
function residuals(a: Float64Array, solver: HermitianEigenSolver): { eig: number; orth: number } {
  const n = solver.n;
  const v = rowMajor(solver.vectors, n);
  const av = multiply(rowMajor(a, n), v, n, n, n);
  const gram = multiply(adjoint(v), v, n, n, n);
  let eig = 0;
  let orth = 0;
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < n; i++) {
      const at = 2 * (i * n + k);
      const lambda = solver.values[k];
      eig = Math.max(eig, Math.hypot(av[at] - lambda * v.data[at], av[at + 1] - lambda * v.data[at + 1]));
    }
    for (let l = 0; l < n; l++) {
      const at = 2 * (k * n + l);
      orth = Math.max(orth, Math.hypot(gram[at] - (k === l ? 1 : 0), gram[at + 1]));
    }
  }
  return { eig, orth };
}

describe('Hermitian eigendecomposition (Householder tridiagonalisation, implicit QL)', () => {
  it('recovers a prescribed spectrum of U diag(λ) Uᴴ with a random unitary U (construction, common practice)', () => {
    const values = [9, 4.5, 3, 3, 1e-3, 0, -0.5, -2, 7, 2.25, 1, 0.1];
    const n = values.length;
    const a = withSpectrum(randomUnitary(n, 2), values);
    const solver = new HermitianEigenSolver(n);
    solver.solve(a);
    const sorted = [...values].sort((x, y) => y - x);
    for (let k = 0; k < n; k++) expect(Math.abs(solver.values[k] - sorted[k])).toBeLessThan(1e-13 * 9);
    const { eig, orth } = residuals(a, solver);
    expect(eig).toBeLessThan(1e-13 * 9);
    expect(orth).toBeLessThan(1e-13);
  });

  it('decompose + leadingVectors(3): the three leading columns are eigenvectors, the others untouched (construction, common practice)', () => {
    const values = [5, -1, 2.5, 0.25, 4, 1.5, 0, 3];
    const n = values.length;
    const a = withSpectrum(randomUnitary(n, 5), values);
    const solver = new HermitianEigenSolver(n);
    solver.vectors.fill(7);
    solver.decompose(a);
    solver.leadingVectors(3);
    const v = rowMajor(solver.vectors, n);
    const av = multiply(rowMajor(a, n), v, n, n, n);
    for (let k = 0; k < n; k++) {
      let residual = 0;
      let norm = 0;
      for (let i = 0; i < n; i++) {
        const at = 2 * (i * n + k);
        if (k < 3) {
          const lambda = solver.values[k];
          residual = Math.max(
            residual,
            Math.hypot(av[at] - lambda * v.data[at], av[at + 1] - lambda * v.data[at + 1]),
          );
          norm += v.data[at] ** 2 + v.data[at + 1] ** 2;
        } else {
          expect(v.data[at]).toBe(7);
        }
      }
      if (k < 3) {
        expect(Math.abs(solver.values[k] - [5, 4, 3][k])).toBeLessThan(1e-13 * 5);
        expect(residual).toBeLessThan(1e-13 * 5);
        expect(Math.abs(norm - 1)).toBeLessThan(1e-13);
      }
    }
  });

  it('tridiagonal Toeplitz with complex off-diagonals: λ_k = α + 2|β| cos(kπ/(n+1)) (handbook closed form, from memory)', () => {
    // Diagonal unitary similarity removes the off-diagonal phases, leaving the real Toeplitz case.
    const n = 20;
    const alpha = 1.5;
    const beta = 0.8;
    const rng = new SeededRandom(4);
    const a = new Float64Array(2 * n * n);
    for (let i = 0; i < n; i++) {
      a[2 * (i * n + i)] = alpha;
      if (i + 1 < n) {
        const phase = 2 * Math.PI * rng.uniform();
        a[2 * (i * n + i + 1)] = beta * Math.cos(phase);
        a[2 * (i * n + i + 1) + 1] = beta * Math.sin(phase);
        a[2 * ((i + 1) * n + i)] = beta * Math.cos(phase);
        a[2 * ((i + 1) * n + i) + 1] = -beta * Math.sin(phase);
      }
    }
    const solver = new HermitianEigenSolver(n);
    solver.solve(a);
    for (let k = 1; k <= n; k++) {
      expect(
        Math.abs(solver.values[k - 1] - (alpha + 2 * beta * Math.cos((k * Math.PI) / (n + 1)))),
      ).toBeLessThan(1e-13);
    }
    expect(residuals(a, solver).eig).toBeLessThan(1e-13);
  });

  it('x xᴴ + y yᴴ of size 49 has exactly two non-zero eigenvalues, those of the 2×2 Gram matrix of x and y (linear algebra, common practice)', () => {
    const n = 49;
    const x = new Float64Array(2 * n);
    const y = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      x[2 * i] = Math.cos(0.3 * i);
      x[2 * i + 1] = Math.sin(0.3 * i);
      y[2 * i] = 0.5 * Math.cos(1.1 * i);
      y[2 * i + 1] = 0.5 * Math.sin(1.1 * i);
    }
    // A = x xᴴ + y yᴴ; the two exponentials are not orthogonal, so the eigenvalues come from the 2×2 Gram.
    const a = new Float64Array(2 * n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        for (const z of [x, y]) {
          a[2 * (i * n + j)] += z[2 * i] * z[2 * j] + z[2 * i + 1] * z[2 * j + 1];
          a[2 * (i * n + j) + 1] += z[2 * i + 1] * z[2 * j] - z[2 * i] * z[2 * j + 1];
        }
      }
    }
    let xx = 0;
    let yy = 0;
    let xyRe = 0;
    let xyIm = 0;
    for (let i = 0; i < n; i++) {
      xx += x[2 * i] ** 2 + x[2 * i + 1] ** 2;
      yy += y[2 * i] ** 2 + y[2 * i + 1] ** 2;
      xyRe += x[2 * i] * y[2 * i] + x[2 * i + 1] * y[2 * i + 1];
      xyIm += x[2 * i] * y[2 * i + 1] - x[2 * i + 1] * y[2 * i];
    }
    const mean = (xx + yy) / 2;
    const radius = Math.sqrt(((xx - yy) / 2) ** 2 + xyRe ** 2 + xyIm ** 2);
    const solver = new HermitianEigenSolver(n);
    solver.solve(a);
    expect(solver.values[0]).toBeCloseTo(mean + radius, 11);
    expect(solver.values[1]).toBeCloseTo(mean - radius, 11);
    for (let k = 2; k < n; k++) expect(Math.abs(solver.values[k])).toBeLessThan(1e-12);
  });
});
