import type { Matrix } from '../src/core/matrix.ts';
import type { Trajectory } from './trajectories/trajectory.ts';

/**
 * Marks the grid point nearest each trajectory sample: (kx, ky) in cycles per FOV sits at column
 * ⌊nx/2⌋ + kx and row ⌊ny/2⌋ − ky (rows run against ky; docs/design.md §3.3). Samples off the grid
 * are dropped. This is the picture of a trajectory, and the mask of its rasterised representation.
 */
export function rasteriseTrajectory(matrix: Matrix, trajectory: Trajectory): Uint8Array {
  const { nx, ny } = matrix;
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const mask = new Uint8Array(nx * ny);
  const { kx, ky } = trajectory;
  for (let p = 0; p < kx.length; p++) {
    const u = cx + Math.round(kx[p]);
    const v = cy - Math.round(ky[p]);
    if (u >= 0 && u < nx && v >= 0 && v < ny) mask[v * nx + u] = 1;
  }
  return mask;
}
