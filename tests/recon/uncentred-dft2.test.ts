import { describe, expect, it } from 'vitest';
import { Dft2 } from '../../src/recon/uncentred-dft2.ts';
import { fftFixture, fixtureInput, fixtureUncentredSpectrum } from '../core/fft-numpy-fixture.ts';
import { relativeMaxError } from '../error-measures.ts';

/**
 * The unnormalised 2D DFT of the Hankel solvers against numpy.fft (Debian python3-numpy):
 * tests/reference/fixtures/fft-numpy.json holds fftshift(fft2(ifftshift(x), norm='ortho'))
 * (tests/reference/generate_fixtures.py), which the shift theorem (dcFirstSpectrum) turns into
 * numpy's fft2(x), DC first. Heights 8 and 64 run the batched radix-2 column pass (odd and even
 * stage counts), the others the gathered columns. Tolerance as in tests/core/plain-fft-2d.test.ts.
 */

/** X[−v, −u] of a DC-first ny×nx spectrum. */
function mirrored(spectrum: Float64Array, nx: number, ny: number): Float64Array {
  const out = new Float64Array(spectrum.length);
  for (let v = 0; v < ny; v++) {
    for (let u = 0; u < nx; u++) {
      const from = 2 * (((ny - v) % ny) * nx + ((nx - u) % nx));
      out[2 * (v * nx + u)] = spectrum[from];
      out[2 * (v * nx + u) + 1] = spectrum[from + 1];
    }
  }
  return out;
}

describe('Dft2: the Hankel solvers’ DFT against numpy.fft.fft2 (fixture, odd and even sizes)', () => {
  for (const c of fftFixture.cases) {
    const { nx, ny } = c;
    const n = nx * ny;
    const image = fixtureInput(c);
    const expected = fixtureUncentredSpectrum(c);
    it(`${ny}×${nx}: forward equals fft2 to 1e-13, into another array and in place`, () => {
      const dft = new Dft2(nx, ny);
      const out = new Float64Array(2 * n);
      dft.forward(image, out);
      expect(relativeMaxError(out, expected)).toBeLessThanOrEqual(1e-13);
      const inPlace = image.slice();
      dft.forward(inPlace, inPlace);
      expect(relativeMaxError(inPlace, expected)).toBeLessThanOrEqual(1e-13);
    });
    it(`${ny}×${nx}: conj(DFT(conj(x·m))) with m = 2 is 2·fft2(x)[−v, −u]`, () => {
      // conj(Σ conj(x)e^(−iθ)) = Σ x e^(+iθ) = F(x)[−k]: both options checked against numpy at once.
      const dft = new Dft2(nx, ny);
      const out = new Float64Array(2 * n);
      dft.forward(image, out, { multiplyConj: new Float64Array(n).fill(2), conjugateOutput: true });
      const want = mirrored(expected, nx, ny).map((v) => 2 * v);
      expect(relativeMaxError(out, want)).toBeLessThanOrEqual(1e-13);
    });
  }
});
