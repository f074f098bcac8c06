import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import type { NufftPlan } from '../nufft/nufft-plan.ts';
import type { FullAcquisition } from './full-acquisition.ts';
import { addComplexNoise, checkedSnr, type NoiseSpec, sigmaForSnr } from './noise.ts';

/**
 * y = A x + n on a non-Cartesian trajectory: for a phantom, its exact transform at every sample
 * point (no gridding in the forward model, no inverse crime); for pixels, the type-2 NUFFT of the
 * reference image (`inverseCrime` then says so). The noise is the Cartesian acquisition's: complex
 * Gaussian, σ per real channel from the same image-domain SNR (the NUFFT is scaled like the
 * orthonormal DFT, so one sample carries the noise of one grid sample), seeded by `seed`.
 */
export function acquireTrajectory(
  full: FullAcquisition,
  trajectory: Trajectory,
  plan: NufftPlan,
  noise: NoiseSpec | undefined,
  seed: number,
): { samples: Float64Array; sigma: number; inverseCrime: boolean } {
  const { kspaceAt } = full;
  const samples = kspaceAt ? kspaceAt(trajectory.kx, trajectory.ky) : plan.forward(full.reference);
  const snr = checkedSnr(noise);
  const sigma = snr === null ? 0 : sigmaForSnr(full.reference, full.objectMask, snr);
  if (sigma > 0) addComplexNoise(samples, sigma, seed);
  return { samples, sigma, inverseCrime: kspaceAt === undefined };
}
