import type { RadialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import { PIPE_MENON_KERNEL, pipeMenonWeights } from './pipe-menon-weights.ts';
import { nufftPlanFor } from './plan-cache.ts';
import { radialRampWeights } from './radial-ramp-weights.ts';
import { TrajectoryCache } from './trajectory-cache.ts';

export type DensityWeighting = 'radial-ramp' | 'pipe-menon';

export interface TrajectoryWeights {
  weights: Float64Array;
  weighting: DensityWeighting;
}

/** Weights per trajectory object and image size (weakly held, like the NUFFT plans). */
const cache = new TrajectoryCache<TrajectoryWeights>();

/**
 * Density compensation of a trajectory, k-space area per sample in (cycles per FOV)²: the analytic
 * ramp with each spoke's angular share for radial spokes, and the iterative weights of Pipe &
 * Menon 1999 (their own W = 6, α = 2 plan) for any other trajectory. Cached per trajectory.
 */
export function densityWeightsFor(trajectory: Trajectory, nx: number, ny: number): TrajectoryWeights {
  return cache.get(trajectory, `${nx}×${ny}`, () =>
    trajectory.kind === 'radial'
      ? { weights: radialRampWeights(trajectory as RadialTrajectory), weighting: 'radial-ramp' }
      : {
          weights: pipeMenonWeights(nufftPlanFor(trajectory, nx, ny, PIPE_MENON_KERNEL)),
          weighting: 'pipe-menon',
        },
  );
}
