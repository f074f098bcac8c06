import type { RealVolume } from '../core/real-volume.ts';
import { resampleBilinear } from '../pipeline/resample.ts';

/**
 * Trilinear resampling to nz × ny × nx, voxel centres onto voxel centres: each slice bilinearly
 * (resampleBilinear), then linearly along z, which is resampleBilinear of the slice stack viewed as
 * nz rows of nx·ny columns (the column count is kept, so that pass interpolates along z only).
 */
export function resampleTrilinear(volume: RealVolume, nx: number, ny: number, nz: number): RealVolume {
  if (volume.nx === nx && volume.ny === ny && volume.nz === nz) return volume;
  const n = volume.nx * volume.ny;
  const inPlane = new Float64Array(nx * ny * volume.nz);
  for (let z = 0; z < volume.nz; z++) {
    const slice = { nx: volume.nx, ny: volume.ny, data: volume.data.subarray(z * n, (z + 1) * n) };
    inPlane.set(resampleBilinear(slice, nx, ny).data, z * nx * ny);
  }
  const stacked = resampleBilinear({ nx: nx * ny, ny: volume.nz, data: inPlane }, nx * ny, nz);
  return { nx, ny, nz, data: stacked.data };
}
