import { z } from 'zod';
import { ifft2c } from '../core/centered-fft.ts';
import { createComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { checkMultiCoilShape, transformPlaneInPlace } from '../encoding/index.ts';
import { BlockHankel } from './block-hankel.ts';
import { combineCoilImages } from './coil-combination.ts';
import { derivativeWeights } from './derivative-weights.ts';
import { runHankelIterations } from './hankel-iterations.ts';
import { defaultHankelRank, type HankelRankRule } from './hankel-rank.ts';
import { STACKED_COLUMNS_MAX, solveLowrankHankelCoils } from './lowrank-hankel-coils.ts';
import {
  type CoilData,
  type ReconInput,
  type ReconMethod,
  type ReconOutput,
  refuseTrajectory,
} from './method.ts';
import { checkedChoice, checkedNumber, iterationsToRun, type NumberRule } from './parameters.ts';
import { iterationLimitField, rangeField, toleranceField } from './schema-fields.ts';

export const KERNEL_SIDE_RULE: NumberRule = { min: 1, max: 64, integer: true };
/** Largest window area w_y·w_x (the Gram matrix is area × area). */
export const KERNEL_AREA_MAX = 121;
export const ENERGY_RULE: NumberRule = { min: 0, max: 1, minExclusive: true, maxExclusive: true };
export const HANKEL_TOLERANCE_RULE: NumberRule = { min: 0, max: 1, maxExclusive: true };
export const WEIGHTINGS = ['none', 'gradient'] as const;
export type HankelWeighting = (typeof WEIGHTINGS)[number];

/**
 * Defaults, measured on the 1974 Shepp–Logan phantom (analytic k-space, 128², R = 4, seed 11;
 * the tests assert on the modified phantom with another seed): with the 'gradient' weighting a
 * 7×7 window at rank 20–28 reaches ≈ 0.3× (random lines) and ≈ 0.15× (Poisson-disc) of the
 * zero-filled NRMSE, best near half the window area; unweighted lifting at the same rank is worse
 * than zero-filled. Rectangular 9×5 / 5×9 windows were no better. Energy thresholds picked
 * unstable ranks on Poisson-disc masks (0.985 → rank 32, error ×5), so the default rank is fixed.
 */
export const HANKEL_DEFAULTS = {
  kernel: [7, 7] as [number, number],
  /** Default rank: defaultHankelRank (hankel-rank.ts) when neither rank nor energy is given. */
  weighting: 'gradient' as HankelWeighting,
  iterations: 100,
  tolerance: 1e-5,
};

const kernelSide = z.number().int().min(KERNEL_SIDE_RULE.min).max(KERNEL_SIDE_RULE.max);

export const lowrankHankelSchema = z.strictObject({
  name: z.literal('lowrank-hankel'),
  kernel: z
    .union([kernelSide, z.tuple([kernelSide, kernelSide])])
    .optional()
    .describe(
      `window side w (w×w) or [rows (ky), columns (kx)]; area ≤ ${KERNEL_AREA_MAX}; default 7 (3 for a coil array, coils × area ≤ ${STACKED_COLUMNS_MAX})`,
    ),
  rank: z
    .number()
    .int()
    .min(1)
    .optional()
    .describe(
      'truncation rank ≤ window area (× coils for a coil array); default 0.65 × window area when ≥ 30 % of k-space is acquired, else half of it (twice the area for a coil array), unless energy is given',
    ),
  energy: rangeField(
    ENERGY_RULE,
    'choose the rank each iteration as the smallest keeping this fraction of Σσ² (instead of rank)',
  ),
  weighting: z
    .enum(WEIGHTINGS)
    .optional()
    .describe(
      "'gradient' (default for one coil): lift k-space weighted by the derivative's spectral factor; 'none' (default for a coil array)",
    ),
  iterations: iterationLimitField('iteration limit (default 100)'),
  tolerance: toleranceField('stop when the relative change < tolerance (default 1e-5)'),
});
export type LowrankHankelSpec = z.infer<typeof lowrankHankelSchema>;

/**
 * Defaults for receive-array data. The stacked matrix has coils × window-area columns and its
 * eigendecomposition grows as the cube of that, so the window is small: 3×3 keeps 32 coils
 * (288 columns) within STACKED_COLUMNS_MAX. Measured on the modified Shepp–Logan raster at 64², 8
 * loop coils, uniform R = 3 with 8 ACS lines, 50 iterations (zero-filled RSS 0.490): 3×3 at rank
 * 9 / 12 / 15 / 18 / 24 gave NRMSE 0.199 / 0.103 / 0.066 / 0.057 / 0.118; 4×4 at 24 / 32 0.048 /
 * 0.122; 5×5 at 35 / 50 / 70 0.050 / 0.186 / 0.397 (4–15× the time of 3×3); the 'gradient' weighting
 * at 3×3, rank 18, 0.371. Hence 3×3, rank 2 × window area, unweighted.
 */
export const HANKEL_COIL_DEFAULTS = {
  kernel: [3, 3] as [number, number],
  /** Default rank = round(rankPerArea · window area), at most the column count. */
  rankPerArea: 2,
  weighting: 'none' as HankelWeighting,
};

function checkedKernel(
  value: unknown,
  nx: number,
  ny: number,
  fallback: [number, number] = HANKEL_DEFAULTS.kernel,
): [number, number] {
  const pair: unknown[] = value === undefined ? fallback : Array.isArray(value) ? value : [value, value];
  if (pair.length !== 2) {
    throw new ValidationError({
      field: 'method.kernel',
      message: 'must be one window side or [rows, columns]',
      allowed: `integer 1 ≤ side ≤ ${KERNEL_SIDE_RULE.max}`,
    });
  }
  const wy = checkedNumber(pair[0], 'method.kernel', KERNEL_SIDE_RULE, 0);
  const wx = checkedNumber(pair[1], 'method.kernel', KERNEL_SIDE_RULE, 0);
  if (wy * wx < 2 || wy * wx > KERNEL_AREA_MAX) {
    throw new ValidationError({
      field: 'method.kernel',
      message: `window area ${wy}×${wx} = ${wy * wx} out of range`,
      allowed: `2 ≤ rows·columns ≤ ${KERNEL_AREA_MAX}`,
    });
  }
  if (wy > ny || wx > nx) {
    throw new ValidationError({
      field: 'method.kernel',
      message: `window ${wy}×${wx} larger than the ${ny}×${nx} matrix`,
      allowed: `rows ≤ ${ny}, columns ≤ ${nx}`,
    });
  }
  return [wy, wx];
}

/** What the completion loops take: window, fixed rank (or the energy to keep), weighting, stopping. */
export interface HankelSolveParams {
  kernel: [number, number];
  /** Fixed rank, or undefined to pick it from `energy` each iteration. */
  rank?: number;
  energy: number;
  weighting: HankelWeighting;
  iterations: number;
  tolerance: number;
}

/** What the completion loops return: the completed k-space, the run, its last rank and spectrum. */
export interface HankelSolution<K> {
  kspace: K;
  iterations: number;
  /** The rank of the last iteration. */
  rank: number;
  relativeChange: number;
  /** Eigenvalues of the last Gram matrix, descending. */
  spectrum: Float64Array;
}

/**
 * Structured low-rank completion of single-channel k-space by alternating projections
 * (the SAKE-style loop of Shin et al. 2014, docs/references.md §5.3):
 *   lift z into the block-Hankel matrix H(z) (wy×wx windows), truncate to rank r through the
 *   eigendecomposition of the n×n Gram matrix H(z)ᴴH(z) (n = wy·wx; Householder + QL), average back
 *   over the windows each sample belongs to, then put the acquired samples back.
 * Weighting 'gradient' lifts the two derivative k-spaces (kx·z and ky·z, the spectral factor of
 * ∂/∂x and ∂/∂y up to the constant i2π/2) stacked in one matrix: for piecewise-constant images
 * these are annihilated by the edge filter and far lower in rank (Ongie & Jacob 2016). The
 * estimate is recovered from the two weighted projections by least squares, (kx·ẑx + ky·ẑy) /
 * (kx² + ky²); the DC sample, where both weights vanish, keeps its previous value.
 * Rank: `rank` if given, else the smallest rank keeping `energy` of the current spectrum.
 * Memory: a few N-sized arrays and n×n matrices (O(N + n²)); time per iteration: one 2D DFT pair
 * per lifted array (shared by the Gram matrix and the projection, see BlockHankel), O(N) and
 * O((nx + ny)·w) line DFTs for the autocorrelation, wrap bands and border strips, half a DFT for
 * the interior multiplier, O(n³) for the eigensolver (which forms only the leading `rank`
 * eigenvectors). Measured at 256², 7×7, 'gradient': just under 4 fft2c+ifft2c pairs per iteration
 * (`npm run bench` on a shared 2-core machine, docs/design.md §3.14).
 * A sample the mask misses at the k-space centre stays 0 under 'gradient' (both weights vanish).
 */
export function solveLowrankHankel(
  input: ReconInput,
  params: HankelSolveParams,
  signal?: AbortSignal,
): HankelSolution<Float64Array> {
  const { kspace, mask } = input;
  const { nx, ny } = kspace;
  const n = nx * ny;
  const [wy, wx] = params.kernel;
  const lift = new BlockHankel(nx, ny, wx, wy);
  const size = lift.size;
  const projector = new Float64Array(2 * size * size);
  const x = new Float64Array(2 * n);
  const y = kspace.data;
  for (let i = 0; i < n; i++) {
    if (mask[i]) {
      x[2 * i] = y[2 * i];
      x[2 * i + 1] = y[2 * i + 1];
    }
  }
  const gradientWeighting = params.weighting === 'gradient';
  const { weightX, weightY, inverseWeight, columnWeight, rowWeight } = derivativeWeights(nx, ny);
  const zx = gradientWeighting ? new Float64Array(2 * n) : x;
  const zy = gradientWeighting ? new Float64Array(2 * n) : x;
  const px = new Float64Array(2 * n);
  const py = gradientWeighting ? new Float64Array(2 * n) : px;
  const lifted = gradientWeighting ? [zx, zy] : [x];

  // The weighted arrays follow x: set here, then updated with x sample by sample below.
  if (gradientWeighting) {
    for (let i = 0; i < n; i++) {
      zx[2 * i] = weightX[i] * x[2 * i];
      zx[2 * i + 1] = weightX[i] * x[2 * i + 1];
      zy[2 * i] = weightY[i] * x[2 * i];
      zy[2 * i + 1] = weightY[i] * x[2 * i + 1];
    }
  }
  const consistency = { x, px, py, zx, zy, mask, columnWeight, rowWeight, inverseWeight, gradientWeighting };
  // One iteration's truncation and data consistency; the loop around it is runHankelIterations.
  const update = (vectors: Float64Array, rank: number) => {
    lift.setProjector(projector, vectors, rank);
    // px, py come back conjugated (one pass fewer each); the imaginary parts are negated on reading.
    if (gradientWeighting) lift.projectLifted(px, py, true);
    else lift.projectLifted(px, undefined, true);
    return dataConsistency(consistency);
  };
  const gram = (target: Float64Array) => lift.gram(target, lifted);
  return { kspace: x, ...runHankelIterations(size, params, { gram, update }, signal) };
}

/**
 * Data consistency of one iteration from the conjugated projections px (and py): acquired samples
 * are skipped (x = y there throughout), the others get the projection (least-squares combination
 * of the two weighted ones under 'gradient', whose weighted copies zx, zy follow). The relative
 * change is summed in the same pass, in the same order as over the whole interleaved array.
 * A module function with its arrays in locals: as a closure over the solver's scope the loop ran
 * about 2–3× slower (captured arrays reloaded from the context on every access).
 */
function dataConsistency(arrays: {
  x: Float64Array;
  px: Float64Array;
  py: Float64Array;
  zx: Float64Array;
  zy: Float64Array;
  mask: Uint8Array;
  columnWeight: Float64Array;
  rowWeight: Float64Array;
  inverseWeight: Float64Array;
  gradientWeighting: boolean;
}): { diff: number; norm: number } {
  const { x, px, py, zx, zy, mask, columnWeight, rowWeight, inverseWeight, gradientWeighting } = arrays;
  const nx = columnWeight.length;
  const ny = rowWeight.length;
  let diff = 0;
  let norm = 0;
  for (let v = 0, i = 0; v < ny; v++) {
    const wy = rowWeight[v];
    for (let u = 0; u < nx; u++, i++) {
      const re = x[2 * i];
      const im = x[2 * i + 1];
      if (mask[i] || (gradientWeighting && inverseWeight[i] === 0)) {
        norm += re * re;
        norm += im * im;
        continue;
      }
      let nr: number;
      let ni: number;
      if (gradientWeighting) {
        const wx = columnWeight[u];
        const s = inverseWeight[i];
        nr = (wx * px[2 * i] + wy * py[2 * i]) * s;
        ni = -((wx * px[2 * i + 1] + wy * py[2 * i + 1]) * s);
        zx[2 * i] = wx * nr;
        zx[2 * i + 1] = wx * ni;
        zy[2 * i] = wy * nr;
        zy[2 * i + 1] = wy * ni;
      } else {
        nr = px[2 * i];
        ni = -px[2 * i + 1];
      }
      x[2 * i] = nr;
      x[2 * i + 1] = ni;
      const dr = nr - re;
      const di = ni - im;
      diff += dr * dr;
      norm += nr * nr;
      diff += di * di;
      norm += ni * ni;
    }
  }
  return { diff, norm };
}

export const lowrankHankel: ReconMethod<LowrankHankelSpec> = {
  name: 'lowrank-hankel',
  schema: lowrankHankelSchema,
  run(input, spec, { signal, limits }): ReconOutput {
    refuseTrajectory(input, 'lowrank-hankel');
    const { nx, ny } = input.kspace;
    const coils = input.coils?.kspace.coils ?? 1;
    const kernel = checkedKernel(
      spec.kernel,
      nx,
      ny,
      input.coils ? HANKEL_COIL_DEFAULTS.kernel : HANKEL_DEFAULTS.kernel,
    );
    const area = kernel[0] * kernel[1];
    if (input.coils && coils * area > STACKED_COLUMNS_MAX) {
      throw new ValidationError({
        field: 'method.kernel',
        message: `${coils} coils × window area ${area} = ${coils * area} columns in the stacked matrix`,
        allowed: `coils · rows · columns ≤ ${STACKED_COLUMNS_MAX}`,
      });
    }
    const columns = coils * area;
    const energy =
      spec.energy === undefined ? undefined : checkedNumber(spec.energy, 'method.energy', ENERGY_RULE, 0);
    if (spec.rank !== undefined && energy !== undefined) {
      throw new ValidationError({
        field: 'method.energy',
        message: 'give either rank or energy, not both',
        allowed: 'rank | energy',
      });
    }
    const rankRule: HankelRankRule =
      spec.rank !== undefined
        ? 'explicit'
        : energy !== undefined
          ? 'energy'
          : input.coils
            ? 'coil-default'
            : 'fraction-default';
    const rank =
      rankRule === 'energy'
        ? undefined
        : checkedNumber(
            spec.rank,
            'method.rank',
            { min: 1, max: columns, integer: true },
            input.coils
              ? Math.min(columns, Math.round(HANKEL_COIL_DEFAULTS.rankPerArea * area))
              : defaultHankelRank(area, input.mask),
          );
    const weighting = checkedChoice(
      spec.weighting,
      'method.weighting',
      WEIGHTINGS,
      input.coils ? HANKEL_COIL_DEFAULTS.weighting : HANKEL_DEFAULTS.weighting,
    );
    const iterations = iterationsToRun(spec.iterations, HANKEL_DEFAULTS.iterations, limits);
    const tolerance = checkedNumber(
      spec.tolerance,
      'method.tolerance',
      HANKEL_TOLERANCE_RULE,
      HANKEL_DEFAULTS.tolerance,
    );
    if (input.coils) {
      return runOnCoils(
        input.mask,
        input.coils,
        {
          kernel,
          rank,
          energy: energy ?? 1,
          weighting,
          iterations,
          tolerance,
          rankRule,
        },
        signal,
      );
    }
    const result = solveLowrankHankel(
      input,
      { kernel, rank, energy: energy ?? 1, weighting, iterations, tolerance },
      signal,
    );
    const image = createComplexImage(nx, ny);
    image.data.set(result.kspace);
    ifft2c(image, image);
    return {
      image,
      info: {
        solver:
          'alternating projections: block-Hankel rank truncation (Householder–QL eigendecomposition of the Gram matrix), averaging, data consistency',
        ...runInfo({ kernel, weighting, rankRule, energy, iterations, tolerance }, result),
      },
    };
  },
};

/**
 * The info every lowrank-hankel run reports: window, weighting, rank and the spectrum's energy
 * its leading eigenvalues keep (negative rounding noise counted as 0), iterations, convergence.
 */
function runInfo(
  params: {
    kernel: [number, number];
    weighting: HankelWeighting;
    rankRule: HankelRankRule;
    energy?: number;
    iterations: number;
    tolerance: number;
  },
  result: { rank: number; spectrum: Float64Array; iterations: number; relativeChange: number },
): Record<string, unknown> {
  let total = 0;
  let kept = 0;
  for (let i = 0; i < result.spectrum.length; i++) {
    const v = Math.max(0, result.spectrum[i]);
    total += v;
    if (i < result.rank) kept += v;
  }
  return {
    kernel: params.kernel,
    weighting: params.weighting,
    rankRule: params.rankRule,
    rank: result.rank,
    ...(params.energy !== undefined ? { energy: params.energy } : {}),
    energyKept: total > 0 ? kept / total : 1,
    iterations: result.iterations,
    iterationLimit: params.iterations,
    tolerance: params.tolerance,
    relativeChange: result.relativeChange,
    converged: result.relativeChange < params.tolerance,
  };
}

/**
 * Multi-coil lowrank-hankel (solveLowrankHankelCoils): every coil's k-space completed together,
 * then the coil images combined — sensitivity-weighted when maps are known, else root-sum-of-squares.
 */
function runOnCoils(
  mask: Uint8Array,
  coils: CoilData,
  params: HankelSolveParams & { rankRule: HankelRankRule },
  signal?: AbortSignal,
): ReconOutput {
  const { kspace, maps } = coils;
  const { nx, ny } = kspace;
  if (mask.length !== nx * ny) throw new RangeError(`mask must cover the ${ny}×${nx} coil k-space`);
  if (maps) checkMultiCoilShape(maps, kspace.coils, nx, ny, 'coils.maps');
  const result = solveLowrankHankelCoils(kspace, mask, params, signal);
  const images = result.kspace;
  for (let c = 0; c < images.coils; c++) transformPlaneInPlace(images.data, c * nx * ny, nx, ny, 1);
  const image = combineCoilImages(images, maps).image;
  return {
    image,
    info: {
      solver:
        'alternating projections on the coils’ stacked block-Hankel matrices (Shin et al. 2014): rank truncation, averaging per coil, data consistency per coil',
      coils: kspace.coils,
      combination: maps ? 'sensitivity-weighted (given maps)' : 'root-sum-of-squares',
      columns: kspace.coils * params.kernel[0] * params.kernel[1],
      ...runInfo({ ...params, energy: params.rankRule === 'energy' ? params.energy : undefined }, result),
    },
  };
}
