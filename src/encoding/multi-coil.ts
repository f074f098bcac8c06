import { assertMatrixSize } from '../core/complex-image.ts';

/**
 * A stack of complex ny×nx planes, one per coil, in one coil-major interleaved Float64Array:
 * coil c, row i, column j has its real part at 2·(c·ny·nx + i·nx + j) and the imaginary part one
 * after. Each plane follows the ComplexImage layout (rows = ky / y, columns = kx / x).
 */
export interface MultiCoilArray {
  readonly coils: number;
  readonly nx: number;
  readonly ny: number;
  readonly data: Float64Array;
}

/** Multi-coil Cartesian k-space: one centred k-space plane per coil (unacquired samples are 0). */
export type MultiCoilKspace = MultiCoilArray;

/** Coil sensitivity maps S_c: one image-domain plane per coil, phantom frame of each ComplexImage. */
export type CoilMaps = MultiCoilArray;

export function createMultiCoilArray(coils: number, nx: number, ny: number): MultiCoilArray {
  assertMatrixSize(nx, ny);
  if (!Number.isInteger(coils) || coils < 1) {
    throw new RangeError(`coils must be a positive integer, got ${coils}`);
  }
  return { coils, nx, ny, data: new Float64Array(2 * coils * nx * ny) };
}

/** Throws when `array` is not coils × ny × nx complex (data length included). */
export function checkMultiCoilShape(
  array: MultiCoilArray,
  coils: number,
  nx: number,
  ny: number,
  name: string,
): void {
  if (array.coils !== coils || array.nx !== nx || array.ny !== ny) {
    throw new RangeError(
      `${name} is ${array.coils} coils of ${array.ny}×${array.nx}, expected ${coils} coils of ${ny}×${nx}`,
    );
  }
  if (array.data.length !== 2 * coils * nx * ny) {
    throw new RangeError(`${name}.data must hold 2·coils·ny·nx = ${2 * coils * nx * ny} numbers`);
  }
}
