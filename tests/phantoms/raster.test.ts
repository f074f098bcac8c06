import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import type { ShapePhantom } from '../../src/phantoms/phantom.ts';
import { resolutionContrast } from '../../src/phantoms/resolution-contrast.ts';
import { sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import { maxAbsDifference } from '../error-measures.ts';

/**
 * The box average by definition: the mean over ss×ss sub-pixel points of the summed intensities of
 * the shapes containing each point, at the positions docs/design.md §3.3 gives (pixel centre
 * x_j = (j − ⌊nx/2⌋)·2/nx, y_i = −(i − ⌊ny/2⌋)·2/ny, sub-points on a regular ss×ss grid inside).
 */
function bruteForceRaster(phantom: ShapePhantom, nx: number, ny: number, ss: number): Float64Array {
  const out = new Float64Array(nx * ny);
  const hx = 2 / nx;
  const hy = 2 / ny;
  for (let i = 0; i < ny; i++) {
    for (let j = 0; j < nx; j++) {
      let sum = 0;
      for (let t = 0; t < ss; t++) {
        const y = -(i - Math.floor(ny / 2)) * hy - ((t + 0.5) / ss - 0.5) * hy;
        for (let s = 0; s < ss; s++) {
          const x = (j - Math.floor(nx / 2)) * hx + ((s + 0.5) / ss - 0.5) * hx;
          for (const shape of phantom.shapes) if (shape.contains(x, y)) sum += shape.intensity;
        }
      }
      out[i * nx + j] = sum / (ss * ss);
    }
  }
  return out;
}

describe('rasterisation', () => {
  it('equals the sample-by-sample box average at the docs/design.md §3.3 positions (non-square, odd and even sizes)', () => {
    const cases: [ShapePhantom, number, number, number][] = [
      [sheppLoganModified(), 64, 48, 1],
      [sheppLoganModified(), 63, 49, 4],
      [resolutionContrast(), 96, 81, 3],
    ];
    for (const [phantom, nx, ny, ss] of cases) {
      const image = phantom.rasterize(nx, ny, { supersample: ss });
      expect(image.nx).toBe(nx);
      expect(image.ny).toBe(ny);
      expect(maxAbsDifference(image.data, bruteForceRaster(phantom, nx, ny, ss))).toBeLessThan(1e-12);
    }
  });

  it('gives partial-volume values between the tissue values on edges when supersampled', () => {
    const plain = sheppLoganModified().rasterize(64, 64);
    const smooth = sheppLoganModified().rasterize(64, 64, { supersample: 8 });
    const levels = new Set(Array.from(plain.data, (v) => v.toFixed(9)));
    const smoothLevels = new Set(Array.from(smooth.data, (v) => v.toFixed(9)));
    // Point samples take only the few sums of table intensities; box averages take many more.
    expect(levels.size).toBeLessThan(12);
    expect(smoothLevels.size).toBeGreaterThan(100);
  });

  it('rejects bad sizes and supersampling with ValidationErrors naming the field and the range', () => {
    const phantom = sheppLoganModified();
    const fieldsOf = (fn: () => unknown): string[] => {
      try {
        fn();
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        const problems = (error as ValidationError).problems;
        for (const p of problems) expect(p.allowed).toMatch(/1 … (4096|16)/);
        return problems.map((p) => p.field);
      }
      return [];
    };
    expect(fieldsOf(() => phantom.rasterize(0, 8))).toEqual(['matrix.nx']);
    expect(fieldsOf(() => phantom.rasterize(8, 4097))).toEqual(['matrix.ny']);
    expect(fieldsOf(() => phantom.rasterize(2.5, Number.NaN))).toEqual(['matrix.nx', 'matrix.ny']);
    expect(fieldsOf(() => phantom.rasterize(8, 8, { supersample: 0 }))).toEqual(['supersample']);
    expect(fieldsOf(() => phantom.rasterize(8, 8, { supersample: 17 }))).toEqual(['supersample']);
    expect(fieldsOf(() => phantom.rasterize(8, 8, { supersample: 1.5 }))).toEqual(['supersample']);
  });
});
