import { type CoilNoise, senseGFactorMap, summariseGFactor } from '../coils/index.ts';
import type { Limits } from '../core/limits.ts';
import { createMultiCoilArray, type MultiCoilKspace } from '../encoding/index.ts';
import { coilImages, combineCoilImages } from './coil-combination.ts';
import { csTv } from './cs-tv.ts';
import { csWavelet } from './cs-wavelet.ts';
import { prepareGrappa } from './grappa.ts';
import { lowrankHankel } from './lowrank-hankel.ts';
import type { ReconInput } from './method.ts';
import { pseudoReplicaGFactor, type ReplicaReconstruction } from './pseudo-replica.ts';
import type { MethodSpec } from './registry.ts';
import { coilKspaceOf, prepareSense } from './sense.ts';
import { zeroFilledImage } from './zero-filled.ts';

/** Replicas gFactorFor draws when the caller gives no count. */
export const DEFAULT_G_REPLICAS = 20;

export interface GFactorResult {
  mean: number;
  p95: number;
  max: number;
  method: 'analytic' | 'pseudo-replica';
  /** Noise replicas drawn (0 for the analytic map). */
  replicas: number;
  /** g per pixel, row-major ny·nx. */
  map: Float64Array;
  /** Relative standard error of g at one pixel (pseudo-replica only). */
  monteCarloError?: number;
}

/**
 * R when the mask is uniform Cartesian undersampling in the sense of the analytic SENSE g-factor:
 * whole rows, exactly the rows i ≡ i₀ (mod R) for an integer R that divides ny (no ACS lines added);
 * otherwise null.
 */
export function uniformCartesianAcceleration(mask: Uint8Array, nx: number, ny: number): number | null {
  const rows: number[] = [];
  for (let i = 0; i < ny; i++) {
    let count = 0;
    for (let j = 0; j < nx; j++) if (mask[i * nx + j]) count++;
    if (count === nx) rows.push(i);
    else if (count !== 0) return null;
  }
  if (rows.length === 0 || ny % rows.length !== 0) return null;
  const R = ny / rows.length;
  for (let k = 0; k < rows.length; k++) if (rows[k] !== rows[0] + k * R) return null;
  return R;
}

/**
 * The base run's reconstruction with everything but the data fixed, for noise replicas: SENSE
 * with its maps and λ and exactly the base run's iteration count (no tolerance stop); GRAPPA with
 * the kernels trained on the base data; zero-filled as it is (density compensation only on the
 * base mask); cs-tv and lowrank-hankel (single coil) with the base run's λ and iteration count.
 */
export function replicaReconstructor(
  input: ReconInput,
  method: MethodSpec,
  baseInfo: Record<string, unknown>,
  limits: Limits,
): ReplicaReconstruction {
  const maps = input.coils?.maps;
  const ran =
    typeof baseInfo.iterations === 'number' && baseInfo.iterations > 0 ? baseInfo.iterations : undefined;
  const asInput = (kspace: MultiCoilKspace, mask: Uint8Array): ReconInput => {
    const plane = { nx: kspace.nx, ny: kspace.ny, data: kspace.data.subarray(0, 2 * kspace.nx * kspace.ny) };
    const density = mask === input.mask ? input.density : undefined;
    return input.coils
      ? { kspace: plane, mask, density, coils: { kspace, ...(maps ? { maps } : {}) } }
      : { kspace: plane, mask, density };
  };
  switch (method.name) {
    case 'sense': {
      const prepared = prepareSense(input, method, limits);
      const iterations = ran ?? prepared.iterationLimit;
      return (kspace, mask) => prepared.solve(kspace, mask, { iterations, tolerance: 0 }).image;
    }
    case 'grappa': {
      const prepared = prepareGrappa(input, method);
      return (kspace, mask) => combineCoilImages(coilImages(prepared.fill(kspace, mask)), maps).image;
    }
    case 'zero-filled':
      return (kspace, mask) =>
        zeroFilledImage(asInput(kspace, mask), method.densityCompensation ?? false).image;
    case 'cs-tv': {
      const lambda = typeof baseInfo.lambda === 'number' ? baseInfo.lambda : method.lambda;
      const spec = { ...method, lambda, iterations: ran ?? method.iterations, tolerance: 0 };
      return (kspace, mask) => csTv.run(asInput(kspace, mask), spec, { limits }).image;
    }
    case 'cs-wavelet': {
      const lambda = typeof baseInfo.lambda === 'number' ? baseInfo.lambda : method.lambda;
      const tvLambda = typeof baseInfo.tvLambda === 'number' ? baseInfo.tvLambda : method.tvLambda;
      const spec = { ...method, lambda, tvLambda, iterations: ran ?? method.iterations, tolerance: 0 };
      return (kspace, mask) => csWavelet.run(asInput(kspace, mask), spec, { limits }).image;
    }
    case 'lowrank-hankel': {
      const spec = { ...method, iterations: ran ?? method.iterations, tolerance: 0 };
      return (kspace, mask) => lowrankHankel.run(asInput(kspace, mask), spec, { limits }).image;
    }
  }
}

