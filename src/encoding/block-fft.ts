import { centeredLineTransform } from '../core/centered-fft.ts';

/**
 * The centred orthonormal 2D DFT (sign −1, as fft2c) or its inverse (sign +1, as ifft2c) of one
 * ny×nx plane stored at complex offset `offset` of a flat interleaved array, in place. Rows first,
 * then columns, through the same 1D line transform as fft2c, so a plane transformed here equals
 * fft2c of the same values bit for bit, and nothing is allocated (plans and line buffers are cached).
 */
export function transformPlaneInPlace(
  data: Float64Array,
  offset: number,
  nx: number,
  ny: number,
  sign: -1 | 1,
): void {
  for (let row = 0; row < ny; row++) centeredLineTransform(data, data, offset + row * nx, nx, 1, sign);
  for (let col = 0; col < nx; col++) centeredLineTransform(data, data, offset + col, ny, nx, sign);
}
