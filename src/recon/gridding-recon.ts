import { ValidationError } from '../core/errors.ts';
import { griddingReconstruction } from '../nufft/gridding.ts';
import type { ReconOutput, TrajectoryData } from './method.ts';

/**
 * The zero-filled reconstruction of non-Cartesian samples: gridding, the adjoint NUFFT of the
 * density-compensated samples with deapodisation (Jackson et al. 1991; src/nufft/gridding.ts).
 */
export function griddingImage(data: TrajectoryData): ReconOutput {
  const { plan, samples, weights, weighting } = data;
  if (samples.coils !== 1) {
    throw new ValidationError({
      field: 'coils',
      message: 'non-Cartesian reconstructions of receive-array data are not available yet',
      allowed: 'coils: { array: "uniform" } with a non-Cartesian trajectory',
    });
  }
  return {
    image: griddingReconstruction(plan, samples.data, weights),
    info: {
      gridding: true,
      densityCompensation: weighting,
      nufft: {
        width: plan.width,
        oversampling: plan.oversampling,
        expectedRelativeError: plan.expectedRelativeError,
      },
    },
  };
}
