import { describe, expect, it } from 'vitest';
import { dcFirstOrder, dcFirstSpectrum, plainFft2d } from '../../src/core/plain-fft-2d.ts';
import { relativeMaxError } from '../error-measures.ts';
import { fftFixture, fixtureInput, fixtureUncentredSpectrum } from './fft-numpy-fixture.ts';

/**
 * The un-centred 2D DFT the cs-tv loop runs on, against numpy.fft (Debian python3-numpy):
 * tests/reference/fixtures/fft-numpy.json holds forward = fftshift(fft2(ifftshift(x), norm='ortho'))
 * (tests/reference/generate_fixtures.py). The shift theorem turns that into numpy's fft2(x) DC
 * first, which plainFft2d (√N·fft2, natural layout) must match; mirrored with 1/N it must invert it.
 */

// Tolerance as in tests/core/fft-numpy.test.ts: float64 FFTs agree to ~1e-15; a wrong shift,
// phase, mirror or scale is an O(1) error.
describe('plainFft2d: un-centred DFT against numpy.fft (fixture, odd and even sizes)', () => {
  for (const c of fftFixture.cases) {
    const { nx, ny } = c;
    const n = nx * ny;
    const image = fixtureInput(c);
    const expected = fixtureUncentredSpectrum(c);
    it(`${ny}×${nx}: forward equals √N·fft2 (DC first) to 1e-13`, () => {
      const out = new Float64Array(2 * n);
      plainFft2d(out, image, ny, nx, 1, false);
      expect(relativeMaxError(out, expected)).toBeLessThanOrEqual(1e-13);
    });
    it(`${ny}×${nx}: inverse with scale 1/N returns the image, source unchanged`, () => {
      const out = new Float64Array(2 * n);
      const source = expected.slice();
      plainFft2d(out, source, ny, nx, 1 / n, true);
      expect(relativeMaxError(out, image)).toBeLessThanOrEqual(1e-13);
      expect(source).toEqual(expected);
    });
  }

  it('dcFirstOrder is the same permutation dcFirstSpectrum applies (7×5)', () => {
    const nx = 5;
    const ny = 7;
    const mask = Uint8Array.from({ length: nx * ny }, (_, i) => (i * 7) % 3);
    const asSpectrum = new Float64Array(2 * nx * ny);
    for (let i = 0; i < mask.length; i++) asSpectrum[2 * i] = 1;
    const weighted = dcFirstSpectrum(asSpectrum, nx, ny, 1, mask);
    const order = dcFirstOrder(mask, nx, ny);
    // |weight · phase| = weight: the permuted mask, whatever the phase.
    const moduli = Array.from(order, (_, i) => Math.hypot(weighted[2 * i], weighted[2 * i + 1]));
    expect(moduli.map((m) => Math.round(m * 1e12) / 1e12)).toEqual(Array.from(order));
    // DC of the centred order (⌊ny/2⌋, ⌊nx/2⌋) lands first.
    expect(order[0]).toBe(mask[3 * nx + 2]);
  });

  it('refuses aliased buffers', () => {
    const a = new Float64Array(8);
    expect(() => plainFft2d(a, a, 2, 2, 1, false)).toThrow(RangeError);
  });
});
