import { z } from 'zod';
import type { SampledMask } from '../../sampling/index.ts';
import { sigmaForSnr } from '../acquisition/noise.ts';
import { senseGFactorMap, summariseGFactor } from '../coils/index.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';
import type { CoilMaps, MultiCoilKspace } from '../encoding/index.ts';
import {
  gFactorFor,
  type GFactorResult as MethodGFactor,
  type MethodSpec,
  type ReconInput,
  type TrajectoryGFactorRequest,
  trajectoryGFactor,
  uniformCartesianAcceleration,
} from '../recon/index.ts';

/** How a g-factor was found: the closed form of SENSE on a uniform lattice, or noise replicas. */
export type GFactorMethod = 'analytic' | 'pseudo-replica';

/** The g-factor over the object as responses and plan cells carry it. */
export const gFactorSummarySchema = z.object({
  mean: z.number(),
  p95: z.number(),
  max: z.number(),
  method: z.enum(['analytic', 'pseudo-replica']).describe('analytic: SENSE on a uniform lattice'),
});

/** The g-factor of a reconstruction over the object, with its map (for g-factor.png). */
export interface GFactorResult {
  mean: number;
  p95: number;
  max: number;
  method: GFactorMethod;
  /** Noise replicas behind a pseudo-replica estimate; null for the analytic form. */
  replicas: number | null;
  /** g per pixel, row-major ny·nx (0 where not computed). */
  map: Float64Array;
  /** SNR retained against the fully sampled scan, 1/(g·√R) over the object: its mean and its minimum. */
  snrRetained: { mean: number; min: number };
}

/** What the g-factor of one reconstruction depends on. */
export interface GFactorInput {
  /** The method's name (the request's `method.name`). */
  method: string;
  sampled: SampledMask;
  /** The maps the reconstruction uses, prewhitened like its data (so Ψ = I here). */
  maps: CoilMaps;
  objectMask: Uint8Array;
  /**
   * What a pseudo-replica estimate re-runs: the reconstruction's input (prewhitened coil data and
   * maps), its method, the per-coil noise σ after prewhitening (white, independent) and the options.
   */
  replicas?: {
    input: ReconInput;
    method: MethodSpec;
    coilSigma: number;
    seed: number;
    options: { signal?: AbortSignal; limits: Limits };
    /** The fully sampled noiseless coil k-space, prewhitened (the replicas' reference scan). */
    full: MultiCoilKspace;
    /** The base run's info: its λ and iteration count are what the replicas reuse. */
    baseInfo: Record<string, unknown>;
    /** The reference image (its mean over the object sets σ for noiseless runs). */
    reference: ComplexImage;
    /** Replicas requested (`gFactor.replicas`); without it no pseudo-replica estimate is made. */
    count?: number;
  };
}

/** SNR whose noise the replicas of a noiseless run use (any level works for a linear method). */
export const NOISELESS_REPLICA_SNR = 40;

/**
 * The g-factor of a multi-coil reconstruction, where one applies. This is the one call site that
 * chooses how: the analytic SENSE g-factor (Pruessmann et al. 1999) when the method is `sense` and the
 * mask is a uniform Cartesian lattice (every R-th row, no extra calibration rows, R dividing ny and at
 * most the coil count). Any other method and mask: a pseudo-replica estimate (Robson et al. 2008,
 * gFactorFor) when the request asks for replicas — each costs a reconstruction — else none. The
 * replicas reuse the base run's λ and iteration count; a noiseless run uses the noise of SNR
 * NOISELESS_REPLICA_SNR.
 */
export function reconstructionGFactor(input: GFactorInput): GFactorResult | undefined {
  const R = uniformLatticeStep(input.sampled);
  if (input.method === 'sense' && R !== null && R <= input.maps.coils) {
    const map = senseGFactorMap(input.maps, R);
    return {
      ...summariseGFactor(map, input.objectMask),
      method: 'analytic',
      replicas: null,
      map,
      ...retained(map, input.objectMask, R),
    };
  }
  const replicas = input.replicas;
  if (!replicas?.count) return undefined;
  const sigma = replicaSigma(replicas.coilSigma, replicas.reference, input.objectMask);
  const result = gFactorFor({
    input: replicas.input,
    method: replicas.method,
    baseInfo: replicas.baseInfo,
    full: replicas.full,
    sigma,
    support: input.objectMask,
    replicas: replicas.count,
    seed: replicas.seed,
    limits: replicas.options.limits,
    signal: replicas.options.signal,
  });
  return summarised(result, input.objectMask, input.sampled.acceleration.actual);
}

