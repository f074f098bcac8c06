import { ValidationError } from '../core/errors.ts';

/**
 * The per-pixel standard deviation of a series of complex images (noise replicas), by Welford's
 * running mean and sum of squared deviations: σ² = Σ_k |x_k − x̄|² / (M − 1).
 */
export class PixelSpread {
  private readonly mean: Float64Array;
  private readonly m2: Float64Array;
  private count = 0;
  /** True once any image had a non-zero imaginary part (complex images: 2 degrees of freedom per draw). */
  complex = false;

  constructor(pixels: number) {
    this.mean = new Float64Array(2 * pixels);
    this.m2 = new Float64Array(pixels);
  }

  add(x: Float64Array): void {
    const { mean, m2 } = this;
    const k = ++this.count;
    for (let i = 0; i < m2.length; i++) {
      const re = x[2 * i];
      const im = x[2 * i + 1];
      if (im !== 0) this.complex = true;
      const dr = re - mean[2 * i];
      const di = im - mean[2 * i + 1];
      mean[2 * i] += dr / k;
      mean[2 * i + 1] += di / k;
      m2[i] += dr * (re - mean[2 * i]) + di * (im - mean[2 * i + 1]);
    }
  }

  standardDeviation(): Float64Array {
    const sd = new Float64Array(this.m2.length);
    const dof = Math.max(1, this.count - 1);
    for (let i = 0; i < sd.length; i++) sd[i] = Math.sqrt(Math.max(0, this.m2[i]) / dof);
    return sd;
  }
}

/** The replica count a spread can be measured from (`gFactor.replicas`): an integer of at least 2. */
export function checkReplicaCount(replicas: number): void {
  if (!Number.isInteger(replicas) || replicas < 2) {
    throw new ValidationError({
      field: 'gFactor.replicas',
      message: `a standard deviation needs at least 2 replicas, got ${replicas}`,
      allowed: 'integer ≥ 2',
    });
  }
}
