import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { gaussianKernel } from './gaussian-kernels.ts';
import { checkImagePair, checkMask } from './metric-inputs.ts';
import { scratch } from './scratch.ts';

/** Wang et al. 2004: 11×11 circular Gaussian window, σ = 1.5, weights summing to 1. */
export const SSIM_SIGMA = 1.5;
export const SSIM_RADIUS = 5;
export const SSIM_K1 = 0.01;
export const SSIM_K2 = 0.03;

export interface SsimOptions {
  /** Pixels to average the SSIM map over (non-zero = selected), row-major ny·nx. */
  mask?: Uint8Array;
  /** L in C1 = (K1·L)², C2 = (K2·L)²; default max − min of the reference. */
  dataRange?: number;
}

/** The 11 one-dimensional weights; the 2D window is their outer product (the Gaussian is separable). */
export function ssimWindow(): Float64Array {
  return gaussianKernel(SSIM_SIGMA, SSIM_RADIUS);
}

/**
 * Mean structural similarity (Wang et al. 2004) of magnitude images:
 *   SSIM(p) = (2μxμy + C1)(2σxy + C2) / ((μx² + μy² + C1)(σx² + σy² + C2))
 * with Gaussian-weighted local means, population (weighted) variances and covariance.
 * Boundary rule: only windows that lie wholly inside the image are scored — map pixels at least
 * 5 from every border, an (ny − 10)×(nx − 10) map — and the result is their plain mean (or the mean
 * over the masked ones among them). This is scikit-image's structural_similarity with
 * gaussian_weights=True, sigma=1.5, use_sample_covariance=False, data_range=L: it filters with
 * symmetric padding but then crops 5 pixels from each side before averaging, so the padding
 * never reaches a scored pixel. Needs nx, ny ≥ 11.
 */
export function ssim(estimate: RealImage, reference: RealImage, options: SsimOptions = {}): number {
  const n = checkImagePair(estimate, reference);
  const { mask } = options;
  if (mask) checkMask(mask, n);
  const { nx, ny } = reference;
  const width = 2 * SSIM_RADIUS + 1;
  if (nx < width || ny < width) {
    throw new ValidationError({
      field: 'reference',
      message: `is ${ny}×${nx}, smaller than the ${width}×${width} SSIM window`,
      allowed: `nx ≥ ${width} and ny ≥ ${width}`,
    });
  }
  const range = options.dataRange ?? dataRangeOf(reference.data);
  if (!Number.isFinite(range) || range <= 0) {
    throw new ValidationError(
      options.dataRange === undefined
        ? {
            field: 'reference',
            message: 'is constant, so its data range max − min is 0',
            allowed: 'a non-constant reference, or pass dataRange',
          }
        : { field: 'dataRange', message: `is ${range}`, allowed: 'a finite number > 0' },
    );
  }
  const c1 = (SSIM_K1 * range) ** 2;
  const c2 = (SSIM_K2 * range) ** 2;
  const w = ssimWindow();
  const vx = nx - 2 * SSIM_RADIUS;
  const vy = ny - 2 * SSIM_RADIUS;
  const a = estimate.data;
  const b = reference.data;

  // Row sums (valid columns only) of the last 11 rows live in a ring of 11 slots per quantity, so the
  // working memory is 5·11·(nx − 10) numbers whatever ny is.
  const ring = width * vx;
  const hA = scratch('ssim-a', ring);
  const hB = scratch('ssim-b', ring);
  const hAA = scratch('ssim-aa', ring);
  const hBB = scratch('ssim-bb', ring);
  const hAB = scratch('ssim-ab', ring);
  const rowSums = (row: number): void => {
    const base = row * nx;
    const slot = (row % width) * vx;
    for (let j = 0; j < vx; j++) {
      let sa = 0;
      let sb = 0;
      let saa = 0;
      let sbb = 0;
      let sab = 0;
      for (let t = 0; t < width; t++) {
        const p = a[base + j + t];
        const q = b[base + j + t];
        const wt = w[t];
        sa += wt * p;
        sb += wt * q;
        saa += wt * p * p;
        sbb += wt * q * q;
        sab += wt * p * q;
      }
      hA[slot + j] = sa;
      hB[slot + j] = sb;
      hAA[slot + j] = saa;
      hBB[slot + j] = sbb;
      hAB[slot + j] = sab;
    }
  };

  // Column sums for one output row at a time, then the SSIM of each window.
  const mA = scratch('ssim-row-a', vx);
  const mB = scratch('ssim-row-b', vx);
  const mAA = scratch('ssim-row-aa', vx);
  const mBB = scratch('ssim-row-bb', vx);
  const mAB = scratch('ssim-row-ab', vx);
  let sum = 0;
  let count = 0;
  for (let row = 0; row < width - 1; row++) rowSums(row);
  for (let i = 0; i < vy; i++) {
    rowSums(i + width - 1);
    mA.fill(0);
    mB.fill(0);
    mAA.fill(0);
    mBB.fill(0);
    mAB.fill(0);
    for (let t = 0; t < width; t++) {
      const wt = w[t];
      const slot = ((i + t) % width) * vx;
      for (let j = 0; j < vx; j++) {
        mA[j] += wt * hA[slot + j];
        mB[j] += wt * hB[slot + j];
        mAA[j] += wt * hAA[slot + j];
        mBB[j] += wt * hBB[slot + j];
        mAB[j] += wt * hAB[slot + j];
      }
    }
    const maskRow = (i + SSIM_RADIUS) * nx + SSIM_RADIUS;
    for (let j = 0; j < vx; j++) {
      if (mask && mask[maskRow + j] === 0) continue;
      const ma = mA[j];
      const mb = mB[j];
      const varA = mAA[j] - ma * ma;
      const varB = mBB[j] - mb * mb;
      const cov = mAB[j] - ma * mb;
      sum += ((2 * ma * mb + c1) * (2 * cov + c2)) / ((ma * ma + mb * mb + c1) * (varA + varB + c2));
      count++;
    }
  }
  if (count === 0) {
    throw new ValidationError({
      field: 'mask',
      message: `selects no pixel at least ${SSIM_RADIUS} from the border, where SSIM windows fit`,
      allowed: `a mask with a non-zero entry in rows ${SSIM_RADIUS}…${ny - 1 - SSIM_RADIUS} and columns ${SSIM_RADIUS}…${nx - 1 - SSIM_RADIUS}`,
    });
  }
  return sum / count;
}

function dataRangeOf(values: Float64Array): number {
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < values.length; i++) {
    if (values[i] < lo) lo = values[i];
    if (values[i] > hi) hi = values[i];
  }
  return hi - lo;
}
