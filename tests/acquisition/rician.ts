/**
 * Rician moments for the noise checks. Magnitude of A + n, n complex Gaussian with per-channel σ
 * (Gudbjartsson & Patz 1995; docs/references.md §7):
 *   E|A + n| = σ √(π/2) L½(−A²/2σ²),  L½(z) = e^{z/2}[(1 − z) I0(−z/2) − z I1(−z/2)],
 *   E|A + n|² = A² + 2σ².
 * With t = A²/(4σ²): L½ = (1 + 2t)·I0e(t) + 2t·I1e(t), Iνe(t) = e^{−t} Iν(t) (no overflow).
 * I0e, I1e: polynomial approximations of Abramowitz & Stegun 9.8.1–9.8.4 (|ε| ≲ 2e-7 relative;
 * coefficients from memory, checked against the docs/references.md §7 table in the tests).
 */
function besselI0e(x: number): number {
  if (x < 3.75) {
    const t = (x / 3.75) ** 2;
    const i0 =
      1 +
      t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813)))));
    return i0 * Math.exp(-x);
  }
  const t = 3.75 / x;
  const p =
    0.39894228 +
    t *
      (0.01328592 +
        t *
          (0.00225319 +
            t *
              (-0.00157565 +
                t *
                  (0.00916281 + t * (-0.02057706 + t * (0.02635537 + t * (-0.01647633 + t * 0.00392377)))))));
  return p / Math.sqrt(x);
}

function besselI1e(x: number): number {
  if (x < 3.75) {
    const t = (x / 3.75) ** 2;
    const i1 =
      x *
      (0.5 +
        t *
          (0.87890594 +
            t * (0.51498869 + t * (0.15084934 + t * (0.02658733 + t * (0.00301532 + t * 0.00032411))))));
    return i1 * Math.exp(-x);
  }
  const t = 3.75 / x;
  const p =
    0.39894228 +
    t *
      (-0.03988024 +
        t *
          (-0.00362018 +
            t *
              (0.00163801 +
                t *
                  (-0.01031555 + t * (0.02282967 + t * (-0.02895312 + t * (0.01787654 - t * 0.00420059)))))));
  return p / Math.sqrt(x);
}

/** E|A + n| for amplitude A ≥ 0 and per-channel σ > 0. */
export function riceMean(amplitude: number, sigma: number): number {
  const t = (amplitude * amplitude) / (4 * sigma * sigma);
  return sigma * Math.sqrt(Math.PI / 2) * ((1 + 2 * t) * besselI0e(t) + 2 * t * besselI1e(t));
}

/** E(|A + n| − A)² = 2A² + 2σ² − 2A·E|A + n|: the expected squared magnitude error of one pixel. */
export function riceSquaredError(amplitude: number, sigma: number): number {
  return 2 * amplitude * amplitude + 2 * sigma * sigma - 2 * amplitude * riceMean(amplitude, sigma);
}
