/**
 * Sampled one-dimensional Gaussian kernels, built once per (sigma, radius) and shared read-only.
 * Taps x = −radius…radius; g(x) = exp(−x²/(2σ²)) normalised to sum 1, and the second derivative
 * g''(x) = (x²/σ⁴ − 1/σ²)·g(x) using the same normalised g — the sampling scipy.ndimage uses for
 * gaussian_filter (order 0) and gaussian_laplace (order 2), which the reference fixtures rely on.
 */
const cache = new Map<string, Float64Array>();

export function gaussianKernel(sigma: number, radius: number): Float64Array {
  return cached('g', sigma, radius, () => normalisedGaussian(sigma, radius));
}

export function gaussianSecondDerivativeKernel(sigma: number, radius: number): Float64Array {
  return cached('g2', sigma, radius, () => {
    const g = normalisedGaussian(sigma, radius);
    const s2 = sigma * sigma;
    for (let t = -radius; t <= radius; t++) g[t + radius] *= (t * t) / (s2 * s2) - 1 / s2;
    return g;
  });
}

function normalisedGaussian(sigma: number, radius: number): Float64Array {
  if (!(sigma > 0) || !Number.isInteger(radius) || radius < 0) {
    throw new RangeError(
      `gaussian kernel needs sigma > 0 and an integer radius ≥ 0, got ${sigma}, ${radius}`,
    );
  }
  const k = new Float64Array(2 * radius + 1);
  let sum = 0;
  for (let t = -radius; t <= radius; t++) {
    k[t + radius] = Math.exp((-0.5 * t * t) / (sigma * sigma));
    sum += k[t + radius];
  }
  for (let i = 0; i < k.length; i++) k[i] /= sum;
  return k;
}

function cached(kind: string, sigma: number, radius: number, build: () => Float64Array): Float64Array {
  const key = `${kind}:${sigma}:${radius}`;
  let k = cache.get(key);
  if (!k) {
    k = build();
    cache.set(key, k);
  }
  return k;
}
