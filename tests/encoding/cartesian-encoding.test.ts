import { describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { cloneComplexImage, createComplexImage } from '../../src/core/complex-image.ts';
import { CartesianEncoding } from '../../src/encoding/cartesian-encoding.ts';
import { createMultiCoilArray } from '../../src/encoding/multi-coil.ts';
import { relativeError } from '../error-measures.ts';
import { randomComplexImage } from '../recon/helpers.ts';
import { inner, randomMask, randomStack, sameBits } from './helpers.ts';

/**
 * The encoding operator against its definition. Adjointness ⟨Ex, y⟩ = ⟨x, Eᴴy⟩ and EᴴE = Eᴴ∘E are the
 * usual dot-product tests of a linear operator pair (common practice); single-coil equality is
 * against the project's own fft2c / ifft2c, which tests/core checks against numpy.
 */
const sizes: [number, number][] = [
  [16, 16],
  [15, 12],
  [9, 20],
];

describe('CartesianEncoding without sensitivities is today’s single-coil operator', () => {
  for (const [nx, ny] of sizes) {
    it(`forward = mask ⊙ fft2c(x) and adjoint = ifft2c(mask ⊙ y), bit for bit, ${ny}×${nx}`, () => {
      const mask = randomMask(nx, ny, 0.4, nx + ny);
      const op = new CartesianEncoding(nx, ny, mask);
      const x = randomComplexImage(nx, ny, 1);
      const xBefore = x.data.slice();
      const expected = fft2c(x);
      for (let i = 0; i < mask.length; i++) {
        if (mask[i]) continue;
        expected.data[2 * i] = 0;
        expected.data[2 * i + 1] = 0;
      }
      const y = op.forward(x);
      expect(y.coils).toBe(1);
      expect(sameBits(y.data, expected.data)).toBe(true);
      expect(sameBits(x.data, xBefore)).toBe(true);

      const data = randomComplexImage(nx, ny, 2);
      const masked = createComplexImage(nx, ny);
      for (let i = 0; i < mask.length; i++) {
        if (!mask[i]) continue;
        masked.data[2 * i] = data.data[2 * i];
        masked.data[2 * i + 1] = data.data[2 * i + 1];
      }
      const expectedAdjoint = ifft2c(masked);
      const adjoint = op.adjoint({ coils: 1, nx, ny, data: data.data });
      expect(sameBits(adjoint.data, expectedAdjoint.data)).toBe(true);

      const normal = op.normal(x);
      const twoStep = ifft2c(expected);
      expect(sameBits(normal.data, twoStep.data)).toBe(true);
    });
  }
});

describe('CartesianEncoding with coil sensitivities', () => {
  for (const [nx, ny] of sizes) {
    for (const coils of [1, 4]) {
      const mask = randomMask(nx, ny, 0.35, 7 * nx + ny);
      const maps = randomStack(coils, nx, ny, 3 + coils);
      const op = new CartesianEncoding(nx, ny, mask, maps);

      it(`adjoint identity ⟨Ex, y⟩ = ⟨x, Eᴴy⟩ to 1e-12 relative, ${coils} coils ${ny}×${nx}`, () => {
        for (let trial = 0; trial < 3; trial++) {
          const x = randomComplexImage(nx, ny, 100 + trial);
          const y = randomStack(coils, nx, ny, 200 + trial);
          const [ar, ai] = inner(op.forward(x).data, y.data);
          const [br, bi] = inner(x.data, op.adjoint(y).data);
          const relative = Math.hypot(ar - br, ai - bi) / Math.hypot(ar, ai);
          expect(relative).toBeLessThan(1e-12); // measured ≤ 2.0e-15
        }
      });

      it(`normal = adjoint ∘ forward, ${coils} coils ${ny}×${nx}`, () => {
        const x = randomComplexImage(nx, ny, 300);
        const twoStep = op.adjoint(op.forward(x));
        const normal = op.normal(x);
        // Same operations in the same order: equal to rounding (measured 0; slack for other engines).
        expect(relativeError(normal.data, twoStep.data)).toBeLessThan(1e-14);
        // out may be the input itself.
        const inPlace = cloneComplexImage(x);
        op.normal(inPlace, inPlace);
        expect(sameBits(inPlace.data, normal.data)).toBe(true);
      });
    }
  }

  it('forward is coil-major: block c is mask ⊙ fft2c(S_c ⊙ x)', () => {
    const [nx, ny, coils] = [12, 10, 3];
    const mask = randomMask(nx, ny, 0.5, 5);
    const maps = randomStack(coils, nx, ny, 6);
    const x = randomComplexImage(nx, ny, 7);
    const y = new CartesianEncoding(nx, ny, mask, maps).forward(x);
    const n = nx * ny;
    for (let c = 0; c < coils; c++) {
      const product = createComplexImage(nx, ny);
      for (let i = 0; i < n; i++) {
        const sr = maps.data[2 * (c * n + i)];
        const si = maps.data[2 * (c * n + i) + 1];
        product.data[2 * i] = sr * x.data[2 * i] - si * x.data[2 * i + 1];
        product.data[2 * i + 1] = sr * x.data[2 * i + 1] + si * x.data[2 * i];
      }
      const k = fft2c(product);
      for (let i = 0; i < n; i++) {
        const w = mask[i];
        expect(y.data[2 * (c * n + i)]).toBe(w ? k.data[2 * i] : 0);
        expect(y.data[2 * (c * n + i) + 1]).toBe(w ? k.data[2 * i + 1] : 0);
      }
    }
  });

  it('EᴴE is the identity for a full mask and Σ|S_c|² = 1 (F unitary; common practice)', () => {
    const [nx, ny, coils] = [8, 6, 3];
    const maps = randomStack(coils, nx, ny, 9);
    const n = nx * ny;
    for (let i = 0; i < n; i++) {
      let sum = 0;
      for (let c = 0; c < coils; c++)
        sum += maps.data[2 * (c * n + i)] ** 2 + maps.data[2 * (c * n + i) + 1] ** 2;
      for (let c = 0; c < coils; c++) {
        maps.data[2 * (c * n + i)] /= Math.sqrt(sum);
        maps.data[2 * (c * n + i) + 1] /= Math.sqrt(sum);
      }
    }
    const op = new CartesianEncoding(nx, ny, new Uint8Array(n).fill(1), maps);
    const x = randomComplexImage(nx, ny, 10);
    const result = op.normal(x);
    for (let i = 0; i < result.data.length; i++) expect(result.data[i]).toBeCloseTo(x.data[i], 12);
  });

  it('refuses mismatched shapes', () => {
    expect(() => new CartesianEncoding(8, 8, new Uint8Array(63))).toThrow(/mask/);
    expect(() => new CartesianEncoding(8, 8, new Uint8Array(64), createMultiCoilArray(2, 8, 7))).toThrow(
      /sensitivities/,
    );
    const op = new CartesianEncoding(8, 8, new Uint8Array(64));
    expect(() => op.forward(createComplexImage(8, 7))).toThrow(/x is 7×8/);
    expect(() => op.adjoint(createMultiCoilArray(2, 8, 8))).toThrow(/y is 2 coils/);
  });
});
