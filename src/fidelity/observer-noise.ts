import { fft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';

/** Re⟨w, x⟩ = Σ (Re w·Re x + Im w·Im x): the output of a linear observer with template w. */
export function observerOutput(weights: ComplexImage, image: ComplexImage): number {
  const w = weights.data;
  const x = image.data;
  let s = 0;
  for (let i = 0; i < w.length; i++) s += w[i] * x[i];
  return s;
}

/**
 * Variance of Re⟨w, n⟩ estimated from noise replicas (reconstructions of the same data with
 * independent noise draws; Robson et al. 2008's pseudo-replica method, from memory): the sample
 * variance (divisor M − 1) of the observer output over the M replicas, so the replicas' common
 * mean (the noiseless reconstruction) drops out. Needs M ≥ 2. This is wᵀKw without forming K.
 * Its relative standard error for Gaussian noise is √(2/(M − 1)) (chi-square with M − 1 degrees of
 * freedom), i.e. ≈ 1/√(2(M − 1)) relative on a standard deviation or d'.
 */
export function replicaVariance(weights: ComplexImage, replicas: readonly ComplexImage[]): number {
  const m = replicas.length;
  if (m < 2) throw new RangeError(`need at least 2 noise replicas, got ${m}`);
  const outputs = replicas.map((x) => observerOutput(weights, x));
  const mean = outputs.reduce((a, b) => a + b, 0) / m;
  return outputs.reduce((a, v) => a + (v - mean) ** 2, 0) / (m - 1);
}

/**
 * Exact variance of Re⟨w, n⟩ for a zero-filled reconstruction with known k-space noise, σ per real
 * channel and white: the image noise is n = F_cᴴ(D ⊙ ν) with D = M (or M/p with density
 * compensation), so ⟨w, n⟩ = ⟨D ⊙ F_c w, ν⟩ and Var(Re⟨w, n⟩) = σ²·‖D ⊙ F_c w‖² (F_c unitary).
 * This is the "known σ" path: no replicas, but only for this linear method.
 */
export function zeroFilledVariance(
  weights: ComplexImage,
  mask: Uint8Array,
  sigma: number,
  density?: Float64Array,
): number {
  const k = fft2c(weights, createComplexImage(weights.nx, weights.ny));
  let s = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const d = density && density[i] > 0 ? 1 / density[i] : 1;
    s += d * d * (k.data[2 * i] ** 2 + k.data[2 * i + 1] ** 2);
  }
  return sigma * sigma * s;
}
