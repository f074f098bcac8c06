import type { ComplexImage } from '../core/complex-image.ts';
import type { NufftPlan } from './nufft-plan.ts';

/**
 * Gridding reconstruction (Jackson et al. 1991): the adjoint NUFFT of the density-compensated
 * samples, x̂ = Aᴴ(w ⊙ y), with the deapodisation inside Aᴴ. With w the k-space area per sample in
 * (cycles per FOV)² (radialRampWeights, pipeMenonWeights) and A scaled like fft2c, a full Cartesian
 * grid with w = 1 gives back ifft2c(y) exactly.
 */
export function griddingReconstruction(
  plan: NufftPlan,
  samples: Float64Array,
  weights: Float64Array,
  out?: ComplexImage,
): ComplexImage {
  if (samples.length !== 2 * plan.count || weights.length !== plan.count) {
    throw new RangeError(
      `need ${plan.count} samples and weights, got ${samples.length / 2} and ${weights.length}`,
    );
  }
  const weighted = new Float64Array(samples.length);
  for (let p = 0; p < plan.count; p++) {
    weighted[2 * p] = samples[2 * p] * weights[p];
    weighted[2 * p + 1] = samples[2 * p + 1] * weights[p];
  }
  return plan.adjoint(weighted, out);
}
