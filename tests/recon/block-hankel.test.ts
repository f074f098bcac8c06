import { describe, expect, it } from 'vitest';
import { BlockHankel } from '../../src/recon/block-hankel.ts';
import { HermitianEigenSolver } from '../../src/recon/hermitian-eigen.ts';
import { maxPixelDistance, relativeError } from '../error-measures.ts';
import { explicitGram } from './explicit-gram.ts';
import { friSignal1d, POINT_SOURCES, pointSourceKspace, randomComplexImage } from './helpers.ts';

/** The explicit block-Hankel matrix (rows = windows fully inside, columns = window offsets). */
function explicitHankel(z: Float64Array, nx: number, ny: number, wx: number, wy: number): Float64Array[] {
  const rows: Float64Array[] = [];
  for (let py = 0; py + wy <= ny; py++) {
    for (let px = 0; px + wx <= nx; px++) {
      const row = new Float64Array(2 * wx * wy);
      for (let ay = 0; ay < wy; ay++) {
        for (let ax = 0; ax < wx; ax++) {
          const src = 2 * ((py + ay) * nx + px + ax);
          row[2 * (ay * wx + ax)] = z[src];
          row[2 * (ay * wx + ax) + 1] = z[src + 1];
        }
      }
      rows.push(row);
    }
  }
  return rows;
}

describe.each([
  { nx: 9, ny: 7, wx: 2, wy: 3 },
  { nx: 12, ny: 16, wx: 4, wy: 3 },
  { nx: 6, ny: 5, wx: 4, wy: 3 },
])('block-Hankel lifting without forming the matrix ($ny×$nx, window $wy×$wx)', ({ nx, ny, wx, wy }) => {
  const n = wx * wy;
  const z1 = randomComplexImage(nx, ny, 1).data;
  const z2 = randomComplexImage(nx, ny, 2).data;
  const lift = new BlockHankel(nx, ny, wx, wy);

  it('Gram matrix from corner sums equals Σ HᴴH of the explicit matrices, one or two arrays (definition)', () => {
    for (const arrays of [[z1, z2], [z1]]) {
      const gram = new Float64Array(2 * n * n);
      lift.gram(gram, arrays);
      const explicit = explicitGram(
        arrays.flatMap((z) => explicitHankel(z, nx, ny, wx, wy)),
        n,
      );
      expect(maxPixelDistance(gram, explicit)).toBeLessThan(1e-12);
    }
  });

  it('projection + averaging equals H†(H Π) computed explicitly, border samples included (definition)', () => {
    const gram = new Float64Array(2 * n * n);
    lift.gram(gram, [z1]);
    const solver = new HermitianEigenSolver(n);
    solver.solve(gram);
    const rank = 2;
    const projector = new Float64Array(2 * n * n);
    lift.setProjector(projector, solver.vectors, rank);
    const out = new Float64Array(2 * nx * ny);
    lift.projectAverage(out, z1);
    // Explicit: project every window onto span(v_0, v_1), scatter-add, divide by the counts.
    const explicit = patchLoopProjection(z1, solver.vectors, rank, nx, ny, wx, wy);
    let worst = 0;
    for (let q = 0; q < nx * ny; q++) {
      worst = Math.max(worst, Math.hypot(out[2 * q] - explicit[2 * q], out[2 * q + 1] - explicit[2 * q + 1]));
    }
    expect(worst).toBeLessThan(1e-12);
    // The fused two-array pass gives the same as two single passes.
    const a = new Float64Array(2 * nx * ny);
    const b = new Float64Array(2 * nx * ny);
    const single = new Float64Array(2 * nx * ny);
    lift.projectAverage(a, z1, b, z2);
    expect(Array.from(a)).toEqual(Array.from(out));
    lift.projectAverage(single, z2);
    expect(Array.from(b)).toEqual(Array.from(single));
  });
});

