import { ValidationError } from '../core/errors.ts';
import type { CoilSamples } from '../encoding/encoding-operator.ts';
import { CartesianEncoding, type CoilMaps, type EncodingOperator } from '../encoding/index.ts';
import type { CoilData, ReconInput } from './method.ts';
import { weighedSamples, weightedTrajectoryOperator } from './trajectory-operator.ts';

/** The encoding operator E and data y a regularised least-squares method solves on. */
export interface EncodingProblem {
  operator: EncodingOperator<CoilSamples>;
  data: CoilSamples;
  /** E in words, for `info.solver`. */
  operatorName: string;
  /** What the response's `info` adds about the data (coils and maps, or the density weighting). */
  info: Record<string, unknown>;
  /** Trajectories: a proven upper bound of ‖EᴴE‖ from the Toeplitz kernel (linearised solvers). */
  normalBound?: number;
}

/**
 * The operator of a non-single-coil-Cartesian input: a trajectory through the NUFFT (density-
 * weighted data term, W = the gridding weights, which keeps EᴴE = AᴴWA near the identity; EᴴE by
 * the Toeplitz kernel), or the multi-coil Cartesian operator with the known maps. `null` for single-
 * coil Cartesian data (the methods' own k-space solvers). Coil data without maps are refused on
 * `method.name`: there is nothing to build E from, and no map estimate is made here.
 */
export function encodingProblem(input: ReconInput, method: string): EncodingProblem | null {
  if (input.trajectory) {
    const maps = input.coils ? requiredMaps(input.coils, method) : undefined;
    const operator = weightedTrajectoryOperator(input.trajectory, maps);
    return {
      operator,
      data: weighedSamples(operator, input.trajectory.samples),
      operatorName: maps
        ? 'the multi-coil trajectory operator (NUFFT · maps, Toeplitz EᴴE)'
        : 'the trajectory (NUFFT, Toeplitz EᴴE)',
      info: {
        dataWeighting: input.trajectory.weighting,
        ...(maps ? { coils: input.trajectory.samples.coils, maps: 'given' } : {}),
      },
      normalBound: operator.normalBound(),
    };
  }
  if (!input.coils) return null;
  const { kspace } = input.coils;
  const maps = requiredMaps(input.coils, method);
  return {
    operator: new CartesianEncoding(kspace.nx, kspace.ny, input.mask, maps),
    data: kspace,
    operatorName: 'the multi-coil encoding operator',
    info: { coils: kspace.coils, maps: 'given' },
  };
}

/** The maps E is built from: without them the method is refused, no estimate being made here. */
function requiredMaps(coils: CoilData, method: string): CoilMaps {
  if (!coils.maps) {
    throw new ValidationError({
      field: 'method.name',
      message: `${method} on receive-array data needs coil sensitivity maps (known or uploaded); none are given for these data`,
      allowed: 'coil data with maps, or lowrank-hankel (needs no maps)',
    });
  }
  return coils.maps;
}
