import { z } from 'zod';
import { ValidationError } from '../core/errors.ts';
import { daubechiesFilters, WAVELET_NAMES } from '../wavelets/daubechies-filters.ts';
import { maxDwtLevels } from '../wavelets/dwt2.ts';
import { acquiredFraction, LAMBDA_RULE } from './cs-tv.ts';
import { backProjectionPeak } from './cs-tv-encoding.ts';
import { solveCsWaveletEncoding } from './cs-wavelet-encoding.ts';
import {
  CS_WAVELET_DEFAULT_ITERATIONS,
  CS_WAVELET_DEFAULT_LEVELS,
  CS_WAVELET_DEFAULT_TOLERANCE,
  CS_WAVELET_DEFAULT_WAVELET,
  solveCsWavelet,
} from './cs-wavelet-solver.ts';
import { encodingProblem } from './encoding-problem.ts';
import type { ReconInput, ReconMethod, ReconOutput } from './method.ts';
import { checkedNumber, checkedTolerance, defaultCsWaveletLambda, iterationsToRun } from './parameters.ts';
import { iterationLimitField, rangeField, toleranceField } from './schema-fields.ts';

/** How the decimated transform's blocking is countered: a random grid shift per iteration, or none. */
export const SHIFT_INVARIANCE = ['cycle-spinning', 'none'] as const;
export type ShiftInvariance = (typeof SHIFT_INVARIANCE)[number];
/** The seed of the cycle-spinning shifts: fixed, so a request gives the same image every time. */
const CYCLE_SPIN_SEED = 1;

export const csWaveletSchema = z.strictObject({
  name: z.literal('cs-wavelet'),
  lambda: rangeField(
    LAMBDA_RULE,
    'ℓ1-wavelet weight relative to max |Eᴴy| (scale-free); default 0.00011·(1/f − 1)^1.2, f = acquired fraction, at most 0.02 (tuned on anatomy)',
  ),
  tvLambda: rangeField(
    LAMBDA_RULE,
    'optional total-variation weight, relative like lambda (default 0: wavelet only)',
  ),
  wavelet: z
    .enum(WAVELET_NAMES)
    .optional()
    .describe(`orthogonal Daubechies wavelet db1 (Haar) … db8 (default ${CS_WAVELET_DEFAULT_WAVELET})`),
  levels: z
    .number()
    .int()
    .min(1)
    .max(8)
    .optional()
    .describe(
      `decomposition levels; the matrix sides must be divisible by 2^levels (default ${CS_WAVELET_DEFAULT_LEVELS}, fewer when the matrix needs it)`,
    ),
  shiftInvariance: z
    .enum(SHIFT_INVARIANCE)
    .optional()
    .describe(
      'against the blocking of the decimated transform: a random circular shift of the wavelet grid per iteration (cycle-spinning, the default without TV) or none (the default, and the only choice, with tvLambda > 0)',
    ),
  iterations: iterationLimitField(
    `iteration limit (default ${CS_WAVELET_DEFAULT_ITERATIONS}); the solver stops earlier once converged`,
  ),
  tolerance: toleranceField(
    `stop when the relative change of the iterate and of the objective are both below it (default ${CS_WAVELET_DEFAULT_TOLERANCE}; 0: run every iteration)`,
  ),
});
export type CsWaveletSpec = z.infer<typeof csWaveletSchema>;

/**
 * cs-wavelet: min_x ½‖E x − y‖² + λ‖Ψx‖₁ (+ λ_TV·TV_iso(x)) (Lustig, Donoho & Pauly 2007), on the
 * single-coil Cartesian model by the k-space solvers of cs-wavelet-solver.ts, and on every other
 * encoding operator cs-tv supports (multi-coil Cartesian with maps, a trajectory) by
 * solveCsWaveletEncoding. λ and λ_TV are relative to max |Eᴴy| (single coil: max |F_cᴴ y|).
 */
