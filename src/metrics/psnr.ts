import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { checkImagePair, checkMask } from './metric-inputs.ts';

/**
 * Peak signal-to-noise ratio in dB: 10·log10(peak² / MSE), peak = max |x| over the whole reference
 * (docs/design.md §3.6), MSE the mean of (x̂ − x)² over all pixels or over the masked ones. The peak stays the
 * whole reference's so a region mask changes which errors count, not the scale they are judged on.
 * Identical images give +Infinity (MSE = 0).
 */
export function psnr(estimate: RealImage, reference: RealImage, mask?: Uint8Array): number {
  const n = checkImagePair(estimate, reference);
  const count = mask ? checkMask(mask, n) : n;
  const e = estimate.data;
  const x = reference.data;
  let peak = 0;
  let squared = 0;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(x[i]);
    if (a > peak) peak = a;
    if (mask && mask[i] === 0) continue;
    const d = e[i] - x[i];
    squared += d * d;
  }
  if (peak === 0) {
    throw new ValidationError({
      field: 'reference',
      message: 'is zero everywhere, so it has no peak',
      allowed: 'a reference with max |x| > 0',
    });
  }
  const mse = squared / count;
  return 10 * Math.log10((peak * peak) / mse);
}
