import type { SeededRandom } from '../core/random.ts';

/**
 * Cycle spinning (Coifman & Donoho 1995; in iterative reconstruction, Figueiredo & Nowak 2003):
 * the decimated transform is not shift-invariant, so thresholding it with one fixed grid leaves
 * blocky artefacts aligned with that grid. Drawing a new random circular shift s each iteration and
 * using the prox of λ‖W S x‖₁, i.e. Sᴴ Wᴴ soft(W S x), averages the grids out over the iterations.
 * Shifts by multiples of 2^levels only permute coefficients within each band (which the
 * soft-threshold ignores), so drawing from [0, 2^levels)² covers every distinct grid.
 */
export function randomShift(rng: SeededRandom, levels: number): { dy: number; dx: number } {
  const period = 2 ** levels;
  return { dy: rng.integer(period), dx: rng.integer(period) };
}

/**
 * target[(i + dy) mod ny, (j + dx) mod nx] = source[i, j] on interleaved complex ny×nx arrays
 * (target ≠ source). The inverse shift is (−dy, −dx).
 */
export function circularShift(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  dy: number,
  dx: number,
): void {
  if (target === source) throw new RangeError('circularShift needs distinct target and source arrays');
  const sy = ((dy % ny) + ny) % ny;
  const sx = ((dx % nx) + nx) % nx;
  for (let i = 0; i < ny; i++) {
    const rowIn = 2 * i * nx;
    const rowOut = 2 * ((i + sy) % ny) * nx;
    // Two contiguous runs per row: columns [0, nx − sx) move right by sx, the rest wrap to the start.
    target.set(source.subarray(rowIn, rowIn + 2 * (nx - sx)), rowOut + 2 * sx);
    target.set(source.subarray(rowIn + 2 * (nx - sx), rowIn + 2 * nx), rowOut);
  }
}
