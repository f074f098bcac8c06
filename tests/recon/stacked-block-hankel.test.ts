import { describe, expect, it } from 'vitest';
import { HermitianEigenSolver } from '../../src/recon/hermitian-eigen.ts';
import { StackedBlockHankel } from '../../src/recon/stacked-block-hankel.ts';
import { relativeMaxError } from '../error-measures.ts';
import { explicitGram } from './explicit-gram.ts';
import { randomComplexImage } from './helpers.ts';

/**
 * The explicit stacked matrix of Shin et al. 2014 (docs/references.md §5.3): per lifted array k one
 * block of rows (the windows fully inside the grid), columns (c, a) = c·n + a holding z_kc[p + a].
 */
function explicitStacked(
  arrays: Float64Array[][],
  nx: number,
  ny: number,
  wx: number,
  wy: number,
): Float64Array[] {
  const n = wx * wy;
  const rows: Float64Array[] = [];
  for (const coils of arrays) {
    for (let py = 0; py + wy <= ny; py++) {
      for (let px = 0; px + wx <= nx; px++) {
        const row = new Float64Array(2 * coils.length * n);
        coils.forEach((z, c) => {
          for (let ay = 0; ay < wy; ay++) {
            for (let ax = 0; ax < wx; ax++) {
              const src = 2 * ((py + ay) * nx + px + ax);
              row[2 * (c * n + ay * wx + ax)] = z[src];
              row[2 * (c * n + ay * wx + ax) + 1] = z[src + 1];
            }
          }
        });
        rows.push(row);
      }
    }
  }
  return rows;
}

describe.each([
  { nx: 9, ny: 7, wx: 2, wy: 3, coils: 3, lifted: 1 as const },
  { nx: 12, ny: 16, wx: 4, wy: 3, coils: 2, lifted: 2 as const },
  { nx: 6, ny: 5, wx: 4, wy: 3, coils: 3, lifted: 2 as const },
])(
  'stacked block-Hankel lifting of $coils coils ($ny×$nx, window $wy×$wx, $lifted array(s) per coil)',
  ({ nx, ny, wx, wy, coils, lifted }) => {
    const n = wx * wy;
    const size = coils * n;
    const arrays = Array.from({ length: lifted }, (_, k) =>
      Array.from({ length: coils }, (_, c) => randomComplexImage(nx, ny, 10 * k + c + 1).data),
    );
    const lift = new StackedBlockHankel(nx, ny, wx, wy, coils, lifted);
    const rows = explicitStacked(arrays, nx, ny, wx, wy);

    it('Gram matrix equals HᴴH of the explicit stacked matrix to 1e-12 (definition)', () => {
      const gram = new Float64Array(2 * size * size);
      lift.gram(gram, arrays);
      // max |Δ| over the largest |(HᴴH)_ab|.
      expect(relativeMaxError(gram, explicitGram(rows, size))).toBeLessThan(1e-12);
    });

    it('projection equals H†(H Π) per coil, computed explicitly, border samples included (definition)', () => {
      const gram = new Float64Array(2 * size * size);
      lift.gram(gram, arrays);
      const solver = new HermitianEigenSolver(size);
      solver.solve(gram);
      const rank = 3;
      lift.setProjector(solver.vectors, rank);
      const outs = arrays.map((coilsOf) => coilsOf.map(() => new Float64Array(2 * nx * ny)));
      lift.project(outs);
      // Explicit: project every row onto the leading eigenvectors, scatter-add per coil, divide by counts.
      const sums = arrays.map((coilsOf) => coilsOf.map(() => new Float64Array(2 * nx * ny)));
      const count = new Float64Array(nx * ny);
      const windows = (nx - wx + 1) * (ny - wy + 1);
      rows.forEach((row, r) => {
        const k = Math.floor(r / windows);
        const p = r - k * windows;
        const py = Math.floor(p / (nx - wx + 1));
        const px = p - py * (nx - wx + 1);
        const projected = new Float64Array(2 * size);
        for (let j = 0; j < rank; j++) {
          let cr = 0;
          let ci = 0;
          for (let a = 0; a < size; a++) {
            const vr = solver.vectors[2 * (a * size + j)];
            const vi = solver.vectors[2 * (a * size + j) + 1];
            cr += row[2 * a] * vr - row[2 * a + 1] * vi;
            ci += row[2 * a] * vi + row[2 * a + 1] * vr;
          }
          for (let b = 0; b < size; b++) {
            const vr = solver.vectors[2 * (b * size + j)];
            const vi = -solver.vectors[2 * (b * size + j) + 1];
            projected[2 * b] += cr * vr - ci * vi;
            projected[2 * b + 1] += cr * vi + ci * vr;
          }
        }
        for (let c = 0; c < coils; c++) {
          for (let ay = 0; ay < wy; ay++) {
            for (let ax = 0; ax < wx; ax++) {
              const q = (py + ay) * nx + px + ax;
              sums[k][c][2 * q] += projected[2 * (c * n + ay * wx + ax)];
              sums[k][c][2 * q + 1] += projected[2 * (c * n + ay * wx + ax) + 1];
              if (k === 0 && c === 0) count[q]++;
            }
          }
        }
      });
      let worst = 0;
      let scale = 0;
      for (let k = 0; k < lifted; k++) {
        for (let c = 0; c < coils; c++) {
          for (let q = 0; q < nx * ny; q++) {
            const er = sums[k][c][2 * q] / count[q];
            const ei = sums[k][c][2 * q + 1] / count[q];
            scale = Math.max(scale, Math.hypot(er, ei));
            worst = Math.max(worst, Math.hypot(outs[k][c][2 * q] - er, outs[k][c][2 * q + 1] - ei));
          }
        }
      }
      expect(worst / scale).toBeLessThan(1e-12);
    });
  },
);
