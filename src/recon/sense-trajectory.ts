import type { ComplexImage } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';
import type { CoilSamples } from '../encoding/index.ts';
import type { AcsBlock } from './acs-region.ts';
import type { ReconInput, TrajectoryData } from './method.ts';
import {
  type PreparedSense,
  type SenseSpec,
  senseMaps,
  senseSettings,
  solveSenseNormalEquations,
} from './sense.ts';
import { weighedSamples, weightedTrajectoryOperator } from './trajectory-operator.ts';

/**
 * Side of the central square of the gridded coil k-space that maps "acs" calibrate from on a
 * trajectory (24, the usual Cartesian ACS width, common practice). A trajectory has no fully
 * sampled block; its centre is the densest part (radial, variable-density spirals), and the Hann
 * window of estimateAcsMaps tapers the square's edge.
 */
export const TRAJECTORY_ACS_SIDE = 24;

/** SENSE on a trajectory with maps, λ and stopping rule fixed: reusable on other samples (replicas). */
export interface PreparedTrajectorySense extends Omit<PreparedSense, 'solve'> {
  solve(
    samples: CoilSamples,
    overrides?: { iterations?: number; tolerance?: number; signal?: AbortSignal },
  ): { image: ComplexImage; iterations: number; residual: number; converged: boolean };
}

/**
 * Iterative SENSE on non-Cartesian samples (Pruessmann, Weiger, Börnert & Boesiger 2001): CG on
 * (EᴴWE + λI)x = EᴴWy with E = A·S the NUFFT of the coil images and W the density compensation in the
 * data term (their density-corrected form, which speeds CG up), EᴴWE through the Toeplitz kernel.
 * Maps: the known ones ("true") or estimated ("acs") from the central TRAJECTORY_ACS_SIDE square of
 * the gridded coil k-space (`coils.kspace` holds it for trajectory data).
 */
export function prepareTrajectorySense(
  input: ReconInput,
  data: TrajectoryData,
  spec: SenseSpec,
  limits: Limits,
): PreparedTrajectorySense {
  const { nx, ny } = data.plan;
  const { maps, mapsUsed } = senseMaps(input, spec, () => centralSquare(nx, ny, TRAJECTORY_ACS_SIDE));
  const settings = senseSettings(spec, maps, limits);
  const operator = weightedTrajectoryOperator(data, maps);
  return {
    maps,
    mapsUsed,
    ...settings,
    solve(samples, overrides = {}) {
      return solveSenseNormalEquations(
        operator,
        weighedSamples(operator, samples),
        settings.tikhonovAbsolute,
        {
          iterations: overrides.iterations ?? settings.iterationLimit,
          tolerance: overrides.tolerance ?? settings.tolerance,
          signal: overrides.signal,
        },
      );
    },
  };
}

/** The centred side×side block of an ny×nx grid (clipped to the grid), DC at (⌊ny/2⌋, ⌊nx/2⌋). */
function centralSquare(nx: number, ny: number, side: number): AcsBlock {
  const rows = Math.min(side, ny);
  const cols = Math.min(side, nx);
  return {
    rowStart: Math.floor(ny / 2) - Math.floor(rows / 2),
    rows,
    colStart: Math.floor(nx / 2) - Math.floor(cols / 2),
    cols,
  };
}