export const csWavelet: ReconMethod<CsWaveletSpec> = {
  name: 'cs-wavelet',
  schema: csWaveletSchema,
  run(input, spec, { signal, limits }): ReconOutput {
    const fraction = acquiredFraction(input.mask);
    const lambda = checkedNumber(spec.lambda, 'method.lambda', LAMBDA_RULE, defaultCsWaveletLambda(fraction));
    const tvLambda = checkedNumber(spec.tvLambda, 'method.tvLambda', LAMBDA_RULE, 0);
    const iterations = iterationsToRun(spec.iterations, CS_WAVELET_DEFAULT_ITERATIONS, limits);
    const tolerance = checkedTolerance(spec.tolerance, CS_WAVELET_DEFAULT_TOLERANCE);
    const wavelet = spec.wavelet ?? CS_WAVELET_DEFAULT_WAVELET;
    const levels = checkedLevels(input, spec.levels);
    const shiftInvariance = checkedShiftInvariance(spec.shiftInvariance, tvLambda);
    const cycleSpinning = shiftInvariance === 'cycle-spinning';
    const common = {
      wavelet,
      levels,
      lambda,
      // The same field and words as cs-tv (docs/design.md §3.12).
      lambdaRule: spec.lambda === undefined ? 'anatomy-default' : 'explicit',
      tvLambda,
      shiftInvariance,
    };
    const problem = encodingProblem(input, 'cs-wavelet');
    if (problem) {
      const peak = backProjectionPeak(problem.operator, problem.data);
      const result = solveCsWaveletEncoding(problem.operator, problem.data, {
        filters: daubechiesFilters(wavelet),
        levels,
        lambdaAbs: lambda * peak,
        lambdaTvAbs: tvLambda * peak,
        iterations,
        tolerance,
        cycleSpinSeed: cycleSpinning ? CYCLE_SPIN_SEED : null,
        signal,
      });
      return {
        image: result.image,
        info: {
          solver:
            tvLambda > 0
              ? `Chambolle–Pock primal–dual on ${problem.operatorName}, K = (∇, W), τ = σ = 0.99/3; data prox (I + τEᴴE)⁻¹ by conjugate gradients`
              : `FISTA on ${problem.operatorName}, step 1/L, L = ${result.lipschitz.toPrecision(4)} ≥ ‖EᴴE‖`,
          ...common,
          lambdaAbsolute: lambda * peak,
          tvLambdaAbsolute: tvLambda * peak,
          ...result.rule.report(result.iterations, iterations),
          objective: result.objective,
          ...(tvLambda > 0
            ? { meanProxSteps: result.iterations > 0 ? result.proxSteps / result.iterations : 0 }
            : {}),
          ...problem.info,
        },
      };
    }
    const { image, info } = solveCsWavelet(input, {
      lambda,
      lambdaTv: tvLambda,
      wavelet,
      levels,
      iterations,
      tolerance,
      cycleSpinning,
      seed: CYCLE_SPIN_SEED,
      signal,
    });
    const { lambdaTv: _relative, lambdaTvAbsolute, cycleSpinning: _spin, ...rest } = info;
    return { image, info: { ...common, ...rest, tvLambdaAbsolute: lambdaTvAbsolute } };
  },
};

/** The requested levels, or the default capped by the matrix; a ValidationError when the matrix cannot take them. */
function checkedLevels(input: ReconInput, requested: number | undefined): number {
  const { nx, ny } = input.kspace;
  const most = maxDwtLevels(nx, ny);
  if (most === 0) {
    throw new ValidationError({
      field: 'method.levels',
      message: `cs-wavelet needs even matrix sides for even one wavelet level, got ${ny}×${nx}`,
      allowed: 'a matrix with both sides divisible by 2',
    });
  }
  if (requested === undefined) return Math.min(CS_WAVELET_DEFAULT_LEVELS, most);
  if (requested > most) {
    throw new ValidationError({
      field: 'method.levels',
      message: `${requested} levels need both matrix sides divisible by ${2 ** requested}, got ${ny}×${nx}`,
      allowed: `1 ≤ levels ≤ ${most}`,
    });
  }
  return requested;
}

function checkedShiftInvariance(requested: ShiftInvariance | undefined, tvLambda: number): ShiftInvariance {
  if (tvLambda > 0 && requested === 'cycle-spinning') {
    throw new ValidationError({
      field: 'method.shiftInvariance',
      message:
        'cycle spinning needs the wavelet-only solver (FISTA); with tvLambda > 0 the primal–dual solver keeps one dual variable per coefficient of a fixed grid',
      allowed: "'none' with tvLambda > 0, or tvLambda 0",
    });
  }
  return requested ?? (tvLambda > 0 ? 'none' : 'cycle-spinning');
}
