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
