import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import { checkNufftOptions, type NufftOptions } from './nufft-options.ts';
import { createNufftPlan, type NufftPlan } from './nufft-plan.ts';
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
