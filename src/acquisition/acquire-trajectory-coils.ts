import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import { createComplexImage } from '../core/complex-image.ts';
import { SeededRandom } from '../core/random.ts';
import { type CoilMaps, type CoilSamples, sensitivityProduct } from '../encoding/index.ts';
import type { NufftPlan } from '../nufft/nufft-plan.ts';
import { coilNoiseLevels } from './acquire-coils.ts';
import type { CoilSimulation } from './coil-simulation.ts';
import type { NoiseSpec } from './noise.ts';

export interface TrajectoryCoilAcquisition {
  /** Samples of every coil at the trajectory points (coil-major, `plan.count` per coil), prewhitened. */
  samples: CoilSamples;
  /** The simulation's maps, prewhitened like the samples. */
  maps: CoilMaps;
  /** The noiseless samples, prewhitened like the data (for noise replicas). */
  full: CoilSamples;
  /** σ of the optimally combined fully sampled image, per real channel (as acquireCoils). */
  sigma: number;
  /** Whether samples and maps were multiplied by L⁻¹ (Ψ = L·Lᴴ; false when Ψ = I). */
  prewhitened: boolean;
  /** σ per real channel of each coil before prewhitening. */
  coilSigma: number;
  /** True when the samples are the NUFFT of pixels (uploads, rasters): the inverse crime. */
  inverseCrime: boolean;
}

/**
 * The receive-array acquisition on a non-Cartesian trajectory: y_c = A(S_c·f) + n_c at the exact
 * trajectory points. Analytic phantoms: each coil's exact transform at the points (the shifted
 * phantom transforms of the trigonometric fit, CoilSimulation.kspaceAt; no gridding in the forward
 * model). Pixel sources: the type-2 NUFFT of S_c·x (`inverseCrime`). Noise and prewhitening are
 * acquireCoils': n ~ CN(0, 2σ_c²Ψ) drawn sample by sample, coil by coil, from SeededRandom(seed),
 * σ_c chosen so the combined image keeps the requested SNR; data and maps are then multiplied by
 * L⁻¹. One coil with S = 1 (Ψ = [1]) gives acquireTrajectory's samples bit for bit.
 */
export function acquireTrajectoryCoils(
  simulation: CoilSimulation,
  trajectory: Trajectory,
  plan: NufftPlan,
  noise: NoiseSpec | undefined,
  seed: number,
): TrajectoryCoilAcquisition {
  const { coils } = simulation.maps;
  const count = plan.count;
  const exact = simulation.kspaceAt?.(trajectory.kx, trajectory.ky) ?? nufftOfCoilImages(simulation, plan);
  const { maps, white, sigma, coilSigma } = coilNoiseLevels(simulation, noise);
  const model = simulation.noise;
  // The noise model works on coil-major planes: the samples are one plane of `count` points.
  const asPlane = (data: Float64Array) => ({ coils, nx: count, ny: 1, data });
  const noisy = asPlane(exact.slice());
  if (coilSigma > 0) model.addNoise(noisy, coilSigma, new SeededRandom(seed));
  const full = asPlane(exact);
  if (!white) {
    model.prewhiten(noisy);
    model.prewhiten(full);
  }
  return {
    samples: { coils, data: noisy.data },
    maps,
    full: { coils, data: full.data },
    sigma,
    coilSigma,
    prewhitened: !white,
    inverseCrime: simulation.kspaceAt === undefined,
  };
}

/** A(S_c·x) for every coil of a pixel source, coil-major. */
function nufftOfCoilImages(simulation: CoilSimulation, plan: NufftPlan): Float64Array {
  const { maps, object } = simulation;
  if (!object) throw new RangeError('a simulation without kspaceAt must carry its object');
  const count = plan.count;
  const out = new Float64Array(2 * maps.coils * count);
  const coilImage = createComplexImage(maps.nx, maps.ny);
  for (let c = 0; c < maps.coils; c++) {
    sensitivityProduct(maps, c, object.data, coilImage.data, 0);
    plan.forward(coilImage, out.subarray(2 * c * count, 2 * (c + 1) * count));
  }
  return out;
}
