import { ValidationError } from '../core/errors.ts';
import type { CoilSamples } from '../encoding/encoding-operator.ts';
import { CartesianEncoding, type EncodingOperator, NonCartesianEncoding } from '../encoding/index.ts';
import { toeplitzFor } from '../nufft/plan-cache.ts';
import type { ReconInput } from './method.ts';

/** The encoding operator E and data y a regularised least-squares method solves on. */
export interface EncodingProblem {
  operator: EncodingOperator<CoilSamples>;
  data: CoilSamples;
  /** E in words, for `info.solver`. */
  operatorName: string;
  /** What the response's `info` adds about the data (coils and maps, or the density weighting). */
  info: Record<string, unknown>;
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
    const { plan, trajectory, weights, weighting, samples } = input.trajectory;
    const kernel = toeplitzFor(trajectory, plan.nx, plan.ny, { name: weighting, values: weights });
    const operator = new NonCartesianEncoding(plan, undefined, kernel, weights);
    const weighted = operator.createData();
    weighted.data.set(samples.data);
    operator.weigh(weighted.data);
    return {
      operator,
      data: weighted,
      operatorName: 'the trajectory (NUFFT, Toeplitz EᴴE)',
      info: { dataWeighting: weighting },
    };
  }
  if (!input.coils) return null;
  const { maps, kspace } = input.coils;
  if (!maps) {
    throw new ValidationError({
      field: 'method.name',
      message: `${method} on receive-array data needs coil sensitivity maps (known or uploaded); none are given for these data`,
      allowed: 'coil data with maps, or lowrank-hankel (needs no maps)',
    });
  }
  return {
    operator: new CartesianEncoding(kspace.nx, kspace.ny, input.mask, maps),
    data: kspace,
    operatorName: 'the multi-coil encoding operator',
    info: { coils: kspace.coils, maps: 'given' },
  };
}
