import { z } from 'zod';
import type { ComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { SeededRandom } from '../core/random.ts';

/**
 * Noise request: `snr` is the image-domain SNR of the fully sampled image,
 *   SNR = mean |x| over the object / σ,
 * σ the per-real-channel standard deviation of complex Gaussian noise (Gudbjartsson & Patz 1995
 * convention, docs/references.md §7 definition (a)). The centred FFT is orthonormal (unitary), so white
 * k-space noise of per-channel σ gives image noise of the same per-channel σ: σ_kspace = σ_image.
 * 'none' (or no noise piece) = noiseless.
 */
export const SNR_MAX = 1e6;
/**
 * Below SNR 0.1 the noise σ is ten times the mean object signal: every metric measures the noise,
 * not the sampling. Far smaller values (1e-300) made σ overflow to infinity and every metric null.
 */
export const SNR_MIN = 0.1;
export const noiseSchema = z.strictObject({
  snr: z
    .union([z.number().min(SNR_MIN).max(SNR_MAX), z.literal('none')])
    .describe(
      `image SNR = mean |x| over the object / σ, ${SNR_MIN} ≤ snr ≤ ${SNR_MAX}, or 'none'. Below ${SNR_MIN} ` +
        'the noise is over ten times the signal and the metrics only measure noise (and σ overflows for ' +
        `tiny values); above ${SNR_MAX} the noise is below the rounding of the reference and the image is ` +
        "in effect noiseless: use 'none'.",
    ),
});
export type NoiseSpec = z.infer<typeof noiseSchema>;

/** The object: pixels whose |reference| exceeds this fraction of the maximum |reference|. */
export const OBJECT_THRESHOLD = 0.1;

export function objectMaskOf(reference: ComplexImage, threshold = OBJECT_THRESHOLD): Uint8Array {
  const n = reference.nx * reference.ny;
  const d = reference.data;
  let peak = 0;
  for (let i = 0; i < n; i++) peak = Math.max(peak, Math.hypot(d[2 * i], d[2 * i + 1]));
  const mask = new Uint8Array(n);
  const cut = threshold * peak;
  for (let i = 0; i < n; i++) if (Math.hypot(d[2 * i], d[2 * i + 1]) > cut) mask[i] = 1;
  return mask;
}

/** mean |x| over the object mask. */
export function meanObjectMagnitude(reference: ComplexImage, objectMask: Uint8Array): number {
  const d = reference.data;
  let sum = 0;
  let count = 0;
  for (let i = 0; i < objectMask.length; i++) {
    if (!objectMask[i]) continue;
    sum += Math.hypot(d[2 * i], d[2 * i + 1]);
    count++;
  }
  return count > 0 ? sum / count : 0;
}

/** The validated SNR, or null for noiseless. ValidationError 'noise.snr' otherwise. */
export function checkedSnr(noise: NoiseSpec | undefined): number | null {
  if (noise === undefined) return null;
  const snr = (noise as { snr?: unknown }).snr;
  if (snr === 'none') return null;
  if (typeof snr !== 'number' || !Number.isFinite(snr) || snr < SNR_MIN || snr > SNR_MAX) {
    throw new ValidationError({
      field: 'noise.snr',
      message: `must be a number in range or 'none', got ${JSON.stringify(snr)}`,
      allowed: `${SNR_MIN} ≤ snr ≤ ${SNR_MAX} | 'none'`,
    });
  }
  return snr;
}

/** σ per real channel for a requested SNR: σ = mean_object |x| / SNR (docs/references.md §7 (c)). */
export function sigmaForSnr(reference: ComplexImage, objectMask: Uint8Array, snr: number): number {
  return meanObjectMagnitude(reference, objectMask) / snr;
}

/**
 * Adds complex white Gaussian noise σ(a + ib), a, b ~ N(0, 1), to every sample, in row-major
 * order from SeededRandom(seed): the same seed gives the same noise at a k-space position
 * whatever the mask, so patterns compared at one seed see the same noise realisation.
 */
export function addComplexNoise(data: Float64Array, sigma: number, seed: number): void {
  const rng = new SeededRandom(seed);
  for (let i = 0; i < data.length; i++) data[i] += sigma * rng.normal();
}
