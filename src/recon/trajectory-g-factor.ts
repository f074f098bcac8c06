import { summariseGFactor } from '../coils/index.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import { throwIfAborted } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import { SeededRandom } from '../core/random.ts';
import type { CoilMaps, CoilSamples } from '../encoding/index.ts';
import { csTv } from './cs-tv.ts';
import type { GFactorResult } from './g-factor.ts';
import { griddingImage } from './gridding-recon.ts';
import type { ReconInput, TrajectoryData } from './method.ts';
import { checkReplicaCount, PixelSpread } from './pixel-spread.ts';
import type { MethodSpec } from './registry.ts';
import { prepareTrajectorySense } from './sense-trajectory.ts';

export interface TrajectoryGFactorRequest {
  /** The base run's input: prewhitened coil samples on a trajectory, with the maps. */
  input: ReconInput & { trajectory: TrajectoryData };
  method: MethodSpec;
  /** The base run's info: its λ and iteration count are what the replicas reuse. */
  baseInfo: Record<string, unknown>;
  /** Noise per real channel of each prewhitened sample (white, independent across coils). */
  sigma: number;
  /** R against the Nyquist trajectory (sampled.acceleration.actual). */
  acceleration: number;
  support: Uint8Array;
  replicas: number;
  seed: number;
  limits: Limits;
  signal?: AbortSignal;
}

/**
 * Pseudo-replica g-factor of a receive-array reconstruction on a trajectory (Robson et al. 2008):
 * M white noise draws of σ are added to the acquired samples, each sum is reconstructed by the base
 * run's method with its maps, λ and iteration count fixed (no tolerance stop), and
 *   g = σ_accelerated / (σ_full · √R)
 * per pixel. The fully sampled reference is the Cartesian scan of the whole grid combined with the
 * known maps, whose noise is known in closed form: σ_full = σ / √(Σ_c |S_c|²) per real channel
 * (prewhitened maps; the Roemer combination; √2 times that for the modulus of complex noise, which
 * the replicas' spread measures), so no reference replicas are drawn. R is the trajectory's acceleration
 * against its Nyquist design. Gridding (zero-filled) carries the trajectory's own density
 * weighting, so its g includes the noise cost of the non-uniform density, not only of undersampling.
 */
export function trajectoryGFactor(request: TrajectoryGFactorRequest): GFactorResult {
  const { input, sigma, replicas, seed, support, signal, acceleration } = request;
  const maps = input.coils?.maps;
  if (!maps) throw new RangeError('a trajectory g-factor needs the maps of the data');
  checkReplicaCount(replicas);
  const reconstruct = trajectoryReplicaReconstructor(request);
  const { nx, ny } = input.trajectory.plan;
  const n = nx * ny;
  const acquired = input.trajectory.samples;
  const replica: CoilSamples = { coils: acquired.coils, data: new Float64Array(acquired.data.length) };
  const random = new SeededRandom(seed);
  const spread = new PixelSpread(n);
  for (let k = 0; k < replicas; k++) {
    throwIfAborted(signal);
    for (let i = 0; i < replica.data.length; i++)
      replica.data[i] = acquired.data[i] + sigma * random.normal();
    spread.add(reconstruct(replica).data);
  }
  const sd = spread.standardDeviation();
  // The spread is of complex pixels, E|n|² = 2σ² per real channel σ: compare like with like.
  const full = fullScanNoise(maps, spread.complex ? Math.SQRT2 * sigma : sigma);
  const root = Math.sqrt(acceleration);
  const map = new Float64Array(n);
  for (let i = 0; i < n; i++) if (full[i] > 0) map[i] = sd[i] / (full[i] * root);
  return {
    ...summariseGFactor(map, support),
    method: 'pseudo-replica',
    replicas,
    map,
    monteCarloError: 1 / Math.sqrt((spread.complex ? 2 : 1) * (replicas - 1)),
  };
}

/** σ / √(Σ_c |S_c|²) per pixel: the noise of the optimally combined fully sampled Cartesian scan. */
function fullScanNoise(maps: CoilMaps, sigma: number): Float64Array {
  const n = maps.nx * maps.ny;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let power = 0;
    for (let c = 0; c < maps.coils; c++) {
      const at = 2 * (c * n + i);
      power += maps.data[at] ** 2 + maps.data[at + 1] ** 2;
    }
    out[i] = power > 0 ? sigma / Math.sqrt(power) : 0;
  }
  return out;
}

/** The base run's reconstruction with everything but the samples fixed. */
function trajectoryReplicaReconstructor(
  request: TrajectoryGFactorRequest,
): (samples: CoilSamples) => ComplexImage {
  const { input, method, baseInfo, limits } = request;
  const ran =
    typeof baseInfo.iterations === 'number' && baseInfo.iterations > 0 ? baseInfo.iterations : undefined;
  const withSamples = (samples: CoilSamples) => ({ ...input, trajectory: { ...input.trajectory, samples } });
  switch (method.name) {
    case 'zero-filled':
      return (samples) => griddingImage({ ...input.trajectory, samples }, input.coils?.maps).image;
    case 'sense': {
      const prepared = prepareTrajectorySense(input, input.trajectory, method, limits);
      const iterations = ran ?? prepared.iterationLimit;
      return (samples) => prepared.solve(samples, { iterations, tolerance: 0 }).image;
    }
    case 'cs-tv': {
      const lambda = typeof baseInfo.lambda === 'number' ? baseInfo.lambda : method.lambda;
      const spec = { ...method, lambda, iterations: ran ?? method.iterations, tolerance: 0 };
      return (samples) => csTv.run(withSamples(samples), spec, { limits }).image;
    }
    default:
      throw new RangeError(`${method.name} has no trajectory form (refused before the g-factor)`);
  }
}
