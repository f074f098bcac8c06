import type { ComplexImage } from '../core/complex-image.ts';
import { daubechiesFilters, type WaveletFilters } from './daubechies-filters.ts';
import { analyzeLine, synthesizeLine } from './wavelet-line.ts';

/**
 * Separable multi-level 2D discrete wavelet transform with periodic boundary (PyWavelets'
 * 'periodization' mode), on interleaved complex ny×nx arrays: re and im are transformed alike.
 * Level j (j = 0 … levels − 1) transforms the top-left (ny/2ʲ)×(nx/2ʲ) block: every row, then every
 * column. The result is in the Mallat layout: the approximation in the top-left
 * (ny/2^L)×(nx/2^L) block and, for each level j ≥ 1 with h = ny/2ʲ, w = nx/2ʲ, the detail bands
 *   rows h…2h, cols 0…w: high-pass down the columns (PyWavelets' cH, key 'da'),
 *   rows 0…h, cols w…2w: high-pass along the rows (cV, 'ad'),
 *   rows h…2h, cols w…2w: high-pass both ways (cD, 'dd').
 * Each level is an orthogonal matrix, so the whole transform W is unitary: ‖Wx‖ = ‖x‖ and
 * Wᴴ = W⁻¹ (the adjoint is the inverse below).
 *
 * Sizes: every level halves both sides exactly, so nx and ny must be divisible by 2^levels; other
 * sizes throw a RangeError (a programming mistake here — requests are validated at the edge;
 * `maxDwtLevels` gives the deepest transform a size allows).
 */
export function checkDwtShape(nx: number, ny: number, levels: number): void {
  if (!Number.isInteger(levels) || levels < 1) {
    throw new RangeError(`levels must be a positive integer, got ${levels}`);
  }
  const block = 2 ** levels;
  if (nx % block !== 0 || ny % block !== 0) {
    throw new RangeError(
      `a ${levels}-level periodised DWT needs nx and ny divisible by ${block}, got ${ny}×${nx}`,
    );
  }
}

/** The largest L with nx and ny both divisible by 2^L (0 when either side is odd). */
export function maxDwtLevels(nx: number, ny: number): number {
  let levels = 0;
  while (
    nx % 2 ** (levels + 1) === 0 &&
    ny % 2 ** (levels + 1) === 0 &&
    2 ** (levels + 1) <= Math.min(nx, ny)
  ) {
    levels++;
  }
  return levels;
}

/**
 * W x on raw interleaved arrays: `target` (may be `source`) receives the coefficients of the
 * ny×nx complex `source` in the Mallat layout.
 */
export function forwardDwt2(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  filters: WaveletFilters,
  levels: number,
): void {
  checkDwtShape(nx, ny, levels);
  if (target !== source) target.set(source.subarray(0, 2 * nx * ny));
  for (let level = 0; level < levels; level++) {
    const w = nx >> level;
    const h = ny >> level;
    for (let row = 0; row < h; row++) analyzeLine(target, target, row * nx, w, 1, filters);
    for (let col = 0; col < w; col++) analyzeLine(target, target, col, h, nx, filters);
  }
}

/** Wᴴ c = W⁻¹ c: the inverse of `forwardDwt2` (columns, then rows, coarsest level first). */
export function inverseDwt2(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  filters: WaveletFilters,
  levels: number,
): void {
  checkDwtShape(nx, ny, levels);
  if (target !== source) target.set(source.subarray(0, 2 * nx * ny));
  for (let level = levels - 1; level >= 0; level--) {
    const w = nx >> level;
    const h = ny >> level;
    for (let col = 0; col < w; col++) synthesizeLine(target, target, col, h, nx, filters);
    for (let row = 0; row < h; row++) synthesizeLine(target, target, row * nx, w, 1, filters);
  }
}

/** Coefficients of a complex image (new image unless `target` is given; it may be `source`). */
export function dwt2(
  source: ComplexImage,
  wavelet: string,
  levels: number,
  target?: ComplexImage,
): ComplexImage {
  const out = checkedTarget(source, target);
  forwardDwt2(out.data, source.data, source.nx, source.ny, daubechiesFilters(wavelet), levels);
  return out;
}

/** The image whose `dwt2` is `source`. */
export function idwt2(
  source: ComplexImage,
  wavelet: string,
  levels: number,
  target?: ComplexImage,
): ComplexImage {
  const out = checkedTarget(source, target);
  inverseDwt2(out.data, source.data, source.nx, source.ny, daubechiesFilters(wavelet), levels);
  return out;
}

function checkedTarget(source: ComplexImage, target: ComplexImage | undefined): ComplexImage {
  if (!target) return { nx: source.nx, ny: source.ny, data: new Float64Array(2 * source.nx * source.ny) };
  if (target.nx !== source.nx || target.ny !== source.ny) {
    throw new RangeError(`target is ${target.ny}×${target.nx} but source is ${source.ny}×${source.nx}`);
  }
  return target;
}
