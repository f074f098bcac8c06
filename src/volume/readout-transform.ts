import { centeredLineTransform } from '../core/centered-fft.ts';

/**
 * The centred orthonormal 1D DFT along the readout x of a complex volume (interleaved, x fastest:
 * element (x, y, z) at 2·((z·ny + y)·nx + x)), in place. sign −1 forward (x → kx), +1 inverse
 * (kx → x). Fully sampled along x, so the inverse is exact: it turns 3D k-space into the hybrid
 * space (x, ky, kz) whose x-planes are independent 2D problems (docs/design.md §2.5).
 */
export function readoutTransform(data: Float64Array, nx: number, ny: number, nz: number, sign: -1 | 1): void {
  if (data.length !== 2 * nx * ny * nz) throw new RangeError('the volume must hold 2·nx·ny·nz numbers');
  for (let line = 0; line < ny * nz; line++) centeredLineTransform(data, data, line * nx, nx, 1, sign);
}

/** The centred orthonormal 2D DFT over (y, z) of every x-plane, in place (x fastest layout as above). */
export function phaseEncodeTransform(
  data: Float64Array,
  nx: number,
  ny: number,
  nz: number,
  sign: -1 | 1,
): void {
  if (data.length !== 2 * nx * ny * nz) throw new RangeError('the volume must hold 2·nx·ny·nz numbers');
  for (let z = 0; z < nz; z++) {
    for (let x = 0; x < nx; x++) centeredLineTransform(data, data, z * ny * nx + x, ny, nx, sign);
  }
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) centeredLineTransform(data, data, y * nx + x, nz, nx * ny, sign);
  }
}
