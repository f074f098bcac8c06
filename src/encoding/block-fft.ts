import { centredTransform2d } from '../core/centered-fft.ts';

/**
 * The centred orthonormal 2D DFT (sign −1, as fft2c) or its inverse (sign +1, as ifft2c) of one
 * ny×nx plane stored at complex offset `offset` of a flat interleaved array, in place, through the
 * same centredTransform2d as fft2c: a plane transformed here equals fft2c of the same values bit
 * for bit, and nothing is allocated once the size's scratch planes exist.
 */
export function transformPlaneInPlace(
  data: Float64Array,
  offset: number,
  nx: number,
  ny: number,
  sign: -1 | 1,
): void {
  centredTransform2d(data, offset, data, offset, nx, ny, sign);
}
