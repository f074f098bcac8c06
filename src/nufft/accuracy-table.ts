/**
 * Expected relative error ‖y − y_exact‖₂ / ‖y_exact‖₂ of the type-2 NUFFT, MEASURED (not an
 * estimate formula) by tests/nufft/measure-accuracy.ts: 64×64 complex Gaussian image, 2000
 * uniformly random points, worst of three seeds, against the direct sum; rounded up to two digits.
 * Rows: kernel width W = 2…8; columns: oversampling α = 1.25, 1.5, 2.
 * The type-1 (adjoint) error is of the same size (same kernel, same deapodisation).
 */
const OVERSAMPLING_COLUMNS = [1.25, 1.5, 2] as const;
const MEASURED: Readonly<Record<number, readonly [number, number, number]>> = {
  2: [1.9e-1, 1.2e-1, 6.3e-2],
  3: [3.2e-2, 1.5e-2, 6.0e-3],
  4: [6.8e-3, 2.1e-3, 6.3e-4],
  5: [1.6e-3, 3.2e-4, 6.4e-5],
  6: [3.9e-4, 5.1e-5, 6.7e-6],
  7: [9.8e-5, 8.2e-6, 7.4e-7],
  8: [2.4e-5, 1.4e-6, 8.0e-8],
};

/**
 * The tabulated error for width W at the largest tabulated α not above the requested one
 * (a conservative bound: more oversampling only lowers the error).
 */
export function expectedRelativeError(width: number, oversampling: number): number {
  const row = MEASURED[width];
  if (!row) return Number.NaN;
  let column = 0;
  for (let c = 0; c < OVERSAMPLING_COLUMNS.length; c++) {
    if (OVERSAMPLING_COLUMNS[c] <= oversampling + 1e-12) column = c;
  }
  return row[column];
}
