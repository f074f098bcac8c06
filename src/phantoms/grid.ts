/**
 * The grid convention that ties a phantom's continuous frame to the project's arrays
 * (DEVELOPERS.md "Numerical conventions"; docs/references.md §0):
 *
 *   pixel column j  ↔  x  = (j − ⌊nx/2⌋)·2/nx          k-space column u  ↔  kx =  (u − ⌊nx/2⌋)/2
 *   pixel row    i  ↔  y  = −(i − ⌊ny/2⌋)·2/ny         k-space row    v  ↔  ky = −(v − ⌊ny/2⌋)/2
 *
 * in units where the phantom fills [−1, 1]² with y pointing up (row 0 is the top, the largest y;
 * ky carries the same minus sign because rows run against y). Frequencies are in cycles per unit,
 * so the grid spacing is Δk = 1/FOV = 1/2 and kx·x = (u − ⌊nx/2⌋)(j − ⌊nx/2⌋)/nx, exactly the phase
 * of the centred DFT. The continuous transform K(k) = ∫ f(x) e^(−i2πk·x) dx is approximated by
 * the pixel area hx·hy = 4/(nx·ny) times the unnormalised DFT of a raster; the orthonormal DFT divides
 * that sum by √(nx·ny), hence
 *
 *   fft2c(raster)[v][u]  ≈  K(kx_u, ky_v) · √(nx·ny) / 4      (the factor returned by gridScale)
 *
 * and ifft2c of the analytic grid k-space approximates the raster.
 */

/** x of pixel column j (centre of the pixel), phantom units. */
export function pixelX(j: number, nx: number): number {
  return ((j - Math.floor(nx / 2)) * 2) / nx;
}

/** y of pixel row i (centre of the pixel), phantom units; row 0 is the top (largest y). */
export function pixelY(i: number, ny: number): number {
  return (-(i - Math.floor(ny / 2)) * 2) / ny;
}

/** kx of k-space column u, cycles per unit. */
export function gridKx(u: number, nx: number): number {
  return (u - Math.floor(nx / 2)) / 2;
}

/** ky of k-space row v, cycles per unit (minus sign: rows run against y). */
export function gridKy(v: number, ny: number): number {
  return -(v - Math.floor(ny / 2)) / 2;
}

/** Factor from the continuous transform to the orthonormal centred DFT of an ny×nx raster. */
export function gridScale(nx: number, ny: number): number {
  return Math.sqrt(nx * ny) / 4;
}
