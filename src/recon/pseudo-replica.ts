import { type CoilNoise, type GFactorSummary, summariseGFactor } from '../coils/index.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import { throwIfAborted, ValidationError } from '../core/errors.ts';
import { SeededRandom } from '../core/random.ts';
import { createMultiCoilArray, type MultiCoilKspace } from '../encoding/index.ts';
import { checkReplicaCount, PixelSpread } from './pixel-spread.ts';

/** A reconstruction with everything but the data fixed (maps, λ, iteration count, kernels). */
export type ReplicaReconstruction = (kspace: MultiCoilKspace, mask: Uint8Array) => ComplexImage;

export interface PseudoReplicaOptions {
  /** The acquired coil k-space (zeros where not sampled), with or without noise. */
  acquired: MultiCoilKspace;
  mask: Uint8Array;
  /** The fully sampled coil k-space of the same object: the reference the √R is measured against. */
  full: MultiCoilKspace;
  /**
   * The same reconstruction as the base run, for any mask: it must reuse the base run's λ and
   * iteration count (no tolerance stop) and its calibration (maps, kernels), so that every replica
   * is reconstructed by the same operator.
   */
  reconstruct: ReplicaReconstruction;
  /** Noise per real channel of each complex sample (docs/design.md §3.5). */
  sigma: number;
  /** Coil noise covariance Ψ; white (Ψ = I) when absent, as for prewhitened data. */
  noise?: CoilNoise;
  replicas: number;
  seed: number;
  /** Pixels the summary covers (the object, 1 = inside). */
  support: Uint8Array;
  signal?: AbortSignal;
}

export interface PseudoReplicaResult {
  /** g per pixel, row-major ny·nx; 0 where the fully sampled reconstruction has no noise. */
  map: Float64Array;
  summary: GFactorSummary;
  replicas: number;
  /** Approximate relative standard error of g at one pixel from the replica count (see below). */
  monteCarloError: number;
  /** R = grid points / acquired points (for line masks: lines / acquired lines). */
  acceleration: number;
}

/**
 * Pseudo multiple replicas (Robson et al. 2008) for any reconstruction: M noise draws n_k are added
 * to the acquired data and, separately, to the fully sampled data, each sum is reconstructed, and
 * per pixel the noise standard deviation across the replicas, σ² = Σ_k |x_k − x̄|² / (M − 1), gives
 *   g = σ_accelerated / (σ_full · √R),
 * the noise the undersampled reconstruction adds beyond the √R of the shorter scan. This is the
 * noise-only form: it equals the SNR form g = SNR_full / (SNR_accelerated·√R) when the reconstruction
 * keeps the object's scale (SENSE, GRAPPA); zero-filled uniform undersampling scales the object by
 * 1/R as well, so its noise-only g is 1/R, not 1. Noise: n = σ·L·z per sample (Ψ = L·Lᴴ, CoilNoise),
 * drawn from SeededRandom(seed), accelerated replicas first (white noise at the acquired samples
 * only, coil by coil); unacquired samples are zeroed.
 * monteCarloError: the std from M replicas has relative standard error ≈ 1/√(2ν), ν = 2(M − 1)
 * degrees of freedom for complex images and M − 1 for real ones (root-sum-of-squares), and g is a
 * ratio of two such estimates: √(2/(2ν)) = 1/√ν.
 */
export function pseudoReplicaGFactor(options: PseudoReplicaOptions): PseudoReplicaResult {
  const { acquired, mask, full, reconstruct, sigma, noise, replicas, seed, support, signal } = options;
  const { coils, nx, ny } = acquired;
  const n = nx * ny;
  checkReplicaCount(replicas);
  if (!(sigma > 0) || !Number.isFinite(sigma)) {
    throw new ValidationError({
      field: 'noise.snr',
      message: 'pseudo-replicas need a positive noise level σ',
      allowed: 'a finite SNR (not "none")',
    });
  }
  if (full.coils !== coils || full.nx !== nx || full.ny !== ny || mask.length !== n || support.length !== n) {
    throw new RangeError('acquired, full, mask and support must share one coils × ny × nx grid');
  }
  let acquiredCount = 0;
  for (let i = 0; i < n; i++) if (mask[i]) acquiredCount++;
  if (acquiredCount === 0) throw new RangeError('the mask acquires nothing');
  const acceleration = n / acquiredCount;
  const fullMask = new Uint8Array(n).fill(1);
  const correlated = noise ?? null;
  const random = new SeededRandom(seed);
  const replica = createMultiCoilArray(coils, nx, ny);

  const spread = (data: MultiCoilKspace, sampled: Uint8Array): { sd: Float64Array; complex: boolean } => {
    const images = new PixelSpread(n);
    for (let k = 0; k < replicas; k++) {
      throwIfAborted(signal);
      replica.data.set(data.data);
      if (correlated) correlated.addNoise(replica, sigma, random);
      const d = replica.data;
      for (let c = 0; c < coils; c++) {
        for (let i = 0; i < n; i++) {
          const at = 2 * (c * n + i);
          if (!sampled[i]) {
            d[at] = 0;
            d[at + 1] = 0;
          } else if (!correlated) {
            // White noise is drawn at the acquired samples only (the draws dominate the cost).
            d[at] += sigma * random.normal();
            d[at + 1] += sigma * random.normal();
          }
        }
      }
      images.add(reconstruct(replica, sampled).data);
    }
    return { sd: images.standardDeviation(), complex: images.complex };
  };

  const accelerated = spread(acquired, mask);
  const reference = spread(full, fullMask);
  const map = new Float64Array(n);
  const root = Math.sqrt(acceleration);
  for (let i = 0; i < n; i++) {
    if (reference.sd[i] > 0) map[i] = accelerated.sd[i] / (reference.sd[i] * root);
  }
  const dof = (accelerated.complex || reference.complex ? 2 : 1) * (replicas - 1);
  return {
    map,
    summary: summariseGFactor(map, support),
    replicas,
    monteCarloError: 1 / Math.sqrt(dof),
    acceleration,
  };
}
