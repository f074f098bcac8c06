import { z } from 'zod';
import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import type { CoilSamples } from '../encoding/encoding-operator.ts';
import type { EncodingOperator } from '../encoding/index.ts';
import {
  backProjectionPeak,
  type CsTvResult,
  normalNormEstimate,
  PROX_TOLERANCE,
  solveCsTvEncoding,
  solveCsTvLinearised,
} from './cs-tv-encoding.ts';
import { preconditionedSigma, SIGMA_PER_LAMBDA, solveCsTvPreconditioned } from './cs-tv-preconditioned.ts';
import { encodingProblem } from './encoding-problem.ts';
import type { ReconInput, ReconMethod, ReconOutput } from './method.ts';
import { checkedNumber, checkedTolerance, iterationsToRun, type NumberRule } from './parameters.ts';
import { runPrimalDual, TV_STEP } from './primal-dual-loop.ts';
import { iterationLimitField, rangeField, toleranceField } from './schema-fields.ts';
import { totalVariation } from './total-variation.ts';
import {
  cartesianResidual,
  chooseTvLambda,
  dataNoiseEnergy,
  type LambdaChoice,
  operatorResidual,
} from './tv-lambda.ts';

export const LAMBDA_RULE: NumberRule = { min: 0, max: 10 };
export { TOLERANCE_RULE } from './parameters.ts';
export const CS_TV_DEFAULT_ITERATIONS = 300;
export const CS_TV_DEFAULT_TOLERANCE = 1e-5;

export const csTvSchema = z.strictObject({
  name: z.literal('cs-tv'),
  lambda: rangeField(
    LAMBDA_RULE,
    'TV weight relative to max |F_cᴴ y| (scale-free); default: with known noise σ the discrepancy principle, ' +
      'else 0.0009·(1/f − 1)^1.75 (at most 0.05), f = acquired fraction',
  ),
  iterations: iterationLimitField(`iteration limit (default ${CS_TV_DEFAULT_ITERATIONS})`),
  tolerance: toleranceField(
    `stop when ‖x_k − x_{k−1}‖ / ‖x_k‖ < tolerance (default ${CS_TV_DEFAULT_TOLERANCE})`,
  ),
});
export type CsTvSpec = z.infer<typeof csTvSchema>;

/**
 * The plain scheme the service's single-coil path replaced (solveCsTvPreconditioned reaches the
 * same minimum in fewer iterations); kept as the reference the multi-coil solver reproduces with
 * one uniform coil and the numpy reference script implements (tests/reference/cs_tv_reference.py).
 * min_x ½‖M F_c x − y‖² + λ·TV_iso(x) over complex x, by the first-order primal–dual method of
 * Chambolle & Pock 2011 (θ = 1) with K = ∇, F* = indicator of {‖p_ij‖₂ ≤ λ} (prox = pointwise
 * projection) and G = ½‖M F_c x − y‖², whose prox is exact in k-space:
 *   prox_τG(v) = F_cᴴ[(F_c v + τ M y) / (1 + τ M)]           (docs/references.md §5.2)
 * Step rule: τ = σ = 0.99/√8, so τσ‖∇‖² < 1. Start x⁰ = F_cᴴ y (zero-filled), p⁰ = 0.
 * λ_abs = λ_rel · max |F_cᴴ y|. Stops after `iterations` or when the iterate and the objective both
 * change by less than `tolerance`, relatively (StoppingRule); tolerance 0 runs every iteration.
 * With a full mask this is ROF denoising of F_cᴴ y with weight λ_abs.
 */
export function solveCsTv(
  input: ReconInput,
  lambdaAbs: number,
  iterations: number,
  tolerance: number,
  signal?: AbortSignal,
  /** Called with Φ after every iteration (objective histories). */
  recordObjective?: (objective: number) => void,
): CsTvResult {
  const { kspace, mask } = input;
  const { nx, ny } = kspace;
  const n = nx * ny;
  const y = kspace.data;
  const x = createComplexImage(nx, ny);
  const work = createComplexImage(nx, ny);
  for (let i = 0; i < n; i++) {
    if (mask[i]) {
      x.data[2 * i] = y[2 * i];
      x.data[2 * i + 1] = y[2 * i + 1];
    }
  }
  ifft2c(x, x);
  // F x and F x_old: the data term of the objective the stopping rule compares.
  const kspaceX = new Float64Array(2 * n);
  const kspaceOld = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    if (mask[i]) {
      kspaceX[2 * i] = y[2 * i];
      kspaceX[2 * i + 1] = y[2 * i + 1];
    }
  }
  const objectiveAt = (image: Float64Array, k: Float64Array) =>
    maskedResidual(k, y, mask) + lambdaAbs * totalVariation(image, nx, ny);
  const xd = x.data;
  const { iterations: run, rule } = runPrimalDual(xd, {
    nx,
    ny,
    sigma: TV_STEP,
    lambdaTv: lambdaAbs,
    iterations,
    tolerance,
    signal,
    // Primal step v = x − τ∇ᴴp = x + τ div p, then the exact data-term prox in k-space.
    primalStep: (div) => {
      kspaceOld.set(kspaceX);
      for (let i = 0; i < 2 * n; i++) work.data[i] = xd[i] + TV_STEP * div[i];
      maskedDataProx(work, x, kspaceX, input, TV_STEP);
    },
    objectiveNow: () => objectiveAt(xd, kspaceX),
    objectiveBefore: (xOld) => objectiveAt(xOld, kspaceOld),
    ...(recordObjective ? { recordObjective } : {}),
  });
  // Final objective ½‖M F x − y‖² + λ TV(x), with F x recomputed from the returned image.
  fft2c(x, work);
  const residual = maskedResidual(work.data, y, mask);
  const tv = totalVariation(x.data, nx, ny);
  return {
    image: x,
    iterations: run,
    objective: residual + lambdaAbs * tv,
    relativeChange: rule.relativeChange,
    objectiveChange: rule.objectiveChange,
    tv,
  };
}

