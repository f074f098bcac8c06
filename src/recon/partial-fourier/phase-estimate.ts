import { ifft2c } from '../../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../core/complex-image.ts';

/**
 * Half-width h of the symmetric band of a partial-Fourier acquisition: rows ⌊ny/2⌋ − h … ⌊ny/2⌋ + h
 * are all inside the kept rows [firstRow, ny), so h = ⌊ny/2⌋ − firstRow (0 at p = ½ on an even side).
 */
export function symmetricHalfWidth(ny: number, firstRow: number): number {
  return Math.max(0, Math.min(Math.floor(ny / 2) - firstRow, ny - 1 - Math.floor(ny / 2)));
}

/**
 * The low-resolution phase estimate both homodyne and POCS rely on (Noll, Nishimura & Macovski
 * 1991; Haacke, Lindskog & Lin 1991; docs/references.md §5.6): the image of the symmetric band
 * alone, weighted along ky by a Hann window w = ½(1 + cos(π·ky/(h + 1))) so the cut does not ring.
 * Returns e^{iφ} per pixel as a unit complex image (1 where the low-resolution image is 0).
 */
export function lowResolutionPhase(kspace: ComplexImage, firstRow: number): ComplexImage {
  const { nx, ny, data } = kspace;
  const centre = Math.floor(ny / 2);
  const h = symmetricHalfWidth(ny, firstRow);
  const band = createComplexImage(nx, ny);
  for (let v = centre - h; v <= centre + h; v++) {
    const w = 0.5 * (1 + Math.cos((Math.PI * (v - centre)) / (h + 1)));
    for (let i = 2 * v * nx; i < 2 * (v + 1) * nx; i++) band.data[i] = w * data[i];
  }
  ifft2c(band, band);
  const phase = band.data;
  for (let i = 0; i < nx * ny; i++) {
    const re = phase[2 * i];
    const im = phase[2 * i + 1];
    const r = Math.hypot(re, im);
    phase[2 * i] = r > 0 ? re / r : 1;
    phase[2 * i + 1] = r > 0 ? im / r : 0;
  }
  return band;
}
