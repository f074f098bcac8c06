import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { laplacianOfGaussian } from './laplacian-of-gaussian.ts';
import { checkImagePair, checkMask } from './metric-inputs.ts';
import { scratch } from './scratch.ts';

/**
 * High-frequency error norm (Ravishankar & Bresler 2011), normalised:
 *   HFEN = ‖LoG ∗ x̂ − LoG ∗ x‖₂ / ‖LoG ∗ x‖₂
 * LoG: the 15×15 zero-sum Laplacian of Gaussian, σ = 1.5 px, 'reflect' boundary (see
 * laplacian-of-gaussian.ts). Zero-sum plus the symmetric extension make HFEN blind to a constant
 * offset everywhere, borders included. With a mask the norms run over the selected pixels; the
 * filter itself still sees the whole image. The filter is linear, so LoG ∗ (x̂ − x) is filtered once.
 */
export function hfen(estimate: RealImage, reference: RealImage, mask?: Uint8Array): number {
  return highFrequencyErrorNorm(estimate, reference, mask, true);
}

/**
 * The same ratio with the choice of kernel exposed: zeroSum false uses the sampled LoG as is
 * (scipy.ndimage.gaussian_laplace's kernel), kept so the fixtures can pin both filters.
 */
export function highFrequencyErrorNorm(
  estimate: RealImage,
  reference: RealImage,
  mask: Uint8Array | undefined,
  zeroSum: boolean,
): number {
  const n = checkImagePair(estimate, reference);
  if (mask) checkMask(mask, n);
  const { nx, ny } = reference;
  const difference = scratch('hfen-difference', n);
  const e = estimate.data;
  const x = reference.data;
  for (let i = 0; i < n; i++) difference[i] = e[i] - x[i];
  const filteredDifference = laplacianOfGaussian(
    scratch('hfen-filtered-difference', n),
    difference,
    nx,
    ny,
    zeroSum,
  );
  const filteredReference = laplacianOfGaussian(scratch('hfen-filtered-reference', n), x, nx, ny, zeroSum);
  let error = 0;
  let norm = 0;
  for (let i = 0; i < n; i++) {
    if (mask && mask[i] === 0) continue;
    error += filteredDifference[i] * filteredDifference[i];
    norm += filteredReference[i] * filteredReference[i];
  }
  if (norm === 0) {
    throw new ValidationError({
      field: 'reference',
      message: 'has no high-frequency content (LoG ∗ x is zero on the scored pixels)',
      allowed: 'a reference that is not constant over the scored pixels',
    });
  }
  return Math.sqrt(error / norm);
}
