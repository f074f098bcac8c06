import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { checkImagePair, checkMask } from './metric-inputs.ts';

/**
 * Normalised root-mean-square error ‖x̂ − x‖₂ / ‖x‖₂ (docs/design.md §3.6; the Euclidean normalisation, not
 * max−min or mean). With a mask both norms run over the selected pixels only.
 */
export function nrmse(estimate: RealImage, reference: RealImage, mask?: Uint8Array): number {
  const n = checkImagePair(estimate, reference);
  if (mask) checkMask(mask, n);
  const e = estimate.data;
  const x = reference.data;
  let error = 0;
  let norm = 0;
  for (let i = 0; i < n; i++) {
    if (mask && mask[i] === 0) continue;
    const d = e[i] - x[i];
    error += d * d;
    norm += x[i] * x[i];
  }
  if (norm === 0) {
    throw new ValidationError({
      field: 'reference',
      message: mask ? 'is zero on every masked pixel' : 'is zero everywhere',
      allowed: 'a reference with ‖x‖₂ > 0 over the scored pixels',
    });
  }
  return Math.sqrt(error / norm);
}
