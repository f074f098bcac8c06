import { ValidationError } from '../core/errors.ts';

/** Kernel width W (grid cells) and oversampling α of a NUFFT plan. */
export interface NufftOptions {
  width?: number;
  oversampling?: number;
}

export const NUFFT_DEFAULTS = Object.freeze({ width: 4, oversampling: 2 });
export const NUFFT_WIDTH_RANGE = Object.freeze({ min: 2, max: 8 });
export const NUFFT_OVERSAMPLING_RANGE = Object.freeze({ min: 1.25, max: 4 });

/** Fills defaults and checks the ranges (integer W in 2…8, α in 1.25…4), naming the field. */
export function checkNufftOptions(options: NufftOptions): Required<NufftOptions> {
  const width = options.width ?? NUFFT_DEFAULTS.width;
  const oversampling = options.oversampling ?? NUFFT_DEFAULTS.oversampling;
  const { min: wMin, max: wMax } = NUFFT_WIDTH_RANGE;
  const { min: aMin, max: aMax } = NUFFT_OVERSAMPLING_RANGE;
  if (!Number.isInteger(width) || width < wMin || width > wMax) {
    throw new ValidationError({
      field: 'nufft.width',
      message: `must be an integer kernel width in grid cells, got ${width}`,
      allowed: `integer, ${wMin} ≤ width ≤ ${wMax}`,
    });
  }
  if (!Number.isFinite(oversampling) || oversampling < aMin || oversampling > aMax) {
    throw new ValidationError({
      field: 'nufft.oversampling',
      message: `must be a grid oversampling ratio, got ${oversampling}`,
      allowed: `${aMin} ≤ oversampling ≤ ${aMax}`,
    });
  }
  return { width, oversampling };
}
