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

/** Σ_c |z_c|² at every pixel (ny·nx values, summed over the coils in order): the squared root-sum-of-squares. */
export function sumOfSquaresOverCoils(array: MultiCoilArray): Float64Array {
  const { coils } = array;
  const n = array.nx * array.ny;
  const d = array.data;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let c = 0; c < coils; c++) {
      const k = 2 * (c * n + i);
      sum += d[k] * d[k] + d[k + 1] * d[k + 1];
    }
    out[i] = sum;
  }
  return out;
}

/** z_c ← scale[i]·z_c at every pixel i, in place: one real factor per pixel, the same for every coil. */
export function scalePixels(array: MultiCoilArray, scale: Float64Array): void {
  const n = array.nx * array.ny;
  const d = array.data;
  for (let c = 0; c < array.coils; c++) {
    const base = 2 * c * n;
    for (let i = 0; i < n; i++) {
      d[base + 2 * i] *= scale[i];
      d[base + 2 * i + 1] *= scale[i];
    }
  }
}
