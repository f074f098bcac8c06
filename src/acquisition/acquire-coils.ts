import type { CoilNoise } from '../coils/index.ts';
import { SeededRandom } from '../core/random.ts';
import type { CoilMaps, MultiCoilKspace } from '../encoding/index.ts';
import type { CoilSimulation } from './coil-simulation.ts';
import { checkedSnr, type NoiseSpec, sigmaForSnr } from './noise.ts';

export interface CoilAcquisition {
  /** Acquired coil k-space, prewhitened; zeros where not sampled. */
  kspace: MultiCoilKspace;
  /** The simulation's maps, prewhitened like the data. */
  maps: CoilMaps;
  /** The fully sampled noiseless coil k-space, prewhitened like the data (for noise replicas). */
  full: MultiCoilKspace;
  /** σ of the optimally combined fully sampled image (per real channel): mean |x_ref| over the object / SNR. */
  sigma: number;
  /** σ per real channel of each coil's receiver noise before prewhitening (the unit diagonal of Ψ). */
  coilSigma: number;
  /** False when Ψ = I exactly and the data were left as they are. */
  prewhitened: boolean;
}

/**
 * y_c = M ⊙ (y_full,c + n_c) with n ~ CN(0, 2σ_c²Ψ) across coils, then prewhitened (data and maps
 * multiplied by L⁻¹, Ψ = L·Lᴴ) so methods see white, independent coil noise.
 *
 * The requested SNR keeps its single-coil meaning (docs/design.md §3.5) for the optimally combined
 * fully sampled image x̂ = (SᴴΨ⁻¹S)⁻¹SᴴΨ⁻¹y (Roemer et al. 1990), whose noise per real channel at a
 * pixel is σ_c / √(sᴴΨ⁻¹s). σ_c is chosen so that the root-mean-square of that over the object equals
 * σ = mean |x_ref| over the object / SNR: σ_c = σ / √(mean_object 1/(sᴴΨ⁻¹s)). With maps normalised
 * to Σ|S_c|² = 1 and Ψ = I this is σ_c = σ, the single-coil value, so SNR means the same for 1 or 32 coils.
 * The noise is drawn from SeededRandom(seed) sample by sample, coil by coil, over the whole grid, so
 * a seed gives the same noise at a point whatever the mask.
 */
export function acquireCoils(
  simulation: CoilSimulation,
  mask: Uint8Array,
  noise: NoiseSpec | undefined,
  seed: number,
): CoilAcquisition {
  const { kspace: full, noise: model } = simulation;
  const { coils, nx, ny } = full;
  const n = nx * ny;
  if (mask.length !== n) throw new RangeError(`mask has ${mask.length} entries for a ${ny}×${nx} matrix`);
  const { maps, white, sigma, coilSigma } = coilNoiseLevels(simulation, noise);
  const noisy = { ...full, data: full.data.slice() };
  if (coilSigma > 0) model.addNoise(noisy, coilSigma, new SeededRandom(seed));
  const kspace = { coils, nx, ny, data: new Float64Array(noisy.data.length) };
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      if (!mask[i]) continue;
      const at = 2 * (c * n + i);
      kspace.data[at] = noisy.data[at];
      kspace.data[at + 1] = noisy.data[at + 1];
    }
  }
  const whitenedFull = { ...full, data: full.data.slice() };
  if (!white) {
    model.prewhiten(kspace);
    model.prewhiten(whitenedFull);
  }
  return { kspace, maps, full: whitenedFull, sigma, coilSigma, prewhitened: !white };
}

/**
 * The noise levels of a receive-array acquisition (see acquireCoils): the maps prewhitened (a copy),
 * whether Ψ = I exactly (prewhitening skipped), σ of the combined image and σ_c per coil.
 */
export function coilNoiseLevels(
  simulation: CoilSimulation,
  noise: NoiseSpec | undefined,
): { maps: CoilMaps; white: boolean; sigma: number; coilSigma: number } {
  const model = simulation.noise;
  const maps = { ...simulation.maps, data: simulation.maps.data.slice() };
  const white = whiteNoise(model);
  if (!white) model.prewhiten(maps);
  const snr = checkedSnr(noise);
  const sigma = snr === null ? 0 : sigmaForSnr(simulation.reference, simulation.objectMask, snr);
  const coilSigma = sigma > 0 ? sigma / Math.sqrt(meanInverseGain(maps, simulation.objectMask)) : 0;
  return { maps, white, sigma, coilSigma };
}

/** Ψ = I exactly: prewhitening would divide by ones, so it is skipped. */
function whiteNoise(model: CoilNoise): boolean {
  const { coils, covariance } = model;
  for (let a = 0; a < coils; a++) {
    for (let b = 0; b < coils; b++) {
      const at = 2 * (a * coils + b);
      if (covariance[at] !== (a === b ? 1 : 0) || covariance[at + 1] !== 0) return false;
    }
  }
  return true;
}

/** mean over the object of 1/(sᴴΨ⁻¹s), from prewhitened maps (sᴴΨ⁻¹s = Σ_c |S′_c|²). */
function meanInverseGain(whitenedMaps: CoilMaps, objectMask: Uint8Array): number {
  const { coils, nx, ny, data } = whitenedMaps;
  const n = nx * ny;
  let sum = 0;
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (!objectMask[i]) continue;
    let gain = 0;
    for (let c = 0; c < coils; c++) {
      const at = 2 * (c * n + i);
      gain += data[at] * data[at] + data[at + 1] * data[at + 1];
    }
    if (gain > 0) {
      sum += 1 / gain;
      count++;
    }
  }
  return count > 0 ? sum / count : 1;
}
