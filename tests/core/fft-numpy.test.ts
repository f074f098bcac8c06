import { describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import type { ComplexImage } from '../../src/core/complex-image.ts';
import { relativeMaxError } from '../error-measures.ts';
import { type FftCase, fftFixture as fixture, fixtureInput } from './fft-numpy-fixture.ts';

/**
 * fft2c / ifft2c against numpy.fft (Debian python3-numpy): tests/reference/fixtures/fft-numpy.json
 * (see fft-numpy-fixture.ts), forward = fftshift(fft2(ifftshift(x), norm='ortho')) and the inverse
 * likewise.
 */
function inputImage(c: FftCase): ComplexImage {
  return { nx: c.nx, ny: c.ny, data: fixtureInput(c) };
}

// Tolerance: measured ≤ 1.2e-15 on every case (both are float64 FFTs, rounding O(ε·log N)); 1e-13
// leaves ~100× slack and still catches any convention slip (a shift or scale error is O(1)).
describe('centred orthonormal FFT against numpy.fft (fixture)', () => {
  it('covers odd, non-power-of-two and non-square sizes', () => {
    const sizes = fixture.cases.map((c) => `${c.ny}x${c.nx}`);
    expect(sizes).toEqual(expect.arrayContaining(['8x8', '7x5', '12x20', '33x31', '64x48']));
  });
  for (const c of fixture.cases) {
    it(`${c.ny}×${c.nx}: fft2c matches numpy to 1e-13 relative`, () => {
      const out = fft2c(inputImage(c));
      expect(out.data.length).toBe(c.forward.length);
      expect(relativeMaxError(out.data, c.forward)).toBeLessThanOrEqual(1e-13);
    });
    it(`${c.ny}×${c.nx}: ifft2c matches numpy to 1e-13 relative`, () => {
      const out = ifft2c(inputImage(c));
      expect(relativeMaxError(out.data, c.inverse)).toBeLessThanOrEqual(1e-13);
    });
  }
});
