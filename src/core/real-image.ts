/** A real-valued 2D image, row-major (row = ky/y direction, ny rows; column = kx/x, nx columns). */
export interface RealImage {
  readonly nx: number;
  readonly ny: number;
  readonly data: Float64Array;
}
