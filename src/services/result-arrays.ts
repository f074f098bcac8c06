import type { ResultArray } from '../jobs/store.ts';
import type { ReconstructionOutcome } from '../pipeline/run-reconstruction.ts';
import { G_FACTOR_WHITE } from '../render/coil-montage.ts';
import { resultImageNames } from './result-images.ts';

/**
 * The images kept at full precision (float32) beside the PNGs, in the order `images.nii` stacks
 * them along its 4th dimension: reconstruction, zero-filled, reference, error-map, then g-factor
 * where one applies. Each keeps the white level of its 8-bit PNG (magnitudes: the reference's
 * maximum; the error map: its own maximum; g-factor: G_FACTOR_WHITE), so a 16-bit PNG uses the same scale.
 */
export function resultArrays(outcome: ReconstructionOutcome): Record<string, ResultArray> {
  const { images } = outcome;
  const white = maxOf(images.reference.data);
  // As the 8-bit renderer: an all-zero reference leaves each image on its own maximum.
  const array = (image: { nx: number; ny: number; data: Float64Array }, level: number): ResultArray => ({
    nx: image.nx,
    ny: image.ny,
    white: level || maxOf(image.data),
    data: Float32Array.from(image.data),
  });
  return {
    [resultImageNames.reconstruction]: array(images.reconstruction, white),
    [resultImageNames.zeroFilled]: array(images.zeroFilled, white),
    [resultImageNames.reference]: array(images.reference, white),
    [resultImageNames.errorMap]: array(images.errorMap, maxOf(images.errorMap.data)),
    ...(images.gFactor ? { [resultImageNames.gFactor]: array(images.gFactor, G_FACTOR_WHITE) } : {}),
  };
}

function maxOf(data: Float64Array): number {
  let max = 0;
  for (const v of data) if (v > max) max = v;
  return max;
}