/**
 * What the g-factor of a receive-array reconstruction on a trajectory depends on: the base run
 * (input, method, info) and seed as trajectoryGFactor takes them, and what its σ, R and support
 * are found from.
 */
export interface TrajectoryGFactorInput
  extends Pick<TrajectoryGFactorRequest, 'input' | 'method' | 'baseInfo' | 'seed'> {
  sampled: SampledMask;
  objectMask: Uint8Array;
  /** σ per coil after prewhitening; 0 for a noiseless run (then NOISELESS_REPLICA_SNR's). */
  coilSigma: number;
  reference: ComplexImage;
  options: { signal?: AbortSignal; limits: Limits };
  /** Replicas requested (`gFactor.replicas`); without it no estimate is made. */
  count?: number;
}

/**
 * The g-factor of a receive-array reconstruction on a non-Cartesian trajectory: no closed form
 * applies, so only a pseudo-replica estimate (trajectoryGFactor) when the request asks for
 * replicas, against the fully sampled Cartesian scan and R = the trajectory's acceleration.
 */
export function trajectoryReconstructionGFactor(request: TrajectoryGFactorInput): GFactorResult | undefined {
  if (!request.count) return undefined;
  const R = request.sampled.acceleration.actual;
  const sigma = replicaSigma(request.coilSigma, request.reference, request.objectMask);
  const result = trajectoryGFactor({
    input: request.input,
    method: request.method,
    baseInfo: request.baseInfo,
    sigma,
    acceleration: R,
    support: request.objectMask,
    replicas: request.count,
    seed: request.seed,
    limits: request.options.limits,
    signal: request.options.signal,
  });
  return summarised(result, request.objectMask, R);
}

/** R when the mask acquires exactly the rows ⌊ny/2⌋ + k·R (every column), R an integer dividing ny; else null. */
export function uniformLatticeStep(sampled: SampledMask): number | null {
  const { nx, ny, mask } = sampled;
  // Every R-th whole row (uniformCartesianAcceleration), and those rows pass through the centre.
  const R = uniformCartesianAcceleration(mask, nx, ny);
  if (R === null) return null;
  const centre = Math.floor(ny / 2);
  for (let i = 0; i < ny; i++) {
    if (mask[i * nx] && (((i - centre) % R) + R) % R !== 0) return null;
  }
  return R;
}

/** The replicas' noise: the run's own σ per coil, or that of NOISELESS_REPLICA_SNR for a noiseless run. */
function replicaSigma(coilSigma: number, reference: ComplexImage, objectMask: Uint8Array): number {
  return coilSigma > 0 ? coilSigma : sigmaForSnr(reference, objectMask, NOISELESS_REPLICA_SNR);
}

/** A recon-side g result as the pipeline reports it, with the SNR retained at acceleration R. */
function summarised(result: MethodGFactor, objectMask: Uint8Array, R: number): GFactorResult {
  const { mean, p95, max, map } = result;
  return {
    mean,
    p95,
    max,
    method: result.method,
    replicas: result.method === 'analytic' ? null : result.replicas,
    map,
    ...retained(map, objectMask, R),
  };
}

function retained(
  g: Float64Array,
  objectMask: Uint8Array,
  R: number,
): { snrRetained: { mean: number; min: number } } {
  let sum = 0;
  let count = 0;
  let min = Number.POSITIVE_INFINITY;
  const root = Math.sqrt(R);
  for (let i = 0; i < g.length; i++) {
    if (!objectMask[i] || !(g[i] > 0)) continue;
    const value = 1 / (g[i] * root);
    sum += value;
    count++;
    if (value < min) min = value;
  }
  return { snrRetained: { mean: count > 0 ? sum / count : 0, min: count > 0 ? min : 0 } };
}
