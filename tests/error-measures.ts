/** The error measures tests compare results with, over flat arrays (interleaved complex or real). */

/** ‖a − b‖₂ / ‖b‖₂ over interleaved complex (or real) arrays. */
export function relativeError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < b.length; i++) {
    num += (a[i] - b[i]) ** 2;
    den += b[i] ** 2;
  }
  return Math.sqrt(num / den);
}

/** max |a_i − b_i| over the numbers (real and imaginary parts apart) of two arrays. */
export function maxAbsDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < b.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

/** max |Δ| over interleaved complex elements divided by max |expected| (complex moduli). */
export function relativeMaxError(actual: ArrayLike<number>, expected: ArrayLike<number>): number {
  let err = 0;
  let peak = 0;
  for (let i = 0; i < expected.length; i += 2) {
    err = Math.max(err, Math.hypot(actual[i] - expected[i], actual[i + 1] - expected[i + 1]));
    peak = Math.max(peak, Math.hypot(expected[i], expected[i + 1]));
  }
  return err / peak;
}

/** max over pixels of |a_i − b_i| for interleaved complex arrays (the per-pixel distance). */
export function maxPixelDistance(a: Float64Array, b: Float64Array): number {
  let worst = 0;
  for (let i = 0; i < b.length; i += 2) worst = Math.max(worst, Math.hypot(a[i] - b[i], a[i + 1] - b[i + 1]));
  return worst;
}
