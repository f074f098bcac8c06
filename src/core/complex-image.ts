/**
 * A complex 2D image or k-space array stored as one interleaved Float64Array:
 * element (row, col) has its real part at 2·(row·nx + col) and imaginary part one after.
 * Rows are the phase-encode direction (ky, ny rows); columns the readout (kx, nx columns).
 */
export interface ComplexImage {
  readonly nx: number;
  readonly ny: number;
  readonly data: Float64Array;
}

export function assertMatrixSize(nx: number, ny: number): void {
  if (!Number.isInteger(nx) || nx < 1) throw new RangeError(`nx must be a positive integer, got ${nx}`);
  if (!Number.isInteger(ny) || ny < 1) throw new RangeError(`ny must be a positive integer, got ${ny}`);
}

export function createComplexImage(nx: number, ny: number): ComplexImage {
  assertMatrixSize(nx, ny);
  return { nx, ny, data: new Float64Array(2 * nx * ny) };
}

export function cloneComplexImage(image: ComplexImage): ComplexImage {
  return { nx: image.nx, ny: image.ny, data: image.data.slice() };
}

/** A complex image whose real parts are `values` (row-major, ny·nx) and imaginary parts zero. */
export function complexFromReal(values: ArrayLike<number>, nx: number, ny: number): ComplexImage {
  const n = nx * ny;
  if (values.length !== n)
    throw new RangeError(`values must hold nx·ny = ${n} numbers, got ${values.length}`);
  const image = createComplexImage(nx, ny);
  for (let i = 0; i < n; i++) image.data[2 * i] = values[i];
  return image;
}

/** |z| per element, row-major, into a new Float64Array of length nx·ny. */
export function magnitude(image: ComplexImage): Float64Array {
  const n = image.nx * image.ny;
  const out = new Float64Array(n);
  const d = image.data;
  for (let i = 0; i < n; i++) out[i] = Math.hypot(d[2 * i], d[2 * i + 1]);
  return out;
}

/** Squared 2-norm of the whole complex array. */
export function energy(image: ComplexImage): number {
  let s = 0;
  const d = image.data;
  for (let i = 0; i < d.length; i++) s += d[i] * d[i];
  return s;
}
