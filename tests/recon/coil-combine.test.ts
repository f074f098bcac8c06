import { describe, expect, it } from 'vitest';
import { fft2c } from '../../src/core/centered-fft.ts';
import { createMultiCoilArray } from '../../src/encoding/index.ts';
import { coilImages, combineCoilImages, zeroFilledCoilCombination } from '../../src/recon/index.ts';

// Coil combination (Roemer, Edelstein, Hayes, Souza & Mueller 1990): the sensitivity-weighted sum
// Σ S_c*·x_c / Σ |S_c|² returns x from coil images x_c = S_c·x; the root-sum-of-squares returns
// |x|·√(Σ|S_c|²) (common practice). Hand-made maps and object, so the answers are known exactly.

const nx = 6;
const ny = 5;
const n = nx * ny;
const coils = 3;

function object(): Float64Array {
  const x = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    x[2 * i] = Math.cos(i) + 1.5;
    x[2 * i + 1] = 0.3 * Math.sin(2 * i);
  }
  return x;
}

function maps() {
  const s = createMultiCoilArray(coils, nx, ny);
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      s.data[2 * (c * n + i)] = 0.2 + 0.1 * c + 0.01 * i;
      s.data[2 * (c * n + i) + 1] = 0.05 * (c - 1) * Math.cos(i);
    }
  }
  return s;
}

/** x_c = S_c·x for every coil. */
function coilImagesOf(x: Float64Array, s: ReturnType<typeof maps>) {
  const out = createMultiCoilArray(coils, nx, ny);
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      const at = 2 * (c * n + i);
      out.data[at] = s.data[at] * x[2 * i] - s.data[at + 1] * x[2 * i + 1];
      out.data[at + 1] = s.data[at] * x[2 * i + 1] + s.data[at + 1] * x[2 * i];
    }
  }
  return out;
}

describe('coil combination', () => {
  it('sensitivity-weighted: returns x from S_c·x to rounding', () => {
    const x = object();
    const s = maps();
    const combined = combineCoilImages(coilImagesOf(x, s), s).image;
    for (let k = 0; k < 2 * n; k++) expect(combined.data[k]).toBeCloseTo(x[k], 14);
  });

  it('root-sum-of-squares: |x|·√(Σ|S_c|²), real', () => {
    const x = object();
    const s = maps();
    const combined = combineCoilImages(coilImagesOf(x, s)).image;
    for (let i = 0; i < n; i++) {
      let gain = 0;
      for (let c = 0; c < coils; c++) gain += s.data[2 * (c * n + i)] ** 2 + s.data[2 * (c * n + i) + 1] ** 2;
      expect(combined.data[2 * i]).toBeCloseTo(Math.hypot(x[2 * i], x[2 * i + 1]) * Math.sqrt(gain), 14);
      expect(combined.data[2 * i + 1]).toBe(0);
    }
  });

  it('a pixel no coil sees combines to 0, not NaN', () => {
    const s = maps();
    for (let c = 0; c < coils; c++) s.data.fill(0, 2 * c * n, 2 * c * n + 2);
    const combined = combineCoilImages(coilImagesOf(object(), s), s).image;
    expect([combined.data[0], combined.data[1]]).toEqual([0, 0]);
  });

  it('zero-filled: fully sampled coil k-space F(S_c·x) comes back to x; coilImages inverts fft2c per coil', () => {
    const x = object();
    const s = maps();
    const images = coilImagesOf(x, s);
    const kspace = createMultiCoilArray(coils, nx, ny);
    for (let c = 0; c < coils; c++) {
      const plane = fft2c({ nx, ny, data: images.data.slice(2 * c * n, 2 * (c + 1) * n) });
      kspace.data.set(plane.data, 2 * c * n);
    }
    const back = coilImages(kspace);
    for (let k = 0; k < back.data.length; k++) expect(back.data[k]).toBeCloseTo(images.data[k], 13);
    const combined = zeroFilledCoilCombination({ kspace, maps: s });
    for (let k = 0; k < 2 * n; k++) expect(combined.data[k]).toBeCloseTo(x[k], 13);
  });
});
