import { ifft2c } from '../../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../core/complex-image.ts';
import { lowResolutionPhase, symmetricHalfWidth } from './phase-estimate.ts';

/**
 * Homodyne partial-Fourier reconstruction (Noll, Nishimura & Macovski 1991; docs/references.md
 * §5.4). The kept rows are [firstRow, ny): ky ≥ −h with h the symmetric half-width. A weight H
 * with H(k) + H(−k) = 2 doubles the unpaired rows (ky > h: 2, ky < −h: 0) and ramps across the
 * symmetric band, H = 1 + ky/(h + 1); then x = Re{ F⁻¹(H·y) · e^{−iφ} } with φ the low-resolution
 * phase, returned as x·e^{iφ} (real part along the estimated phase, so |result| = |x|).
 * Rows before `firstRow` are ignored (taken as zero).
 */
export function homodyneReconstruction(kspace: ComplexImage, firstRow: number): ComplexImage {
  const { nx, ny, data } = kspace;
  const centre = Math.floor(ny / 2);
  const h = symmetricHalfWidth(ny, firstRow);
  const weighted = createComplexImage(nx, ny);
  for (let v = firstRow; v < ny; v++) {
    const ky = v - centre;
    const w = ky > h ? 2 : ky < -h ? 0 : 1 + ky / (h + 1);
    for (let i = 2 * v * nx; i < 2 * (v + 1) * nx; i++) weighted.data[i] = w * data[i];
  }
  ifft2c(weighted, weighted);
  const phase = lowResolutionPhase(kspace, firstRow);
  const out = weighted.data;
  const p = phase.data;
  for (let i = 0; i < nx * ny; i++) {
    // Re{x·e^{−iφ}} = re·cos φ + im·sin φ.
    const real = out[2 * i] * p[2 * i] + out[2 * i + 1] * p[2 * i + 1];
    out[2 * i] = real * p[2 * i];
    out[2 * i + 1] = real * p[2 * i + 1];
  }
  return weighted;
}
