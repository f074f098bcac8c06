import { type CoilMaps, createMultiCoilArray, type MultiCoilArray } from '../encoding/index.ts';
import { griddingReconstruction } from '../nufft/gridding.ts';
import { combineCoilImages } from './coil-combination.ts';
import type { ReconOutput, TrajectoryData } from './method.ts';

/**
 * The zero-filled reconstruction of non-Cartesian samples: gridding, the adjoint NUFFT of the
 * density-compensated samples with deapodisation (Jackson et al. 1991; src/nufft/gridding.ts).
 * Receive-array data: each coil gridded alike, the coil images combined as on the grid
 * (combineCoilImages: sensitivity-weighted with `maps`, else root-sum-of-squares).
 */
export function griddingImage(data: TrajectoryData, maps?: CoilMaps): ReconOutput {
  const { plan, samples, weights, weighting } = data;
  const nufft = {
    width: plan.width,
    oversampling: plan.oversampling,
    expectedRelativeError: plan.expectedRelativeError,
  };
  if (samples.coils === 1 && !maps) {
    return {
      image: griddingReconstruction(plan, samples.data, weights),
      info: { gridding: true, densityCompensation: weighting, nufft },
    };
  }
  const { image, combination } = combineCoilImages(griddedCoilImages(data), maps);
  return {
    image,
    info: { gridding: true, densityCompensation: weighting, nufft, combination, coils: samples.coils },
  };
}

/** Every coil's gridded image, coil-major (the receive array's zero-filled coil images). */
export function griddedCoilImages(data: TrajectoryData): MultiCoilArray {
  const { plan, samples, weights } = data;
  const { nx, ny } = plan;
  const count = plan.count;
  const images = createMultiCoilArray(samples.coils, nx, ny);
  for (let c = 0; c < samples.coils; c++) {
    const block = samples.data.subarray(2 * c * count, 2 * (c + 1) * count);
    images.data.set(griddingReconstruction(plan, block, weights).data, 2 * c * nx * ny);
  }
  return images;
}
