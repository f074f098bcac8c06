import { describe, expect, it } from 'vitest';
import { BlockHankel } from '../../src/recon/block-hankel.ts';
import { HermitianEigenSolver } from '../../src/recon/hermitian-eigen.ts';
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
      let worst = 0;
      for (let a = 0; a < n; a++) {
        for (let b = 0; b < n; b++) {
          let re = 0;
          let im = 0;
          for (const z of arrays) {
            for (const row of explicitHankel(z, nx, ny, wx, wy)) {
              re += row[2 * a] * row[2 * b] + row[2 * a + 1] * row[2 * b + 1];
              im += row[2 * a] * row[2 * b + 1] - row[2 * a + 1] * row[2 * b];
            }
          }
          worst = Math.max(worst, Math.hypot(gram[2 * (a * n + b)] - re, gram[2 * (a * n + b) + 1] - im));
        }
      }
      expect(worst).toBeLessThan(1e-12);
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
    // Explicit: project every row onto span(v_0, v_1), scatter-add, divide by the counts.
    const sum = new Float64Array(2 * nx * ny);
    const count = new Float64Array(nx * ny);
    const rows = explicitHankel(z1, nx, ny, wx, wy);
    let r = 0;
    for (let py = 0; py + wy <= ny; py++) {
      for (let px = 0; px + wx <= nx; px++, r++) {
        const row = rows[r];
        const projected = new Float64Array(2 * n);
        for (let k = 0; k < rank; k++) {
          let cr = 0;
          let ci = 0;
          for (let a = 0; a < n; a++) {
            const vr = solver.vectors[2 * (a * n + k)];
            const vi = solver.vectors[2 * (a * n + k) + 1];
            cr += row[2 * a] * vr - row[2 * a + 1] * vi;
            ci += row[2 * a] * vi + row[2 * a + 1] * vr;
          }
          for (let b = 0; b < n; b++) {
            const vr = solver.vectors[2 * (b * n + k)];
            const vi = -solver.vectors[2 * (b * n + k) + 1];
            projected[2 * b] += cr * vr - ci * vi;
            projected[2 * b + 1] += cr * vi + ci * vr;
          }
        }
        for (let ay = 0; ay < wy; ay++) {
          for (let ax = 0; ax < wx; ax++) {
            const q = (py + ay) * nx + px + ax;
            sum[2 * q] += projected[2 * (ay * wx + ax)];
            sum[2 * q + 1] += projected[2 * (ay * wx + ax) + 1];
            count[q]++;
          }
        }
      }
    }
    let worst = 0;
    for (let q = 0; q < nx * ny; q++) {
      worst = Math.max(
        worst,
        Math.hypot(out[2 * q] - sum[2 * q] / count[q], out[2 * q + 1] - sum[2 * q + 1] / count[q]),
      );
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
