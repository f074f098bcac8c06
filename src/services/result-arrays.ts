import type { RealVolume } from '../core/real-volume.ts';
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
  if (outcome.volume) return volumeArrays(outcome);
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

/**
 * A volume result (docs/design.md §2.5) keeps whole volumes, x fastest: reconstruction, zero-filled,
 * reference and the error map |reconstruction − reference| over every voxel, as the 2D error map is
 * defined. White levels stay those of the PNGs, which show the central z-slice, so a 16-bit PNG of
 * that slice uses the 8-bit grey scale.
 */
function volumeArrays(outcome: ReconstructionOutcome): Record<string, ResultArray> {
  const { images } = outcome;
  const { reconstruction, zeroFilled, reference } = (outcome.volume as NonNullable<typeof outcome.volume>)
    .volumes;
  const white = maxOf(images.reference.data);
  const errors = new Float32Array(reconstruction.data.length);
  for (let i = 0; i < errors.length; i++) errors[i] = Math.abs(reconstruction.data[i] - reference.data[i]);
  const array = (volume: RealVolume, level: number, data = Float32Array.from(volume.data)) => ({
    nx: volume.nx,
    ny: volume.ny,
    nz: volume.nz,
    white: level,
    data,
  });
  return {
    [resultImageNames.reconstruction]: array(reconstruction, white || maxOf(images.reconstruction.data)),
    [resultImageNames.zeroFilled]: array(zeroFilled, white || maxOf(images.zeroFilled.data)),
    [resultImageNames.reference]: array(reference, white),
    [resultImageNames.errorMap]: array(reference, maxOf(images.errorMap.data), errors),
  };
}

function maxOf(data: Float64Array): number {
  let max = 0;
  for (const v of data) if (v > max) max = v;
  return max;
}
