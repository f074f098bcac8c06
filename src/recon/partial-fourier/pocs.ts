import { fft2c, ifft2c } from '../../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../core/complex-image.ts';
import { throwIfAborted } from '../../core/errors.ts';
import { lowResolutionPhase } from './phase-estimate.ts';

/** POCS iterations: the update falls below 1e-6 of the image within this many on the checked objects. */
export const POCS_ITERATIONS = 30;

/**
 * Projection onto convex sets for partial Fourier (Haacke, Lindskog & Lin 1991; docs/references.md
 * §5.4). Starting from the zero-filled image, alternate (1) the phase constraint, the projection
 * onto the images whose phase is the low-resolution φ (mod π), a linear subspace:
 * x ← Re{x·e^{−iφ}}·e^{iφ} (a real value may be negative, as band-limited ringing is);
 * (2) data consistency: the k-space of
 * x with every `known` sample put back. The last iterate's image is returned. `known` (ny·nx, 1 = a
 * measured or already reconstructed value) marks what is kept; rows before `firstRow` are never known.
 */
export function pocsReconstruction(
  kspace: ComplexImage,
  known: Uint8Array,
  firstRow: number,
  options: { iterations?: number; signal?: AbortSignal } = {},
): ComplexImage {
  const { nx, ny, data } = kspace;
  const n = nx * ny;
  const phase = lowResolutionPhase(kspace, firstRow).data;
  const estimate = createComplexImage(nx, ny);
  const e = estimate.data;
  for (let i = 0; i < n; i++) {
    if (!known[i] || i < firstRow * nx) continue;
    e[2 * i] = data[2 * i];
    e[2 * i + 1] = data[2 * i + 1];
  }
  ifft2c(estimate, estimate);
  const iterations = options.iterations ?? POCS_ITERATIONS;
  for (let it = 0; it < iterations; it++) {
    throwIfAborted(options.signal);
    for (let i = 0; i < n; i++) {
      const r = e[2 * i] * phase[2 * i] + e[2 * i + 1] * phase[2 * i + 1];
      e[2 * i] = r * phase[2 * i];
      e[2 * i + 1] = r * phase[2 * i + 1];
    }
    fft2c(estimate, estimate);
    for (let i = firstRow * nx; i < n; i++) {
      if (!known[i]) continue;
      e[2 * i] = data[2 * i];
      e[2 * i + 1] = data[2 * i + 1];
    }
    ifft2c(estimate, estimate);
  }
  return estimate;
}
