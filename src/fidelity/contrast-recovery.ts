import { ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { type Lesion, lesionDiscPixels } from './lesion.ts';

/** Lesion response r = recon(with) − recon(without), complex (paired runs: same mask, noise, λ, iterations). */
export function lesionResponse(withLesions: ComplexImage, without: ComplexImage): ComplexImage {
  if (withLesions.nx !== without.nx || withLesions.ny !== without.ny) {
    throw new RangeError('paired reconstructions must have the same size');
  }
  const r = createComplexImage(without.nx, without.ny);
  for (let i = 0; i < r.data.length; i++) r.data[i] = withLesions.data[i] - without.data[i];
  return r;
}

/**
 * The lesion's own fully sampled noiseless response t = ifft2c(its grid k-space): what a perfect
 * reconstruction of the sampled grid returns for it (band-limited, so a small disc averages less
 * than its nominal contrast; normalising by t, not by the nominal contrast, makes full sampling 1).
 */
export function fullySampledResponse(lesionKspace: ComplexImage): ComplexImage {
  return ifft2c(lesionKspace);
}

/**
 * Contrast recovery of one lesion: Re⟨r, t⟩ / ⟨t, t⟩ over the lesion's disc (pixel centres within
 * diameter/2 of its centre). Full sampling gives exactly 1; zero-filled uniform R = 2 without ACS
 * gives 1/2 (the point-spread function ½(δ(0) + δ(N/2)) keeps half the signal in place).
 */
export function contrastRecovery(response: ComplexImage, template: ComplexImage, lesion: Lesion): number {
  const pixels = lesionDiscPixels(lesion, response.nx, response.ny);
  const r = response.data;
  const t = template.data;
  let cross = 0;
  let norm = 0;
  for (const p of pixels) {
    cross += r[2 * p] * t[2 * p] + r[2 * p + 1] * t[2 * p + 1];
    norm += t[2 * p] * t[2 * p] + t[2 * p + 1] * t[2 * p + 1];
  }
  return norm > 0 ? cross / norm : Number.NaN;
}