/**
 * prox_τG(v) for G = ½‖M F_c x − y‖², exact in k-space: x = F_cᴴ[(F_c v + τ M y) / (1 + τ M)]
 * (docs/references.md §5.2). `work` holds v and is overwritten; F_c x goes to `kspace`, x to `x`.
 */
export function maskedDataProx(
  work: ComplexImage,
  x: ComplexImage,
  kspace: Float64Array,
  input: ReconInput,
  tau: number,
): void {
  const { mask } = input;
  const y = input.kspace.data;
  const damp = 1 / (1 + tau);
  fft2c(work, work);
  const w = work.data;
  for (let i = 0; i < mask.length; i++) {
    if (mask[i]) {
      w[2 * i] = (w[2 * i] + tau * y[2 * i]) * damp;
      w[2 * i + 1] = (w[2 * i + 1] + tau * y[2 * i + 1]) * damp;
    }
  }
  kspace.set(w);
  ifft2c(work, x);
}

/** ½‖M X − y‖² for k-space X. */
export function maskedResidual(X: Float64Array, y: Float64Array, mask: Uint8Array): number {
  let residual = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const a = X[2 * i] - y[2 * i];
    const b = X[2 * i + 1] - y[2 * i + 1];
    residual += a * a + b * b;
  }
  return 0.5 * residual;
}

/** max |F_cᴴ(M y)| — the scale λ is relative to. */
export function zeroFilledPeak(input: ReconInput): number {
  const { kspace, mask } = input;
  const n = kspace.nx * kspace.ny;
  const zf = createComplexImage(kspace.nx, kspace.ny);
  for (let i = 0; i < n; i++) {
    if (mask[i]) {
      zf.data[2 * i] = kspace.data[2 * i];
      zf.data[2 * i + 1] = kspace.data[2 * i + 1];
    }
  }
  ifft2c(zf, zf);
  let peak = 0;
  for (let i = 0; i < n; i++) peak = Math.max(peak, Math.hypot(zf.data[2 * i], zf.data[2 * i + 1]));
  return peak;
}

export function acquiredFraction(mask: Uint8Array): number {
  let count = 0;
  for (let i = 0; i < mask.length; i++) if (mask[i]) count++;
  return mask.length > 0 ? count / mask.length : 0;
}

export const csTv: ReconMethod<CsTvSpec> = {
  name: 'cs-tv',
  schema: csTvSchema,
  run(input, spec, { signal, limits }): ReconOutput {
    const requested =
      spec.lambda === undefined ? undefined : checkedNumber(spec.lambda, 'method.lambda', LAMBDA_RULE, 0);
    const iterations = iterationsToRun(spec.iterations, CS_TV_DEFAULT_ITERATIONS, limits);
    const tolerance = checkedTolerance(spec.tolerance, CS_TV_DEFAULT_TOLERANCE);
    const params: LambdaSettings = {
      requested,
      fraction: acquiredFraction(input.mask),
      noiseEnergy: dataNoiseEnergy(input),
      iterations,
      tolerance,
    };
    const problem = encodingProblem(input, 'cs-tv');
    if (problem) {
      // With a bound of ‖EᴴE‖ (a trajectory's Toeplitz kernel) the data term is linearised: one EᴴE
      // per iteration instead of a CG-solved prox.
      const normBound =
        problem.normalBound === undefined
          ? undefined
          : normalNormEstimate(problem.operator, problem.normalBound);
      const output = runOnOperator(
        problem.operator,
        problem.data,
        { ...params, ...(normBound === undefined ? {} : { normBound }) },
        problem.operatorName,
        signal,
      );
      return { image: output.image, info: { ...output.info, ...problem.info } };
    }
    const peak = zeroFilledPeak(input);
    const solve = (lambda: number, limit: number) =>
      solveCsTvPreconditioned(input, lambda * peak, limit, tolerance, {
        sigma: preconditionedSigma(lambda),
        signal,
      });
    const choice = lambdaFor(params, (lambda, trialIterations) =>
      cartesianResidual(input, solve(lambda, trialIterations).image),
    );
    const result = solve(choice.lambda, iterations);
    return {
      image: result.image,
      info: {
        solver:
          'Chambolle–Pock primal–dual with the Fourier-diagonal primal metric T⁻¹ = σ∇ₚᴴ∇ₚ + δ ' +
          `(Pock & Chambolle 2011), σ = ${SIGMA_PER_LAMBDA}·λ`,
        dualStep: preconditionedSigma(choice.lambda),
        ...solverInfo(choice, params, choice.lambda * peak, result),
      },
    };
  },
};

