import { LimitError, ValidationError } from '../src/core/errors.ts';
import type { Matrix } from '../src/core/matrix.ts';
import { rasteriseTrajectory } from './rasterise-trajectory.ts';
import { countSampled, type SampledMask } from './sampled-mask.ts';
import type { RadialSpec, SpiralSpec } from './schema.ts';
import { radialTrajectory } from './trajectories/radial-trajectory.ts';
import { spiralTrajectory } from './trajectories/spiral-trajectory.ts';
import type { Trajectory } from './trajectories/trajectory.ts';

/**
 * Readout oversampling of radial spokes when none is requested: 2, because spokes sampled at
 * 1/FOV support only the inscribed disc of the field of view and the object's corners alias back
 * (common practice; measured on the modified Shepp–Logan at 64²: NRMSE 0.389 without, 0.104 with).
 */
export const DEFAULT_RADIAL_OVERSAMPLING = 2;

/** Interleaves of a spiral when none are requested (a common single-shot-free choice; from memory). */
export const DEFAULT_SPIRAL_INTERLEAVES = 16;

/**
 * The trajectory a radial or spiral spec describes on a matrix (N = max(nx, ny) samples across).
 * The builders name their own `trajectory.*` fields; a request names them under `sampling`.
 */
export function trajectoryOf(matrix: Matrix, spec: RadialSpec | SpiralSpec, spokes?: number): Trajectory {
  try {
    return buildTrajectory(matrix, spec, spokes);
  } catch (error) {
    if (!(error instanceof ValidationError)) throw error;
    const problems = error.problems.map((p) => ({
      ...p,
      field: p.field.replace(/^trajectory\./, 'sampling.'),
    }));
    throw error instanceof LimitError ? new LimitError(problems) : new ValidationError(problems);
  }
}

function buildTrajectory(matrix: Matrix, spec: RadialSpec | SpiralSpec, spokes?: number): Trajectory {
  const side = Math.max(matrix.nx, matrix.ny);
  if (spec.pattern === 'radial') {
    return radialTrajectory({
      side,
      spokes,
      ordering: spec.angles ?? 'uniform',
      tinyGoldenIndex: spec.tinyN,
      readoutOversampling: spec.readoutOversampling ?? DEFAULT_RADIAL_OVERSAMPLING,
    });
  }
  const power = spec.density?.power;
  return spiralTrajectory({
    side,
    interleaves: spec.interleaves ?? DEFAULT_SPIRAL_INTERLEAVES,
    acceleration: spec.acceleration,
    density: power === undefined || power === 1 ? 'uniform' : 'variable',
    power,
    samplesPerInterleaf: spec.samplesPerInterleaf,
  });
}

/**
 * A spiral acquisition: its interleaves as the acquired count against the Nyquist interleave count
 * of the same design (docs/design.md §3.4), with the trajectory kept for the NUFFT path and its
 * nearest grid points as the mask picture (or as the mask itself when rasterised).
 */
export function spiralMask(matrix: Matrix, spec: SpiralSpec): SampledMask {
  const trajectory = trajectoryOf(matrix, spec);
  const mask = rasteriseTrajectory(matrix, trajectory);
  const nonCartesian = (spec.trajectory ?? 'non-cartesian') === 'non-cartesian';
  const total = Math.max(
    trajectory.readouts,
    Math.ceil(trajectory.readouts * trajectory.acceleration - 1e-9),
  );
  return {
    nx: matrix.nx,
    ny: matrix.ny,
    mask,
    pattern: 'spiral',
    acceleration: { requested: spec.acceleration, actual: trajectory.acceleration },
    acquired: { count: trajectory.readouts, unit: 'interleaves' },
    total,
    fraction: countSampled(mask) / (matrix.nx * matrix.ny),
    acs: null,
    representation: nonCartesian ? 'non-cartesian' : 'spiral-rasterised',
    ...(nonCartesian ? { trajectory } : {}),
    seed: null,
    details: {
      interleaves: trajectory.readouts,
      samplesPerInterleaf: trajectory.samplesPerReadout,
      density: power(spec) === 1 ? 'uniform' : 'variable',
      densityPower: power(spec),
    },
  };
}

function power(spec: SpiralSpec): number {
  return spec.density?.power ?? 1;
}