export interface GFactorRequest {
  /** The base run's input (coil data prewhitened, so the noise is white). */
  input: ReconInput;
  method: MethodSpec;
  /** The base run's `info` (its iteration count and λ are reused by the replicas). */
  baseInfo: Record<string, unknown>;
  /** Fully sampled coil k-space of the same object (single coil: one plane), for the reference noise. */
  full: MultiCoilKspace;
  /** Noise per real channel (docs/design.md §3.5). */
  sigma: number;
  /** The object: pixels the summary covers. */
  support: Uint8Array;
  replicas?: number;
  seed: number;
  /** Ψ when the data are not prewhitened (default white). */
  noise?: CoilNoise;
  limits: Limits;
  signal?: AbortSignal;
}

/**
 * The g-factor of a reconstruction over the object. `analytic` for SENSE on uniform Cartesian
 * undersampling with R ≤ coils (senseGFactorMap with the maps the reconstruction uses, each fold
 * over the pixels where those maps are non-zero, Ψ = I for prewhitened data); `pseudo-replica`
 * (pseudoReplicaGFactor, Robson et al. 2008) for every other method and mask, with the base run's
 * reconstruction fixed by replicaReconstructor. Summary: mean, p95 and max over `support`.
 */
export function gFactorFor(request: GFactorRequest): GFactorResult {
  const { input, method, support, limits } = request;
  const { nx, ny } = input.kspace;
  if (method.name === 'sense') {
    const R = uniformCartesianAcceleration(input.mask, nx, ny);
    const coils = input.coils ? input.coils.kspace.coils : 1;
    if (R !== null && R <= coils) {
      const prepared = prepareSense(input, method, limits);
      const maps = prepared.maps ?? uniformMap(nx, ny);
      const map = senseGFactorMap(maps, R, { support: mapSupport(maps), noiseLower: request.noise?.lower });
      return { ...summariseGFactor(map, support), method: 'analytic', replicas: 0, map };
    }
  }
  const result = pseudoReplicaGFactor({
    acquired: coilKspaceOf(input),
    mask: input.mask,
    full: request.full,
    reconstruct: replicaReconstructor(input, method, request.baseInfo, limits),
    sigma: request.sigma,
    noise: request.noise,
    replicas: request.replicas ?? DEFAULT_G_REPLICAS,
    seed: request.seed,
    support,
    signal: request.signal,
  });
  return {
    ...result.summary,
    method: 'pseudo-replica',
    replicas: result.replicas,
    map: result.map,
    monteCarloError: result.monteCarloError,
  };
}

function uniformMap(nx: number, ny: number): MultiCoilKspace {
  const maps = createMultiCoilArray(1, nx, ny);
  for (let i = 0; i < nx * ny; i++) maps.data[2 * i] = 1;
  return maps;
}

/** Pixels where any coil's sensitivity is non-zero (ACS maps are 0 outside their support). */
function mapSupport(maps: MultiCoilKspace): Uint8Array {
  const n = maps.nx * maps.ny;
  const support = new Uint8Array(n);
  for (let c = 0; c < maps.coils; c++) {
    for (let i = 0; i < n; i++) {
      if (maps.data[2 * (c * n + i)] !== 0 || maps.data[2 * (c * n + i) + 1] !== 0) support[i] = 1;
    }
  }
  return support;
}
