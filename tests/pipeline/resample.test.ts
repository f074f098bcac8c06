import { describe, expect, it } from 'vitest';
import { resampleBilinear } from '../../src/pipeline/resample.ts';

// Bilinear interpolation reproduces affine functions exactly (textbook property, common practice),
// so resampling samples of f(x, y) = a + b·x + c·y taken at the source pixel centres must give f at the
// target pixel centres, mapped centre to centre: source coordinate = (i + ½)·n_src/n_dst − ½.
const affine = (x: number, y: number) => 0.3 + 2.5 * x - 1.25 * y;

function sampled(nx: number, ny: number) {
  const data = new Float64Array(nx * ny);
  for (let i = 0; i < ny; i++) for (let j = 0; j < nx; j++) data[i * nx + j] = affine(j, i);
  return { nx, ny, data };
}

describe('resampleBilinear (uploaded image to the requested matrix)', () => {
  it('reproduces an affine image at every target centre that maps inside the source (down and up)', () => {
    for (const [sx, sy, tx, ty] of [
      [48, 40, 32, 24],
      [20, 16, 50, 37],
    ]) {
      const out = resampleBilinear(sampled(sx, sy), tx, ty);
      expect([out.nx, out.ny]).toEqual([tx, ty]);
      let checked = 0;
      for (let i = 0; i < ty; i++) {
        for (let j = 0; j < tx; j++) {
          const x = (j + 0.5) * (sx / tx) - 0.5;
          const y = (i + 0.5) * (sy / ty) - 0.5;
          if (x < 0 || y < 0 || x > sx - 1 || y > sy - 1) continue; // clamped edge: not affine there
          expect(Math.abs(out.data[i * tx + j] - affine(x, y))).toBeLessThan(1e-12);
          checked++;
        }
      }
      expect(checked).toBeGreaterThan(0.8 * tx * ty);
    }
  });

  it('clamps beyond the outer centres: upsampled edges repeat the edge value', () => {
    const out = resampleBilinear(sampled(4, 1), 8, 1);
    // Target centre 0 maps to x = −0.25 → clamped to 0; target 7 maps to 3.25 → clamped to 3.
    expect(out.data[0]).toBeCloseTo(affine(0, 0), 14);
    expect(out.data[7]).toBeCloseTo(affine(3, 0), 14);
  });

  it('returns the image itself when the size already matches', () => {
    const image = sampled(5, 3);
    expect(resampleBilinear(image, 5, 3)).toBe(image);
  });
});