describe('finite rate of innovation: Hankel rank of sums of exponentials (Vetterli, Marziliano & Blu 2002)', () => {
  it('1-D, M = 64, K = 3 exponentials: Hankel rank 3 for windows L = 4, 8, 16, 32 (docs/references.md §5.3 [C])', () => {
    const m = 64;
    const x = friSignal1d();
    for (const L of [4, 8, 16, 32]) {
      const lift = new BlockHankel(m, 1, L, 1);
      const gram = new Float64Array(2 * L * L);
      lift.gram(gram, [x]);
      const solver = new HermitianEigenSolver(L);
      solver.solve(gram);
      // Gram eigenvalues are σ²: the rank gap shows as λ₄/λ₁ at the float64 floor (σ₄/σ₁ ≲ √ε).
      expect(solver.values[2] / solver.values[0]).toBeGreaterThan(0.1);
      expect(Math.abs(solver.values[3]) / solver.values[0]).toBeLessThan(1e-14);
    }
  });

  it('2-D, 32×32 k-space of K off-grid point sources: block-Hankel (6×6 windows) rank K (docs/references.md §5.3 [C])', () => {
    for (const K of [2, 4]) {
      const k = pointSourceKspace(32, 32, POINT_SOURCES.slice(0, K));
      const lift = new BlockHankel(32, 32, 6, 6);
      const gram = new Float64Array(2 * 36 * 36);
      lift.gram(gram, [k.data]);
      const solver = new HermitianEigenSolver(36);
      solver.solve(gram);
      expect(solver.values[K - 1] / solver.values[0]).toBeGreaterThan(0.05);
      expect(Math.abs(solver.values[K]) / solver.values[0]).toBeLessThan(1e-14);
    }
  });
});

/** Gram matrix by its definition, a loop over the windows: G[a,b] = Σ_z Σ_{p∈V} conj(z[p+a]) z[p+b]. */
function patchLoopGram(arrays: Float64Array[], nx: number, ny: number, wx: number, wy: number): Float64Array {
  const n = wx * wy;
  const gram = new Float64Array(2 * n * n);
  const window = new Float64Array(2 * n);
  for (const z of arrays) {
    for (let py = 0; py + wy <= ny; py++) {
      for (let px = 0; px + wx <= nx; px++) {
        for (let a = 0; a < n; a++) {
          const src = 2 * ((py + Math.floor(a / wx)) * nx + px + (a % wx));
          window[2 * a] = z[src];
          window[2 * a + 1] = z[src + 1];
        }
        for (let a = 0; a < n; a++) {
          for (let b = 0; b < n; b++) {
            gram[2 * (a * n + b)] += window[2 * a] * window[2 * b] + window[2 * a + 1] * window[2 * b + 1];
            gram[2 * (a * n + b) + 1] +=
              window[2 * a] * window[2 * b + 1] - window[2 * a + 1] * window[2 * b];
          }
        }
      }
    }
  }
  return gram;
}

/**
 * H†(H(z) Π) by its definition: every window projected onto span(v_0 … v_{rank−1}), added back
 * where it came from, each sample divided by the number of windows that cover it.
 */
function patchLoopProjection(
  z: Float64Array,
  vectors: Float64Array,
  rank: number,
  nx: number,
  ny: number,
  wx: number,
  wy: number,
): Float64Array {
  const n = wx * wy;
  const sum = new Float64Array(2 * nx * ny);
  const count = new Float64Array(nx * ny);
  for (let py = 0; py + wy <= ny; py++) {
    for (let px = 0; px + wx <= nx; px++) {
      const at = (a: number) => (py + Math.floor(a / wx)) * nx + px + (a % wx);
      for (let k = 0; k < rank; k++) {
        // c = h · v_k, then h Π = Σ_k c_k v_kᴴ.
        let cr = 0;
        let ci = 0;
        for (let a = 0; a < n; a++) {
          const vr = vectors[2 * (a * n + k)];
          const vi = vectors[2 * (a * n + k) + 1];
          cr += z[2 * at(a)] * vr - z[2 * at(a) + 1] * vi;
          ci += z[2 * at(a)] * vi + z[2 * at(a) + 1] * vr;
        }
        for (let b = 0; b < n; b++) {
          const vr = vectors[2 * (b * n + k)];
          const vi = -vectors[2 * (b * n + k) + 1];
          sum[2 * at(b)] += cr * vr - ci * vi;
          sum[2 * at(b) + 1] += cr * vi + ci * vr;
        }
      }
      for (let b = 0; b < n; b++) count[at(b)]++;
    }
  }
  for (let q = 0; q < nx * ny; q++) {
    sum[2 * q] /= count[q];
    sum[2 * q + 1] /= count[q];
  }
  return sum;
}

