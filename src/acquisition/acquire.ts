import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import type { FullAcquisition } from './full-acquisition.ts';
import { addComplexNoise, checkedSnr, type NoiseSpec, sigmaForSnr } from './noise.ts';

/**
 * y = M ⊙ (y_full + n): the simulated acquisition. n is complex Gaussian with per-channel
 * σ = mean_object |reference| / SNR (σ = 0 when noiseless), seeded by `seed`; unacquired samples are 0.
 */
export function acquire(
  full: FullAcquisition,
  mask: Uint8Array,
  noise: NoiseSpec | undefined,
  seed: number,
): { kspace: ComplexImage; sigma: number } {
  const { nx, ny } = full.kspace;
  const n = nx * ny;
  if (mask.length !== n) {
    throw new ValidationError({
      field: 'sampling',
      message: `mask has ${mask.length} entries for a ${ny}×${nx} matrix`,
      allowed: `length ${n}`,
    });
  }
  const snr = checkedSnr(noise);
  const sigma = snr === null ? 0 : sigmaForSnr(full.reference, full.objectMask, snr);
  const noisy = full.kspace.data.slice();
  if (sigma > 0) addComplexNoise(noisy, sigma, seed);
  const kspace = createComplexImage(nx, ny);
  for (let i = 0; i < n; i++) {
    if (!mask[i]) continue;
    kspace.data[2 * i] = noisy[2 * i];
    kspace.data[2 * i + 1] = noisy[2 * i + 1];
  }
  return { kspace, sigma };
}