/** What picks a run's λ (tv-lambda.ts) and stops its solver. */
interface LambdaSettings {
  /** The request's relative λ, checked; undefined = choose one. */
  requested: number | undefined;
  fraction: number;
  /** E‖n‖² of the data term; 0 = noiseless or unknown. */
  noiseEnergy: number;
  iterations: number;
  tolerance: number;
}

/** The run's λ: explicit, discrepancy principle (known noise) or the anatomy default. */
function lambdaFor(
  params: LambdaSettings,
  residualAt: (lambda: number, iterations: number) => number,
): LambdaChoice {
  const problem = params.noiseEnergy > 0 ? { noiseEnergy: params.noiseEnergy, residualAt } : undefined;
  return chooseTvLambda(params.requested, params.fraction, params.iterations, problem);
}

/** The info every cs-tv run reports: λ (relative, its rule, absolute), iterations, convergence, objective. */
function solverInfo(
  choice: LambdaChoice,
  params: LambdaSettings,
  lambdaAbsolute: number,
  result: {
    iterations: number;
    relativeChange: number;
    objectiveChange: number;
    objective: number;
    tv: number;
  },
): Record<string, unknown> {
  return {
    lambda: choice.lambda,
    lambdaRule: choice.rule,
    ...(choice.discrepancy ? { discrepancy: choice.discrepancy } : {}),
    lambdaAbsolute,
    iterations: result.iterations,
    iterationLimit: params.iterations,
    tolerance: params.tolerance,
    relativeChange: result.relativeChange,
    objectiveChange: result.objectiveChange,
    converged: result.relativeChange < params.tolerance && result.objectiveChange < params.tolerance,
    objective: result.objective,
    totalVariation: result.tv,
  };
}

/**
 * cs-tv on an encoding operator E (multi-coil Cartesian, or a trajectory through the NUFFT), with
 * λ relative to max|Eᴴy| (solveCsTvEncoding).
 */
function runOnOperator(
  operator: EncodingOperator<CoilSamples>,
  data: CoilSamples,
  params: LambdaSettings & { normBound?: number },
  operatorName: string,
  signal?: AbortSignal,
): ReconOutput {
  const peak = backProjectionPeak(operator, data);
  const { normBound } = params;
  const solve = (lambdaAbsolute: number, iterations: number) =>
    normBound === undefined
      ? solveCsTvEncoding(operator, data, lambdaAbsolute, iterations, params.tolerance, signal)
      : solveCsTvLinearised(operator, data, lambdaAbsolute, iterations, params.tolerance, normBound, signal);
  const choice = lambdaFor(params, (lambda, trialIterations) =>
    operatorResidual(operator, data, solve(lambda * peak, trialIterations).image),
  );
  const lambdaAbsolute = choice.lambda * peak;
  if (normBound !== undefined) {
    const result = solve(lambdaAbsolute, params.iterations);
    return {
      image: result.image,
      info: {
        solver: `Condat–Vũ primal–dual on ${operatorName}: gradient step on the data term, σ = 0.99/√8, τ = 0.99/(L/2 + 8σ)`,
        ...solverInfo(choice, params, lambdaAbsolute, result),
        normalBound: normBound,
      },
    };
  }
  const result = solveCsTvEncoding(
    operator,
    data,
    lambdaAbsolute,
    params.iterations,
    params.tolerance,
    signal,
  );
  return {
    image: result.image,
    info: {
      solver: `Chambolle–Pock primal–dual on ${operatorName}, τ = σ = 0.99/√8; data prox (I + τEᴴE)⁻¹ by conjugate gradients`,
      ...solverInfo(choice, params, lambdaAbsolute, result),
      proxTolerance: PROX_TOLERANCE,
      meanProxSteps: result.iterations > 0 ? result.proxSteps / result.iterations : 0,
    },
  };
}
