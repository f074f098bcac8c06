import type { RealImage } from './real-image.ts';

/**
 * A real-valued 3D volume: nz slices of ny rows × nx columns, slice-major then row-major
 * (value at column x, row y, slice z is data[(z·ny + y)·nx + x]). Columns are the readout x, rows
 * the phase-encode y and slices the second phase-encode z of a 3D acquisition (docs/design.md §2.5).
 */
export interface RealVolume {
  readonly nx: number;
  readonly ny: number;
  readonly nz: number;
  readonly data: Float64Array;
}

/** Slice z (ny rows × nx columns) as its own image (a copy). */
export function volumeSlice(volume: RealVolume, z: number): RealImage {
  const n = volume.nx * volume.ny;
  return { nx: volume.nx, ny: volume.ny, data: volume.data.slice(z * n, (z + 1) * n) };
}
