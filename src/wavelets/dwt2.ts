import type { ComplexImage } from '../core/complex-image.ts';
import { daubechiesFilters, type WaveletFilters } from './daubechies-filters.ts';
import { analyzeLine, type LineKernel, synthesizeLine } from './wavelet-line.ts';

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
 * A whole multi-level transform on raw interleaved arrays: `target` (may be `source`) receives the
 * transform of the ny×nx complex `source`.
 */
export type Dwt2Transform = (
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  filters: WaveletFilters,
  levels: number,
) => void;

/** W x: the coefficients in the Mallat layout (rows, then columns, finest level first). */
export const forwardDwt2: Dwt2Transform = (target, source, nx, ny, filters, levels) => {
  copyChecked(target, source, nx, ny, levels);
  for (let level = 0; level < levels; level++) {
    transformBlock(analyzeLine, target, nx, ny, level, 'rows', filters);
    transformBlock(analyzeLine, target, nx, ny, level, 'columns', filters);
  }
};

/** Wᴴ c = W⁻¹ c: the inverse of `forwardDwt2` (columns, then rows, coarsest level first). */
export const inverseDwt2: Dwt2Transform = (target, source, nx, ny, filters, levels) => {
  copyChecked(target, source, nx, ny, levels);
  for (let level = levels - 1; level >= 0; level--) {
    transformBlock(synthesizeLine, target, nx, ny, level, 'columns', filters);
    transformBlock(synthesizeLine, target, nx, ny, level, 'rows', filters);
  }
};

function copyChecked(target: Float64Array, source: Float64Array, nx: number, ny: number, levels: number) {
  checkDwtShape(nx, ny, levels);
  if (target !== source) target.set(source.subarray(0, 2 * nx * ny));
}

/** One line kernel over every row, or every column, of the level's top-left (ny/2ˡ)×(nx/2ˡ) block. */
function transformBlock(
  kernel: LineKernel,
  data: Float64Array,
  nx: number,
  ny: number,
  level: number,
  lines: 'rows' | 'columns',
  filters: WaveletFilters,
): void {
  const w = nx >> level;
  const h = ny >> level;
  if (lines === 'rows') for (let row = 0; row < h; row++) kernel(data, data, row * nx, w, 1, filters);
  else for (let col = 0; col < w; col++) kernel(data, data, col, h, nx, filters);
}

/** The image-level form of a raw transform: a new image unless `target` is given (it may be `source`). */
function onImages(transform: Dwt2Transform) {
  return (source: ComplexImage, wavelet: string, levels: number, target?: ComplexImage): ComplexImage => {
    const out = checkedTarget(source, target);
    transform(out.data, source.data, source.nx, source.ny, daubechiesFilters(wavelet), levels);
    return out;
  };
}

/** Coefficients of a complex image (new image unless `target` is given; it may be `source`). */
export const dwt2 = onImages(forwardDwt2);

/** The image whose `dwt2` is `source`. */
export const idwt2 = onImages(inverseDwt2);

function checkedTarget(source: ComplexImage, target: ComplexImage | undefined): ComplexImage {
  if (!target) return { nx: source.nx, ny: source.ny, data: new Float64Array(2 * source.nx * source.ny) };
  if (target.nx !== source.nx || target.ny !== source.ny) {
    throw new RangeError(`target is ${target.ny}×${target.nx} but source is ${source.ny}×${source.nx}`);
  }
  return target;
}
