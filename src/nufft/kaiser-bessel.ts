/**
 * The Kaiser–Bessel gridding kernel (Jackson, Meyer, Nishimura & Macovski 1991) with the shape
 * parameter of Beatty, Nishimura & Pauly 2005, and its continuous Fourier transform, which the
 * NUFFT divides out of the image (deapodisation).
 *
 * Distances u are in oversampled-grid units; the kernel is
 *   C(u) = I0(β·√(1 − (2u/W)²)) for |u| ≤ W/2, else 0          (unnormalised: C(0) = I0(β))
 * and its transform, f in cycles per oversampled-grid unit,
 *   ĉ(f) = ∫ C(u) e^(−i2πuf) du = W·sinh(√(β² − π²W²f²)) / √(β² − π²W²f²)
 * (W·sin(√(π²W²f² − β²))/√(…) past the root, W at the root). The 1/W factor some authors put in
 * front of C cancels between gridding and deapodisation, so it is left out here.
 */

/**
 * Beatty et al. 2005 shape for width W and oversampling α: β = π·√((W/α)²(α − ½)² − 0.8).
 * The radicand is positive for every W ≥ 2, α ≥ 1.25 the plans accept.
 */
export function kaiserBesselBeta(width: number, oversampling: number): number {
  const radicand = (width / oversampling) ** 2 * (oversampling - 0.5) ** 2 - 0.8;
  if (!(radicand > 0)) {
    throw new RangeError(`no Kaiser–Bessel shape for width ${width} and oversampling ${oversampling}`);
  }
  return Math.PI * Math.sqrt(radicand);
}

/**
 * Modified Bessel function of the first kind, order zero, by its power series
 * I0(x) = Σ (x²/4)^k / (k!)². All terms are positive, so the sum is accurate to a few ulp for the
 * arguments a kernel needs (0 ≤ x ≤ β < 30); summing stops once a term no longer changes the sum.
 */
export function besselI0(x: number): number {
  const q = (x * x) / 4;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 500; k++) {
    term *= q / (k * k);
    const next = sum + term;
    if (next === sum) break;
    sum = next;
  }
  return sum;
}

/** C(u) = I0(β√(1 − (2u/W)²)) inside |u| ≤ W/2, zero outside. */
export function kaiserBessel(u: number, width: number, beta: number): number {
  const t = (2 * u) / width;
  const s = 1 - t * t;
  return s < 0 ? 0 : besselI0(beta * Math.sqrt(s));
}

/** ĉ(f), the Fourier transform of the unnormalised kernel C at f cycles per grid unit. */
export function kaiserBesselTransform(f: number, width: number, beta: number): number {
  const d = beta * beta - Math.PI * Math.PI * width * width * f * f;
  if (d > 0) {
    const r = Math.sqrt(d);
    return (width * Math.sinh(r)) / r;
  }
  if (d < 0) {
    const r = Math.sqrt(-d);
    return (width * Math.sin(r)) / r;
  }
  return width;
}
