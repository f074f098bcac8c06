import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { BlockHankel } from '../../src/recon/block-hankel.ts';
import { relativeMaxError } from '../error-measures.ts';

/**
 * The FFT forms of the block-Hankel Gram matrix and projection against numpy's dense linear algebra
 * on the explicit matrix (Debian python3-numpy): tests/reference/fixtures/block-hankel.json, written
 * by tests/reference/generate_hankel_fixture.py as gram = HᴴH of the windows fully inside (Haldar
 * 2014; Shin et al. 2014; docs/references.md §5.3) and projection = the anti-diagonal average of
 * H·U_r U_rᴴ, U_r the leading eigenvectors from numpy.linalg.eigh.
 */
interface HankelCase {
  ny: number;
  nx: number;
  wy: number;
  wx: number;
  rank: number;
  z1: number[];
  z2: number[];
  gramOne: number[];
  gramTwo: number[];
  vectors: number[];
  projection1: number[];
  projection2: number[];
}

const fixture: { inputScale: number; cases: HankelCase[] } = JSON.parse(
  readFileSync(new URL('../reference/fixtures/block-hankel.json', import.meta.url), 'utf8'),
);

const input = (values: number[]) => Float64Array.from(values, (v) => v * fixture.inputScale);

/** The fixture's rank columns placed as the first columns of an n×n eigenvector matrix. */
function vectorMatrix(c: HankelCase): Float64Array {
  const n = c.wx * c.wy;
  const vectors = new Float64Array(2 * n * n);
  for (let a = 0; a < n; a++) {
    for (let k = 0; k < c.rank; k++) {
      vectors[2 * (a * n + k)] = c.vectors[2 * (a * c.rank + k)];
      vectors[2 * (a * n + k) + 1] = c.vectors[2 * (a * c.rank + k) + 1];
    }
  }
  return vectors;
}

// Tolerance 1e-10 relative to the largest entry, the bound asked of the fast forms. Measured worst:
// Gram 8.0e-16, projection 1.1e-15; a projector of rank r − 1 instead of r is off by 0.11–0.22.
describe('block-Hankel Gram matrix and projection against numpy on the explicit matrix (fixture)', () => {
  it('covers a 7×7 window and a window with no interior sample', () => {
    const shapes = fixture.cases.map((c) => `${c.ny}x${c.nx}/${c.wy}x${c.wx}`);
    expect(shapes).toEqual(expect.arrayContaining(['24x20/7x7', '9x12/6x8']));
  });
  for (const c of fixture.cases) {
    const label = `${c.ny}×${c.nx}, window ${c.wy}×${c.wx}`;
    const n = c.wx * c.wy;
    const z1 = input(c.z1);
    const z2 = input(c.z2);

    it(`${label}: gram of one and of two arrays matches numpy HᴴH to 1e-10`, () => {
      const lift = new BlockHankel(c.nx, c.ny, c.wx, c.wy);
      const gram = new Float64Array(2 * n * n);
      lift.gram(gram, [z1]);
      expect(relativeMaxError(gram, c.gramOne)).toBeLessThanOrEqual(1e-10);
      lift.gram(gram, [z1, z2]);
      expect(relativeMaxError(gram, c.gramTwo)).toBeLessThanOrEqual(1e-10);
    });

    it(`${label}: rank-${c.rank} projection, averaged back, matches numpy to 1e-10 (alone and after gram)`, () => {
      const lift = new BlockHankel(c.nx, c.ny, c.wx, c.wy);
      lift.setProjector(new Float64Array(2 * n * n), vectorMatrix(c), c.rank);
      const out1 = new Float64Array(2 * c.nx * c.ny);
      const out2 = new Float64Array(2 * c.nx * c.ny);
      lift.projectAverage(out1, z1, out2, z2);
      expect(relativeMaxError(out1, c.projection1)).toBeLessThanOrEqual(1e-10);
      expect(relativeMaxError(out2, c.projection2)).toBeLessThanOrEqual(1e-10);
      out1.fill(0);
      out2.fill(0);
      lift.gram(new Float64Array(2 * n * n), [z1, z2]);
      lift.projectLifted(out1, out2);
      expect(relativeMaxError(out1, c.projection1)).toBeLessThanOrEqual(1e-10);
      expect(relativeMaxError(out2, c.projection2)).toBeLessThanOrEqual(1e-10);
    });
  }
});
