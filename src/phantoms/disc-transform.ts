import besselJ1 from '@stdlib/math-base-special-besselj1';

/**
 * J1, the Bessel function of the first kind of order one, from stdlib (a port of Boost's rational
 * approximations). Checked in tests/phantoms/bessel-j1.test.ts against mpmath values and Bessel's
 * integral: relative error ≤ 1e-12 away from the zeros, absolute error ≤ 2e-15 for 0 < x ≤ 60 and
 * ≈ 1e-14 up to x = 5000 (against 30-digit mpmath the relative error was ≈ 1e-14 where |J1| ≥ 1e-3).
 */
export { besselJ1 };

/** Below this radial frequency the two-term series is exact to double precision. */
const SERIES_LIMIT = 1e-6;

/**
 * Fourier transform of the unit disc at radial frequency q (cycles per unit):
 *   D(q) = J1(2πq)/q,   D(0) = π (the disc's area).
 * Near 0 the series π(1 − (πq)²/2) is used, avoiding 0/0 and loss of precision.
 */
export function discTransform(q: number): number {
  if (q < SERIES_LIMIT) {
    const t = Math.PI * q;
    return Math.PI * (1 - 0.5 * t * t);
  }
  return besselJ1(2 * Math.PI * q) / q;
}
