import type { z } from 'zod';
import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import type { CoilSamples } from '../encoding/encoding-operator.ts';
import type { CoilMaps, MultiCoilKspace } from '../encoding/multi-coil.ts';
import type { NufftPlan } from '../nufft/nufft-plan.ts';
import type { DensityWeighting } from '../nufft/trajectory-weights.ts';

/**
 * Multi-coil data of a receive array (any array but the uniform single coil), in the encoding
 * operator's coil-major layout (src/encoding/multi-coil.ts). Already prewhitened when the noise
 * covariance Ψ is known, so methods treat the coils' noise as white and independent.
 */
export interface CoilData {
  /** Acquired coil k-space, one centred plane per coil; zeros where not sampled. */
  kspace: MultiCoilKspace;
  /**
   * Sensitivities the simulation used (the truth, prewhitened like the data) or uploaded maps;
   * absent when none are known (raw data). Methods that estimate their own maps ignore them.
   */
  maps?: CoilMaps;
}

/**
 * The samples of a non-Cartesian acquisition at the exact trajectory points, with the NUFFT plan
 * that maps images to them and the density compensation weights (k-space area per sample).
 */
export interface TrajectoryData {
  trajectory: Trajectory;
  plan: NufftPlan;
  /** Coil-major interleaved samples, `plan.count` per coil (one coil for single-coil data). */
  samples: CoilSamples;
  weights: Float64Array;
  weighting: DensityWeighting;
}

/** Acquired k-space (zeros where not sampled) with its mask and, for variable-density patterns, the sampling density. */
export interface ReconInput {
  /**
   * Single coil: the acquired k-space. With `coils`: the k-space of the zero-filled coil combination
   * (sensitivity-weighted when maps are known, else root-sum-of-squares), for scales and display
   * only; a method reconstructs from `coils`.
   */
  kspace: ComplexImage;
  /** ny·nx, 1 = acquired; same row-major layout as `kspace`. */
  mask: Uint8Array;
  /** Per grid point sampling probability (0 < p ≤ 1 where sampled), for density compensation. */
  density?: Float64Array;
  /** Present for a receive array of more than the one uniform coil. */
  coils?: CoilData;
  /**
   * Present for a non-Cartesian acquisition: the data are these samples; `mask` is then only the
   * trajectory's picture (its nearest grid points) and `kspace` the gridded data, for scales.
   */
  trajectory?: TrajectoryData;
  /**
   * Noise σ per real channel of the data a method reconstructs (prewhitened coil data; trajectory
   * samples before density weighting), when known; absent or 0: noiseless or unknown. Methods
   * with an automatic λ use it (cs-tv: the discrepancy principle, tv-lambda.ts).
   */
  noiseSigma?: number;
}

export interface ReconOptions {
  signal?: AbortSignal;
  limits?: Limits;
}

export interface ReconOutput {
  image: ComplexImage;
  info: Record<string, unknown>;
}

/**
 * One reconstruction method: its request schema (zod, also the OpenAPI source) and the solver.
 * `run` validates its own parameters (ValidationError naming `method.*` and the allowed range,
 * LimitError beyond `limits`) because plans and workers call it without going through HTTP.
 * Adding a method = one file exporting a ReconMethod + one line in registry.ts.
 */
export interface ReconMethod<Spec extends { name: string } = { name: string }> {
  readonly name: Spec['name'];
  readonly schema: z.ZodType<Spec>;
  run(input: ReconInput, spec: Spec, options: { signal?: AbortSignal; limits: Limits }): ReconOutput;
}

/**
 * Refuses multi-coil data in a method that has no multi-coil form yet (a ValidationError naming
 * `coils`), so a coil array is never silently reduced to one coil.
 */
export function refuseCoilArray(input: ReconInput, method: string): void {
  if (input.coils) {
    throw new ValidationError({
      field: 'coils',
      message: `${method} does not reconstruct receive-array data yet`,
      allowed: 'coils: { array: "uniform" }',
    });
  }
}

/**
 * Refuses non-Cartesian samples in a method that needs a Cartesian grid: single-coil data name
 * `sampling.trajectory`; receive-array data name `method.name` (the trajectory and the array are
 * both fine, this method is not: it would have to grid the coils first, which the service does not
 * do behind a method's back; docs/design.md §2.1).
 */
export function refuseTrajectory(input: ReconInput, method: string): void {
  if (!input.trajectory) return;
  if (input.coils) {
    throw new ValidationError({
      field: 'method.name',
      message: `${method} works on Cartesian coil k-space; this receive-array acquisition is non-Cartesian`,
      allowed: "zero-filled, cs-tv or sense with a non-Cartesian trajectory (or trajectory: 'rasterised')",
    });
  }
  throw new ValidationError({
    field: 'sampling.trajectory',
    message: `${method} needs samples on the Cartesian grid; this acquisition is non-Cartesian`,
    allowed: "trajectory: 'rasterised', or a method that works on trajectories (zero-filled, cs-tv, sense)",
  });
}
