import { LimitError } from '../../src/core/errors.ts';

/**
 * A non-Cartesian k-space trajectory: sample p at (kx[p], ky[p]) in cycles per field of view,
 * y up (the phantom frame; DEVELOPERS.md). The grid point in row v, column u of an ny×nx k-space
 * sits at kx = u − ⌊nx/2⌋, ky = −(v − ⌊ny/2⌋); one cycle per FOV is ½ cycle per phantom unit.
 * Samples are stored readout by readout: readout r holds samples r·samplesPerReadout … + samplesPerReadout − 1.
 */
export interface Trajectory {
  readonly kind: 'radial' | 'spiral';
  readonly kx: Float64Array;
  readonly ky: Float64Array;
  /** Spokes or interleaves. */
  readonly readouts: number;
  readonly samplesPerReadout: number;
  /** Readouts that meet the Nyquist criterion at the edge of k-space (same samples per readout). */
  readonly nyquistReadouts: number;
  /** Acceleration against that Nyquist count (spokes or outermost turn spacing). */
  readonly acceleration: number;
}

/** Most points one trajectory may hold (2²⁴ ≈ 16.8 M: 268 MB of coordinates, more in a NUFFT plan). */
export const MAX_TRAJECTORY_POINTS = 2 ** 24;

/** Refuses a trajectory of more than MAX_TRAJECTORY_POINTS points, naming the field that sets it. */
export function checkTrajectorySize(readouts: number, samplesPerReadout: number, field: string): void {
  const total = readouts * samplesPerReadout;
  if (total > MAX_TRAJECTORY_POINTS) {
    throw new LimitError({
      field,
      message: `${readouts} readouts × ${samplesPerReadout} samples = ${total} points exceed the limit`,
      allowed: `readouts × samples ≤ ${MAX_TRAJECTORY_POINTS}`,
    });
  }
}
