import { z } from 'zod';
import type { ComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import {
  CartesianEncoding,
  type CoilMaps,
  type CoilSamples,
  type EncodingOperator,
  type MultiCoilKspace,
  peakSensitivityPower,
} from '../encoding/index.ts';
import { ACS_MAP_METHOD, estimateAcsMaps } from './acs-maps.ts';
import { type AcsBlock, requireAcsBlock } from './acs-region.ts';
import { conjugateGradient } from './conjugate-gradient.ts';
import type { ReconInput, ReconMethod, ReconOutput } from './method.ts';
import {
  checkedChoice,
  checkedNumber,
  checkedTolerance,
  iterationsToRun,
  type NumberRule,
} from './parameters.ts';
import { iterationLimitField, rangeField, toleranceField } from './schema-fields.ts';
import { prepareTrajectorySense, TRAJECTORY_ACS_SIDE } from './sense-trajectory.ts';

export const SENSE_DEFAULT_ITERATIONS = 50;
export const SENSE_DEFAULT_TOLERANCE = 1e-6;
export const SENSE_TIKHONOV_RULE: NumberRule = { min: 0, max: 1 };
/** The smallest ACS block the map estimate accepts: a few lines give a map, fewer give noise. */
export const SENSE_MIN_ACS_ROWS = 4;

export const senseSchema = z.strictObject({
  name: z.literal('sense'),
  maps: z
    .enum(['true', 'acs'])
    .optional()
    .describe(
      "coil sensitivities: 'true' = the maps the simulation used or uploaded maps (optimistic), 'acs' = estimated from the fully sampled centred block (Hann-windowed low-resolution coil images over their root-sum-of-squares); default 'true' when maps are known, else 'acs'",
    ),
  iterations: iterationLimitField(`conjugate-gradient iteration limit (default ${SENSE_DEFAULT_ITERATIONS})`),
  tikhonov: rangeField(
    SENSE_TIKHONOV_RULE,
    'Tikhonov weight λ of (EᴴE + λ·I)x = Eᴴy, relative to max over pixels of Σ_c |S_c|² (default 0)',
  ),
  tolerance: toleranceField(
    `stop when ‖Eᴴy − (EᴴE + λI)x‖ / ‖Eᴴy‖ ≤ tolerance (default ${SENSE_DEFAULT_TOLERANCE})`,
  ),
});
export type SenseSpec = z.infer<typeof senseSchema>;

/** The coil data a method reconstructs from: a receive array's, or the single coil as one plane. */
export function coilKspaceOf(input: ReconInput): MultiCoilKspace {
  if (input.coils) return input.coils.kspace;
  const { nx, ny, data } = input.kspace;
  return { coils: 1, nx, ny, data };
}

/** A SENSE reconstruction with its maps, λ and stopping rule fixed: reusable on other data (noise replicas). */
export interface PreparedSense {
  /** The sensitivities used; undefined for the single coil with S = 1. */
  maps: CoilMaps | undefined;
  mapsUsed: 'true' | 'acs' | 'uniform';
  iterationLimit: number;
  tolerance: number;
  tikhonov: number;
  tikhonovAbsolute: number;
  solve(
    kspace: MultiCoilKspace,
    mask: Uint8Array,
    overrides?: { iterations?: number; tolerance?: number; signal?: AbortSignal },
  ): { image: ComplexImage; iterations: number; residual: number; converged: boolean };
}

/**
 * Resolves the maps, λ and stopping rule of a SENSE spec on this input. Maps: 'true' uses
 * `coils.maps` (a ValidationError naming `method.maps` when none are known); 'acs' estimates them
 * from the ACS block (acs-maps.ts; `sampling.acs` is refused when the mask has fewer than
 * SENSE_MIN_ACS_ROWS fully sampled centred rows). Single-coil input is SENSE with S = 1 (allowed:
 * the normal equations are then MᴴM x = Fᴴy, solved in one step, i.e. the zero-filled image).
 */
export function prepareSense(input: ReconInput, spec: SenseSpec, limits: Limits): PreparedSense {
  const kspace = coilKspaceOf(input);
  const { nx, ny } = kspace;
  const { maps, mapsUsed } = senseMaps(input, spec, () =>
    requireAcsBlock(input.mask, nx, ny, SENSE_MIN_ACS_ROWS, SENSE_MIN_ACS_ROWS, 'SENSE with maps "acs"'),
  );
  const { iterationLimit, tolerance, tikhonov, tikhonovAbsolute } = senseSettings(spec, maps, limits);
  return {
    maps,
    mapsUsed,
    iterationLimit,
    tolerance,
    tikhonov,
    tikhonovAbsolute,
    solve(data, mask, overrides = {}) {
      const encoding = new CartesianEncoding(nx, ny, mask, maps);
      return solveSenseNormalEquations(encoding, data, tikhonovAbsolute, {
        iterations: overrides.iterations ?? iterationLimit,
        tolerance: overrides.tolerance ?? tolerance,
        signal: overrides.signal,
      });
    },
  };
}

/** CG on (EᴴE + λI)x = Eᴴy from x⁰ = 0, for any encoding operator (Cartesian or trajectory). */
export function solveSenseNormalEquations(
  encoding: EncodingOperator<CoilSamples>,
  data: CoilSamples,
  tikhonovAbsolute: number,
  options: { iterations: number; tolerance: number; signal?: AbortSignal },
): { image: ComplexImage; iterations: number; residual: number; converged: boolean } {
  const b = encoding.adjoint(data);
  const x = encoding.createImage();
  const v = encoding.createImage();
  const out = encoding.createImage();
  const apply = (p: Float64Array, target: Float64Array): void => {
    v.data.set(p);
    encoding.normal(v, out);
    for (let i = 0; i < target.length; i++) target[i] = out.data[i] + tikhonovAbsolute * p[i];
  };
  const result = conjugateGradient(apply, b.data, x.data, options);
  return { image: x, ...result };
}

/**
 * The maps of a SENSE spec on this input: 'true' uses `coils.maps` (a ValidationError naming
 * `method.maps` when none are known); 'acs' estimates them (acs-maps.ts) from the block `acsBlock`
 * gives, from `coils.kspace` (on a trajectory: the gridded coil k-space). Single coil: S = 1.
 */
export function senseMaps(
  input: ReconInput,
  spec: SenseSpec,
  acsBlock: () => AcsBlock,
): { maps: CoilMaps | undefined; mapsUsed: PreparedSense['mapsUsed'] } {
  const known = input.coils ? input.coils.maps : undefined;
  const singleCoil = !input.coils;
  const requested = checkedChoice(
    spec.maps,
    'method.maps',
    ['true', 'acs'] as const,
    known || singleCoil ? 'true' : 'acs',
  );
  if (requested === 'acs') return { maps: estimateAcsMaps(coilKspaceOf(input), acsBlock()), mapsUsed: 'acs' };
  if (singleCoil) return { maps: undefined, mapsUsed: 'uniform' };
  if (known) return { maps: known, mapsUsed: 'true' };
  throw new ValidationError({
    field: 'method.maps',
    message: 'no coil maps are known for these data (raw data without maps), so "true" maps cannot be used',
    allowed: '"acs" (estimate the maps from the calibration lines)',
  });
}

/** Iteration limit, tolerance and Tikhonov weight (relative and absolute) of a SENSE spec. */
export function senseSettings(spec: SenseSpec, maps: CoilMaps | undefined, limits: Limits) {
  const iterationLimit = iterationsToRun(spec.iterations, SENSE_DEFAULT_ITERATIONS, limits);
  const tolerance = checkedTolerance(spec.tolerance, SENSE_DEFAULT_TOLERANCE);
  const tikhonov = checkedNumber(spec.tikhonov, 'method.tikhonov', SENSE_TIKHONOV_RULE, 0);
  const tikhonovAbsolute = tikhonov * (maps ? peakSensitivityPower(maps) : 1);
  return { iterationLimit, tolerance, tikhonov, tikhonovAbsolute };
}

/**
 * Iterative SENSE (Pruessmann, Weiger, Börnert & Boesiger 2001): conjugate gradients on the normal
 * equations (EᴴE + λI) x = Eᴴy with the Cartesian encoding E x = { M ⊙ F(S_c·x) }_c, from x⁰ = 0.
 * λ = tikhonov · max Σ_c|S_c|² (0 by default; then the iteration limit is the only regularisation).
 * On coil data the maps are the truth (optimistic: real maps are estimated) or estimated from the ACS.
 */
export const sense: ReconMethod<SenseSpec> = {
  name: 'sense',
  schema: senseSchema,
  run(input, spec, { signal, limits }): ReconOutput {
    if (input.trajectory) {
      const prepared = prepareTrajectorySense(input, input.trajectory, spec, limits);
      const result = prepared.solve(input.trajectory.samples, { signal });
      return { image: result.image, info: senseInfo(input, prepared, result, true) };
    }
    const prepared = prepareSense(input, spec, limits);
    const result = prepared.solve(coilKspaceOf(input), input.mask, { signal });
    return { image: result.image, info: senseInfo(input, prepared, result, false) };
  },
};

/** What a SENSE run reports: solver, maps, λ, iterations and convergence. */
function senseInfo(
  input: ReconInput,
  prepared: Omit<PreparedSense, 'solve'>,
  result: { iterations: number; residual: number; converged: boolean },
  trajectory: boolean,
): Record<string, unknown> {
  return {
    ...(trajectory
      ? {
          solver:
            'conjugate gradient on (EᴴWE + λI)x = EᴴWy, x⁰ = 0; E = NUFFT · maps, W the density compensation (Toeplitz EᴴWE)',
          dataWeighting: input.trajectory?.weighting,
        }
      : { solver: 'conjugate gradient on (EᴴE + λI)x = Eᴴy, x⁰ = 0' }),
    maps: prepared.mapsUsed,
    ...(prepared.mapsUsed === 'true'
      ? {
          mapsNote:
            'optimistic: the sensitivities the simulation used (or uploaded), not estimated from the data',
        }
      : {}),
    ...(prepared.mapsUsed === 'acs'
      ? {
          mapsCalibration: ACS_MAP_METHOD,
          ...(trajectory
            ? {
                mapsCalibrationRegion: `central ${TRAJECTORY_ACS_SIDE}×${TRAJECTORY_ACS_SIDE} of the gridded coil k-space`,
              }
            : {}),
        }
      : {}),
    ...(prepared.mapsUsed === 'uniform'
      ? {
          mapsNote: trajectory
            ? 'single coil, S = 1: the density-weighted least-squares image'
            : 'single coil, S = 1: the zero-filled image up to the tolerance',
        }
      : {}),
    coils: input.coils ? input.coils.kspace.coils : 1,
    tikhonov: prepared.tikhonov,
    tikhonovAbsolute: prepared.tikhonovAbsolute,
    iterations: result.iterations,
    iterationLimit: prepared.iterationLimit,
    tolerance: prepared.tolerance,
    residual: result.residual,
    converged: result.converged,
  };
}
