import { gaussianSigma, type Lesion } from './lesion.ts';

/** Default sub-samples per pixel side for lesion edges in uploaded images. */
export const LESION_SUPERSAMPLE = 8;

/**
 * Raster of a set of lesions for uploaded images (which have no analytic k-space): each pixel is
 * the average of ss×ss point samples on a regular sub-grid, so a disc edge gets partial-volume
 * values instead of a staircase; a Gaussian is averaged the same way. Units are pixels, centres on
 * pixel centres (row, col). Returns ny·nx real values to add to the image's real part (uploads are
 * magnitude images; a lesion in a complex image would need the local phase, which we do not model).
 */
export function rasterizeLesions(
  lesions: readonly Lesion[],
  nx: number,
  ny: number,
  supersample = LESION_SUPERSAMPLE,
): Float64Array {
  if (!Number.isInteger(supersample) || supersample < 1) {
    throw new RangeError(`supersample must be a positive integer, got ${supersample}`);
  }
  const out = new Float64Array(nx * ny);
  const ss = supersample;
  const weight = 1 / (ss * ss);
  for (const lesion of lesions) {
    const r = lesion.diameter / 2;
    const s = gaussianSigma(lesion.diameter);
    const twoS2 = 2 * s * s;
    // A Gaussian is cut at 6σ (relative value e^(−18) ≈ 1.5e-8); a disc at its radius.
    const reach = Math.ceil(lesion.shape === 'disc' ? r + 0.5 : 6 * s + 0.5);
    for (let row = Math.max(0, lesion.row - reach); row <= Math.min(ny - 1, lesion.row + reach); row++) {
      for (let col = Math.max(0, lesion.col - reach); col <= Math.min(nx - 1, lesion.col + reach); col++) {
        let sum = 0;
        for (let t = 0; t < ss; t++) {
          const dy = row - lesion.row + (t + 0.5) / ss - 0.5;
          for (let q = 0; q < ss; q++) {
            const dx = col - lesion.col + (q + 0.5) / ss - 0.5;
            const rho2 = dx * dx + dy * dy;
            sum += lesion.shape === 'disc' ? (rho2 <= r * r ? 1 : 0) : Math.exp(-rho2 / twoS2);
          }
        }
        out[row * nx + col] += lesion.amplitude * sum * weight;
      }
    }
  }
  return out;
}
