import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import { checkNufftOptions, type NufftOptions } from './nufft-options.ts';
import { createNufftPlan, type NufftPlan } from './nufft-plan.ts';
import { type ToeplitzOperator, toeplitzNormalOperator } from './toeplitz.ts';
import { TrajectoryCache } from './trajectory-cache.ts';

/** Plans per trajectory object (weakly held, so a dropped trajectory frees its plans) and size. */
const cache = new TrajectoryCache<NufftPlan>();

/** The cached plan for this trajectory, image size and kernel; made on first use. */
export function nufftPlanFor(
  trajectory: Trajectory,
  nx: number,
  ny: number,
  options: NufftOptions = {},
): NufftPlan {
  const { width, oversampling } = checkNufftOptions(options);
  const key = `${nx}×${ny}|W${width}|α${oversampling}`;
  return cache.get(trajectory, key, () =>
    createNufftPlan(nx, ny, trajectory.kx, trajectory.ky, { width, oversampling }),
  );
}

const kernels = new TrajectoryCache<ToeplitzOperator>();

/**
 * The Toeplitz kernel of AᴴWA for this trajectory, image size and named sample weights (`name`
 * keys the cache: the same name must always mean the same weights), cached like the plans: one
 * adjoint NUFFT on the doubled grid to make, two doubled-grid FFTs to apply.
 */
export function toeplitzFor(
  trajectory: Trajectory,
  nx: number,
  ny: number,
  weights: { name: string; values: Float64Array },
): ToeplitzOperator {
  return kernels.get(trajectory, `${nx}×${ny}|${weights.name}`, () =>
    toeplitzNormalOperator(nx, ny, trajectory.kx, trajectory.ky, weights.values),
  );
}
