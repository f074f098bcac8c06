import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { gridKx, gridKy, gridScale } from './grid.ts';
import { type Phantom, ShapePhantom } from './phantom.ts';
import { checkMatrix } from './validate.ts';

/** Points per kspaceAt call for phantoms without a grid fast path: whole rows, cache-sized. */
const CHUNK_POINTS = 16384;

/**
 * Analytic k-space of a phantom on the ny×nx grid, scaled to the orthonormal centred DFT convention
 * (see grid.ts): element (v, u) = K(kx = (u − ⌊nx/2⌋)/2, ky = −(v − ⌊ny/2⌋)/2) · √(nx·ny)/4,
 * so that it matches fft2c of a fine raster at low frequencies and ifft2c of it approximates the raster.
 */
export function phantomGridKspace(phantom: Phantom, nx: number, ny: number): ComplexImage {
  checkMatrix(nx, ny);
  const image = createComplexImage(nx, ny);
  const scale = gridScale(nx, ny);
  const kxAxis = Float64Array.from({ length: nx }, (_, u) => gridKx(u, nx));
  const kyAxis = Float64Array.from({ length: ny }, (_, v) => gridKy(v, ny));
  if (phantom instanceof ShapePhantom) {
    // Accumulate straight into the image, then scale in place: no second full-size array.
    const data = phantom.kspaceOnAxes(kxAxis, kyAxis, image.data);
    for (let i = 0; i < data.length; i++) data[i] *= scale;
    return image;
  }
  kspaceOnAxesByRows(phantom, kxAxis, kyAxis, (values, offset) => {
    for (let i = 0; i < values.length; i++) image.data[offset + i] = values[i] * scale;
  });
  return image;
}

/**
 * K on the Cartesian product of two axes (kyAxis.length rows × kxAxis.length), evaluated through
 * kspaceAt in chunks of whole rows so that the point lists stay cache-sized; `take` receives each
 * chunk's interleaved values and its offset into the interleaved ny×nx array.
 */
export function kspaceOnAxesByRows(
  phantom: Phantom,
  kxAxis: Float64Array,
  kyAxis: Float64Array,
  take: (values: Float64Array, offset: number) => void,
): void {
  const nx = kxAxis.length;
  const ny = kyAxis.length;
  const rowsPerChunk = Math.max(1, Math.floor(CHUNK_POINTS / nx));
  const kx = new Float64Array(rowsPerChunk * nx);
  const ky = new Float64Array(rowsPerChunk * nx);
  for (let v0 = 0; v0 < ny; v0 += rowsPerChunk) {
    const rows = Math.min(rowsPerChunk, ny - v0);
    for (let r = 0; r < rows; r++) {
      kx.set(kxAxis, r * nx);
      ky.fill(kyAxis[v0 + r], r * nx, (r + 1) * nx);
    }
    const count = rows * nx;
    take(phantom.kspaceAt(kx.subarray(0, count), ky.subarray(0, count)), 2 * v0 * nx);
  }
}
