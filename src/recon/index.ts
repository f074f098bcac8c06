import { assertMatrixSize } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { defaultLimits } from '../core/limits.ts';
import type { ReconInput, ReconOptions, ReconOutput } from './method.ts';
import { type MethodSpec, reconMethods, runMethod } from './registry.ts';

export { ACS_MAP_METHOD, ACS_MAP_SUPPORT_THRESHOLD, estimateAcsMaps } from './acs-maps.ts';
export { type AcsBlock, findAcsBlock } from './acs-region.ts';
export {
  type CoilCombination,
  coilImages,
  combineCoilImages,
  zeroFilledCoilCombination,
} from './coil-combination.ts';
export { zeroFilledPeak } from './cs-tv.ts';
export {
  DEFAULT_G_REPLICAS,
  type GFactorRequest,
  type GFactorResult,
  gFactorFor,
  replicaReconstructor,
  uniformCartesianAcceleration,
} from './g-factor.ts';
export { type GrappaSpec, type PreparedGrappa, prepareGrappa } from './grappa.ts';
export type {
  CoilData,
  ReconInput,
  ReconMethod,
  ReconOptions,
  ReconOutput,
  TrajectoryData,
} from './method.ts';
export {
  PARTIAL_FOURIER_METHODS,
  type PartialFourierMethod,
  partialFourierStep,
} from './partial-fourier/partial-fourier-step.ts';
export {
  type PseudoReplicaOptions,
  type PseudoReplicaResult,
  pseudoReplicaGFactor,
  type ReplicaReconstruction,
} from './pseudo-replica.ts';
export { type MethodName, type MethodSpec, methodSchema, methodSchemaFor, reconMethods } from './registry.ts';
export { type PreparedSense, prepareSense, type SenseSpec } from './sense.ts';
export { type TrajectoryGFactorRequest, trajectoryGFactor } from './trajectory-g-factor.ts';
export { zeroFilledImage } from './zero-filled.ts';

/**
 * Reconstructs one image from acquired k-space: looks the method up by name, checks the input
 * shape and the limits, and runs it. Bad parameters → ValidationError naming `method.*`;
 * work beyond `limits` → LimitError; a fired `signal` → CancelledError between iterations.
 */
export function reconstruct(input: ReconInput, method: MethodSpec, options: ReconOptions = {}): ReconOutput {
  const limits = options.limits ?? defaultLimits;
  const name = (method as { name?: unknown } | undefined)?.name;
  if (typeof name !== 'string' || !reconMethods.has(name)) {
    throw new ValidationError({
      field: 'method.name',
      message: `unknown method ${JSON.stringify(name)}`,
      allowed: [...reconMethods.keys()].join(' | '),
    });
  }
  const { kspace, mask, density } = input;
  // The matrix was checked against the limits at the edge; a malformed one is a programming mistake.
  assertMatrixSize(kspace.nx, kspace.ny);
  const n = kspace.nx * kspace.ny;
  if (kspace.data.length !== 2 * n || mask.length !== n || (density !== undefined && density.length !== n)) {
    throw new ValidationError({
      field: 'sampling',
      message: `k-space, mask and density must all cover the ${kspace.ny}×${kspace.nx} matrix`,
      allowed: `mask length ${n}, k-space length ${2 * n}`,
    });
  }
  return runMethod(input, method, { signal: options.signal, limits });
}
