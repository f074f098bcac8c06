import { describe, expect, it } from 'vitest';
import { besselJ1, discTransform } from '../../src/phantoms/disc-transform.ts';

/**
 * Bessel's integral J1(x) = (1/2π) ∫₀^{2π} cos(τ − x sin τ) dτ (DLMF 10.9.2; Abramowitz & Stegun
 * 9.1.21). The integrand is smooth and periodic, so the M-point trapezoidal rule is exact up to the
 * aliased terms J_{M±1}(x); they decay like an Airy function once M − |x| exceeds a few |x|^(1/3),
 * so M = |x| + 12|x|^(1/3) + 64 leaves them far below 1e-16.
 */
function besselIntegral(x: number): number {
  const ax = Math.abs(x);
  const m = Math.ceil(ax + 12 * Math.cbrt(ax) + 64);
  let sum = 0;
  for (let j = 0; j < m; j++) {
    const tau = (2 * Math.PI * j) / m;
    sum += Math.cos(tau - x * Math.sin(tau));
  }
  return sum / m;
}

describe('J1 (stdlib besselj1) used by the ellipse transform', () => {
  it('matches tabulated values (mpmath.besselj at 30 digits on Debian python3-mpmath, printed by tests/reference/bessel_j1_values.py; leading digits as in A&S Table 9.1)', () => {
    const table: [number, number][] = [
      [1, 0.4400505857449335],
      [2, 0.5767248077568734],
      [5, -0.32757913759146523],
      [10, 0.04347274616886144],
      [20, 0.06683312417585005],
      [100, -0.07714535201411216],
    ];
    for (const [x, expected] of table) {
      expect(Math.abs(besselJ1(x) - expected) / Math.abs(expected)).toBeLessThan(1e-12);
    }
  });

  it('vanishes at the tabulated zeros j1,1 … j1,5 (mpmath.besseljzero via tests/reference/bessel_j1_values.py; A&S Table 9.5)', () => {
    const zeros = [3.8317059702075125, 7.015586669815619, 10.173468135062722, 13.323691936314223];
    for (const z of [...zeros, 16.470630050877634]) {
      // |J1′(j)| = |J0(j)| ≤ 0.41, so an argument rounded by 1 ulp moves J1 by < 1e-15.
      expect(Math.abs(besselJ1(z))).toBeLessThan(2e-15);
    }
  });

  it('agrees with Bessel’s integral for 0 < x ≤ 60: relative 1e-12 where |J1| ≥ 1e-2, absolute 2e-15 everywhere', () => {
    let worstRelative = 0;
    let worstAbsolute = 0;
    for (let i = 1; i <= 1200; i++) {
      const x = i * 0.05;
      const reference = besselIntegral(x);
      const error = Math.abs(besselJ1(x) - reference);
      worstAbsolute = Math.max(worstAbsolute, error);
      if (Math.abs(reference) >= 1e-2) worstRelative = Math.max(worstRelative, error / Math.abs(reference));
    }
    expect(worstRelative).toBeLessThan(1e-12);
    expect(worstAbsolute).toBeLessThan(2e-15);
  });

  it('agrees with Bessel’s integral at large arguments reached by fine grids (absolute 1e-13)', () => {
    // 2πq for a = 0.92 at the corner of a 1024² grid is ≈ 2.1e3.
    for (const x of [123.4, 987.6, 2100.5, 5000.25]) {
      expect(Math.abs(besselJ1(x) - besselIntegral(x))).toBeLessThan(1e-13);
    }
  });

  it('is odd: J1(−x) = −J1(x) (DLMF 10.4.1)', () => {
    for (const x of [0.3, 4.2, 17.9]) expect(besselJ1(-x)).toBe(-besselJ1(x));
  });
});

describe('disc transform J1(2πq)/q', () => {
  it('tends to the unit disc’s area π at q = 0 and continues smoothly through the series cut-over', () => {
    expect(discTransform(0)).toBe(Math.PI);
    // Either side of the cut-over: the series π(1 − (πq)²/2) and J1(2πq)/q must agree closely.
    for (const q of [5e-7, 1e-6, 2e-6, 1e-4]) {
      expect(
        Math.abs(discTransform(q) - (2 * Math.PI * besselIntegral(2 * Math.PI * q)) / (2 * Math.PI * q)),
      ).toBeLessThan(1e-9);
    }
  });

  it('has its first zero where J1 does, at q = j1,1/(2π) (A&S Table 9.5)', () => {
    expect(Math.abs(discTransform(3.8317059702075125 / (2 * Math.PI)))).toBeLessThan(1e-14);
  });
});