// Sizes odd and even, windows odd, even and mixed; 8×6 in 12×9 has no sample that sees every
// window and its wrap bands overlap (2·6 − 2 > 9); 1×32 on 64×1 is the 1-D case.
describe.each([
  { nx: 40, ny: 33, wx: 7, wy: 7 },
  { nx: 48, ny: 64, wx: 6, wy: 6 },
  { nx: 31, ny: 29, wx: 4, wy: 5 },
  { nx: 96, ny: 80, wx: 7, wy: 7 },
  { nx: 12, ny: 9, wx: 8, wy: 6 },
  { nx: 64, ny: 1, wx: 32, wy: 1 },
])(
  'FFT-based Gram matrix and projection against the patch-loop definitions ($ny×$nx, window $wy×$wx)',
  ({ nx, ny, wx, wy }) => {
    const n = wx * wy;
    const z1 = randomComplexImage(nx, ny, 21).data;
    const z2 = randomComplexImage(nx, ny, 22).data;
    // Measured worst relative differences over these cases: Gram 2.6e-15, projection 1.4e-15;
    // asserted 1e-10 (the bound asked of the fast forms; FFT rounding grows like log N).
    it('Gram matrix of one and of two stacked arrays equals Σ_p h_pᴴ h_p to 1e-10 relative', () => {
      const lift = new BlockHankel(nx, ny, wx, wy);
      for (const arrays of [[z1], [z1, z2]]) {
        const fast = new Float64Array(2 * n * n);
        lift.gram(fast, arrays);
        expect(relativeError(fast, patchLoopGram(arrays, nx, ny, wx, wy))).toBeLessThan(1e-10);
      }
    });

    it('projection and averaging, alone, after gram (shared transforms) and conjugated, equal the definition to 1e-10 relative', () => {
      const lift = new BlockHankel(nx, ny, wx, wy);
      const gram = new Float64Array(2 * n * n);
      lift.gram(gram, [z1, z2]);
      const solver = new HermitianEigenSolver(n);
      solver.solve(gram);
      for (const rank of [1, Math.max(1, Math.round(n / 2)), n - 1]) {
        const projector = new Float64Array(2 * n * n);
        lift.setProjector(projector, solver.vectors, rank);
        const expected1 = patchLoopProjection(z1, solver.vectors, rank, nx, ny, wx, wy);
        const expected2 = patchLoopProjection(z2, solver.vectors, rank, nx, ny, wx, wy);
        const out1 = new Float64Array(2 * nx * ny);
        const out2 = new Float64Array(2 * nx * ny);
        lift.projectAverage(out1, z1);
        expect(relativeError(out1, expected1)).toBeLessThan(1e-10);
        lift.gram(gram, [z1, z2]);
        lift.projectLifted(out1, out2);
        expect(relativeError(out1, expected1)).toBeLessThan(1e-10);
        expect(relativeError(out2, expected2)).toBeLessThan(1e-10);
        // conjugated: the same samples, complex conjugated (every sample: interior, strips, corners).
        lift.gram(gram, [z1, z2]);
        lift.projectLifted(out1, out2, true);
        const conj = (v: Float64Array) => v.map((x, i) => (i % 2 === 1 ? -x : x));
        expect(relativeError(out1, conj(expected1))).toBeLessThan(1e-10);
        expect(relativeError(out2, conj(expected2))).toBeLessThan(1e-10);
      }
    });
  },
);
