/**
 * Orthogonal Daubechies filters dbN (N vanishing moments, 2N taps), computed by the spectral
 * factorisation of Daubechies 1988 (Ten Lectures on Wavelets, 1992, §6.1):
 *   |m0(ξ)|² = cos^{2N}(ξ/2) · P(sin²(ξ/2)),   P(y) = Σ_{k<N} C(N−1+k, k) yᵏ.
 * Each root y_j of P gives z_j from y = (2 − z − 1/z)/4; keeping the roots inside the unit circle
 * (the extremal-phase choice) gives H(z) = c·(1 + z)ᴺ·Π (z − z_j), normalised to Σh = √2.
 * Computed once per order and cached (plans cached per size, as for the FFT).
 *
 * Conventions follow PyWavelets: `recLo` is h (the scaling filter, largest taps first for the
 * extremal phase), `decLo` its reverse, `recHi[k] = (−1)ᵏ·h[F−1−k]` and `decHi` its reverse.
 */
export interface WaveletFilters {
  readonly name: string;
  /** Number of taps F = 2N. */
  readonly length: number;
  readonly decLo: Float64Array;
  readonly decHi: Float64Array;
  readonly recLo: Float64Array;
  readonly recHi: Float64Array;
}

export const DAUBECHIES_ORDERS = [1, 2, 3, 4, 5, 6, 7, 8] as const;
export type WaveletName = `db${(typeof DAUBECHIES_ORDERS)[number]}`;
export const WAVELET_NAMES: readonly WaveletName[] = DAUBECHIES_ORDERS.map((n) => `db${n}` as WaveletName);

const cache = new Map<string, WaveletFilters>();

/** Filters of `db1` (Haar) … `db8`; RangeError for any other name (a programming mistake). */
export function daubechiesFilters(name: string): WaveletFilters {
  const cached = cache.get(name);
  if (cached) return cached;
  const order = WAVELET_NAMES.indexOf(name as WaveletName) + 1;
  if (order < 1) throw new RangeError(`unknown wavelet ${name}; expected one of ${WAVELET_NAMES.join(', ')}`);
  const h = scalingFilter(order);
  const f = h.length;
  const recLo = Float64Array.from(h);
  const decLo = Float64Array.from(h).reverse();
  const recHi = new Float64Array(f);
  for (let k = 0; k < f; k++) recHi[k] = (k % 2 === 0 ? 1 : -1) * h[f - 1 - k];
  const decHi = Float64Array.from(recHi).reverse();
  const filters: WaveletFilters = { name, length: f, decLo, decHi, recLo, recHi };
  cache.set(name, filters);
  return filters;
}

type Complex = [number, number];

function mul(a: Complex, b: Complex): Complex {
  return [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
}

function div(a: Complex, b: Complex): Complex {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
}

function csqrt(a: Complex): Complex {
  const r = Math.hypot(a[0], a[1]);
  const re = Math.sqrt((r + a[0]) / 2);
  const im = Math.sqrt(Math.max(0, (r - a[0]) / 2));
  return [re, a[1] < 0 ? -im : im];
}

/** Value of Σ c_k zᵏ and of its derivative (Horner). */
function evaluate(coefficients: number[], z: Complex): { value: Complex; slope: Complex } {
  let value: Complex = [0, 0];
  let slope: Complex = [0, 0];
  for (let k = coefficients.length - 1; k >= 0; k--) {
    slope = mul(slope, z);
    slope = [slope[0] + value[0], slope[1] + value[1]];
    value = mul(value, z);
    value = [value[0] + coefficients[k], value[1]];
  }
  return { value, slope };
}

/**
 * Roots of Σ c_k yᵏ by the Weierstrass (Durand–Kerner) iteration, then Newton polishing. The
 * degrees here are at most 7 with well-separated roots, for which both converge to rounding.
 */
function polynomialRoots(coefficients: number[]): Complex[] {
  const degree = coefficients.length - 1;
  const lead = coefficients[degree];
  const monic = coefficients.map((c) => c / lead);
  const roots: Complex[] = [];
  for (let k = 0; k < degree; k++) {
    // Start points on a circle, off the real axis (a common choice: powers of 0.4 + 0.9i).
    let p: Complex = [1, 0];
    for (let j = 0; j <= k; j++) p = mul(p, [0.4, 0.9]);
    roots.push(p);
  }
  for (let it = 0; it < 500; it++) {
    let shift = 0;
    for (let k = 0; k < degree; k++) {
      let denominator: Complex = [1, 0];
      for (let j = 0; j < degree; j++) {
        if (j !== k) denominator = mul(denominator, [roots[k][0] - roots[j][0], roots[k][1] - roots[j][1]]);
      }
      const step = div(evaluate(monic, roots[k]).value, denominator);
      roots[k] = [roots[k][0] - step[0], roots[k][1] - step[1]];
      shift = Math.max(shift, Math.hypot(step[0], step[1]));
    }
    if (shift < 1e-16) break;
  }
  for (let k = 0; k < degree; k++) {
    for (let it = 0; it < 3; it++) {
      const { value, slope } = evaluate(monic, roots[k]);
      if (value[0] === 0 && value[1] === 0) break;
      const step = div(value, slope);
      roots[k] = [roots[k][0] - step[0], roots[k][1] - step[1]];
    }
  }
  return roots;
}

function binomial(n: number, k: number): number {
  let c = 1;
  for (let j = 1; j <= k; j++) c = (c * (n - k + j)) / j;
  return c;
}

function scalingFilter(order: number): number[] {
  // P(y) = Σ_{k<N} C(N−1+k, k) yᵏ (Daubechies 1992, eq. 6.1.12).
  const p: number[] = [];
  for (let k = 0; k < order; k++) p.push(binomial(order - 1 + k, k));
  // Product polynomial, coefficients of z⁰, z¹, … as complex numbers.
  let product: Complex[] = [[1, 0]];
  const multiplyBy = (root: Complex): void => {
    const next: Complex[] = product.map(() => [0, 0] as Complex);
    next.push([0, 0]);
    for (let j = 0; j < product.length; j++) {
      next[j + 1][0] += product[j][0];
      next[j + 1][1] += product[j][1];
      const t = mul(product[j], root);
      next[j][0] -= t[0];
      next[j][1] -= t[1];
    }
    product = next;
  };
  for (let k = 0; k < order; k++) multiplyBy([-1, 0]); // (1 + z)ᴺ
  if (order > 1) {
    for (const y of polynomialRoots(p)) {
      // z² − (2 − 4y) z + 1 = 0; the two roots are z and 1/z: keep the one inside the unit circle.
      const b: Complex = [1 - 2 * y[0], -2 * y[1]];
      const d = csqrt([b[0] * b[0] - b[1] * b[1] - 1, 2 * b[0] * b[1]]);
      const z1: Complex = [b[0] + d[0], b[1] + d[1]];
      const z2: Complex = [b[0] - d[0], b[1] - d[1]];
      multiplyBy(Math.hypot(z1[0], z1[1]) < 1 ? z1 : z2);
    }
  }
  const real = product.map((c) => c[0]);
  const sum = real.reduce((a, b) => a + b, 0);
  // Extremal phase: zeros inside the unit circle make the coefficients of z⁰… the small end, so the
  // largest taps come last; reversing puts them first, as Daubechies tabulates h.
  return real.map((c) => (c * Math.SQRT2) / sum).reverse();
}
