import type { CoilMaps, CoilSamples } from '../encoding/index.ts';
import { NonCartesianEncoding } from '../encoding/index.ts';
import { toeplitzFor } from '../nufft/index.ts';
import type { TrajectoryData } from './method.ts';

/**
 * The encoding operator of a non-Cartesian acquisition as the iterative methods use it: E = W^½·A·S
 * (NUFFT of the trajectory, optional maps) with the density-compensation weights W in the data term,
 * EᴴE through the Toeplitz kernel of the same weights (Fessler et al. 2005), and the data to be weighed
 * alike (√w ⊙ y_c, weighedSamples). The weights keep EᴴE = Σ conj(S)·AᴴWA·S close to Σ|S|² on the sampled disc, so
 * CG converges in few steps (the density-weighted data term of Pruessmann et al. 2001).
 */
export function weightedTrajectoryOperator(data: TrajectoryData, maps?: CoilMaps): NonCartesianEncoding {
  const { plan, trajectory, weights, weighting } = data;
  const kernel = toeplitzFor(trajectory, plan.nx, plan.ny, { name: weighting, values: weights });
  return new NonCartesianEncoding(plan, maps, kernel, weights);
}

/** √w ⊙ y_c for every coil: acquired samples as the weighted operator's data. */
export function weighedSamples(operator: NonCartesianEncoding, samples: CoilSamples): CoilSamples {
  const weighted = operator.createData();
  weighted.data.set(samples.data);
  const count = operator.shapes.samplesPerCoil;
  for (let c = 0; c < samples.coils; c++) {
    operator.weigh(weighted.data.subarray(2 * c * count, 2 * (c + 1) * count));
  }
  return weighted;
}
