import { readFileSync } from 'node:fs';
import { dcFirstSpectrum } from '../../src/core/plain-fft-2d.ts';

/**
 * tests/reference/fixtures/fft-numpy.json (Debian python3-numpy, written by
 * tests/reference/generate_fixtures.py): seeded random complex arrays (integers times inputScale,
 * exact in float64), interleaved re/im, with
 *   forward = fftshift(fft2(ifftshift(x), norm='ortho')),  inverse = fftshift(ifft2(ifftshift(x), norm='ortho')).
 */
export interface FftCase {
  ny: number;
  nx: number;
  input: number[];
  forward: number[];
  inverse: number[];
}

export const fftFixture: { inputScale: number; cases: FftCase[] } = JSON.parse(
  readFileSync(new URL('../reference/fixtures/fft-numpy.json', import.meta.url), 'utf8'),
);

/** The case's input array, scaled as numpy saw it. */
export function fixtureInput(c: FftCase): Float64Array {
  return Float64Array.from(c.input, (v) => v * fftFixture.inputScale);
}

/** numpy's un-centred, unnormalised fft2(x), DC first: the shift theorem applied to `forward`. */
export function fixtureUncentredSpectrum(c: FftCase): Float64Array {
  return dcFirstSpectrum(Float64Array.from(c.forward), c.nx, c.ny, Math.sqrt(c.nx * c.ny));
}
