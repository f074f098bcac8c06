import { fft2c, ifft2c } from '../core/centered-fft.ts';
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

/**
 * The zero-filled noise covariance as a kernel: with F_c the centred orthonormal DFT and D = M (or
 * M/p), P = F_cᴴ D² F_c is circulant, P_ab = (1/N)·Σ_k D²_k e^(i2π(k − c)·(a − b)/N), which is
 * ifft2c(D²) at c + (a − b) divided by √N. One inverse FFT serves every observer of one mask.
 */
export function zeroFilledNoiseKernel(
  mask: Uint8Array,
  nx: number,
  ny: number,
  density?: Float64Array,
): ComplexImage {
  const d2 = createComplexImage(nx, ny);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const d = density && density[i] > 0 ? 1 / density[i] : 1;
    d2.data[2 * i] = d * d;
  }
  const kernel = ifft2c(d2, d2);
  const scale = 1 / Math.sqrt(nx * ny);
  for (let i = 0; i < kernel.data.length; i++) kernel.data[i] *= scale;
  return kernel;
}

/** Row-major indices where a weights image is non-zero. */
export function weightSupport(weights: ComplexImage): Int32Array {
  const out: number[] = [];
  const w = weights.data;
  for (let i = 0; i < w.length / 2; i++) if (w[2 * i] !== 0 || w[2 * i + 1] !== 0) out.push(i);
  return Int32Array.from(out);
}

/**
 * σ²·Re(wᴴ P w) over the support of w with the kernel of zeroFilledNoiseKernel: the same value as
 * zeroFilledVariance without a transform per observer, for observers of small support (|support|²
 * pairs).
 */
export function kernelVariance(
  weights: ComplexImage,
  support: Int32Array,
  kernel: ComplexImage,
  sigma: number,
): number {
  const { nx, ny } = weights;
  const cy = Math.floor(ny / 2);
  const cx = Math.floor(nx / 2);
  const w = weights.data;
  const p = kernel.data;
  let q = 0;
  for (const a of support) {
    const ra = Math.floor(a / nx);
    const ca = a - ra * nx;
    const ar = w[2 * a];
    const ai = w[2 * a + 1];
    for (const b of support) {
      const rb = Math.floor(b / nx);
      const cb = b - rb * nx;
      const row = (((cy + ra - rb) % ny) + ny) % ny;
      const col = (((cx + ca - cb) % nx) + nx) % nx;
      const k = 2 * (row * nx + col);
      // Re(conj(w_a)·P_ab·w_b)
      const pr = p[k] * w[2 * b] - p[k + 1] * w[2 * b + 1];
      const pi = p[k] * w[2 * b + 1] + p[k + 1] * w[2 * b];
      q += ar * pr + ai * pi;
    }
  }
  return sigma * sigma * q;
}
