import { fft2c } from '../core/centered-fft.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import type { CoilSamples, EncodingOperator } from '../encoding/index.ts';
import type { ReconInput } from './method.ts';
import { defaultTvLambda } from './parameters.ts';

/** Where a cs-tv run's λ came from (reported as info.lambdaRule). */
export type LambdaRule = 'explicit' | 'anatomy-default' | 'discrepancy';

/**
 * Morozov's discrepancy principle (Morozov 1966; docs/references.md §5.9): the λ whose solution
 * leaves a data residual equal to the noise the data carry, ‖E x_λ − y‖² = DISCREPANCY_FACTOR · E‖n‖²,
 * E‖n‖² = 2σ²·(weighted sample count) for complex noise of σ per real channel. Factor 1 is the
 * principle as published; it is known to regularise a little more than the error-optimal λ.
 */
export const DISCREPANCY_FACTOR = 1;
/** Iterations of each trial solve (the chosen λ then runs with the request's iterations). */
export const DISCREPANCY_ITERATIONS = 100;
/** Bracketing steps (factor 4 each) and bisection steps (in log λ) of the search. */
const BRACKET_STEPS = 6;
const BISECTION_STEPS = 4;
const BRACKET_FACTOR = 4;
const LAMBDA_FLOOR = 1e-7;
const LAMBDA_CEILING = 10;

export interface LambdaChoice {
  /** Relative λ (times max |Eᴴy| gives the absolute weight). */
  lambda: number;
  rule: LambdaRule;
  /** The discrepancy search, when it ran. */
  discrepancy?: { target: number; residual: number; trials: number; trialIterations: number };
}

/** What the discrepancy search needs: the noise energy of the data term and trial solves. */
export interface DiscrepancyProblem {
  /** E‖n‖² of the data term (after any density weighting). */
  noiseEnergy: number;
  /** ‖E x_λ − y‖² of a solve with relative λ and the given iteration limit. */
  residualAt(lambda: number, iterations: number): number;
}

/**
 * The λ of a cs-tv run: the request's when given; else, with known noise (σ > 0), the discrepancy
 * principle, but never below the anatomy default; else the anatomy-tuned default of the acquired
 * fraction (defaultTvLambda). Why the floor: on undersampled data the residual on the acquired
 * samples measures the noise only, not the aliasing TV must also remove, so at high SNR the
 * discrepancy λ alone is too weak (measured on the modified phantom, 128², lines R 4, SNR 40:
 * λ 0.0040 and NRMSE 0.285 against 0.245 at the default 0.0062). The residual grows with λ, so
 * when the default already leaves a residual at or above the target it is kept after one trial.
 */
export function chooseTvLambda(
  requested: number | undefined,
  fraction: number,
  iterations: number,
  problem?: DiscrepancyProblem,
): LambdaChoice {
  if (requested !== undefined) return { lambda: requested, rule: 'explicit' };
  const start = defaultTvLambda(fraction);
  if (!problem || !(problem.noiseEnergy > 0)) return { lambda: start, rule: 'anatomy-default' };
  const trialIterations = Math.min(iterations, DISCREPANCY_ITERATIONS);
  const target = DISCREPANCY_FACTOR * problem.noiseEnergy;
  const residualAt = (lambda: number) => problem.residualAt(lambda, trialIterations);
  const searchStart = Math.max(start, 1e-4);
  const startResidual = residualAt(searchStart);
  if (start > 0 && startResidual >= target) {
    return {
      lambda: start,
      rule: 'anatomy-default',
      discrepancy: { target, residual: startResidual, trials: 1, trialIterations },
    };
  }
  const found = discrepancySearch(residualAt, target, searchStart, startResidual);
  return {
    lambda: found.lambda,
    rule: 'discrepancy',
    discrepancy: { target, residual: found.residual, trials: found.trials + 1, trialIterations },
  };
}

/**
 * The λ where residual(λ) = target, for a residual that grows with λ: bracket by factors of
 * BRACKET_FACTOR from `start`, bisect in log λ, then interpolate log λ linearly in the residual
 * between the bracket ends. Outside [LAMBDA_FLOOR, LAMBDA_CEILING] the nearer end is returned.
 */
export function discrepancySearch(
  residualAt: (lambda: number) => number,
  target: number,
  start: number,
  /** residual(start) when the caller already has it (not counted in `trials`). */
  startResidual?: number,
): { lambda: number; residual: number; trials: number } {
  let trials = 0;
  const evaluate = (lambda: number) => {
    trials++;
    return residualAt(lambda);
  };
  let lo = start;
  let rLo = startResidual ?? evaluate(lo);
  let hi = lo;
  let rHi = rLo;
  if (rLo < target) {
    // Too little regularisation: raise λ until the residual passes the target.
    for (let step = 0; step < BRACKET_STEPS && rHi < target; step++) {
      lo = hi;
      rLo = rHi;
      hi = Math.min(LAMBDA_CEILING, hi * BRACKET_FACTOR);
      rHi = evaluate(hi);
      if (hi === LAMBDA_CEILING) break;
    }
    if (rHi < target) return { lambda: hi, residual: rHi, trials };
  } else {
    for (let step = 0; step < BRACKET_STEPS && rLo > target; step++) {
      hi = lo;
      rHi = rLo;
      lo = Math.max(LAMBDA_FLOOR, lo / BRACKET_FACTOR);
      rLo = evaluate(lo);
      if (lo === LAMBDA_FLOOR) break;
    }
    if (rLo > target) return { lambda: lo, residual: rLo, trials };
  }
  for (let step = 0; step < BISECTION_STEPS && hi > lo; step++) {
    const mid = Math.sqrt(lo * hi);
    const rMid = evaluate(mid);
    if (rMid < target) {
      lo = mid;
      rLo = rMid;
    } else {
      hi = mid;
      rHi = rMid;
    }
  }
  const t = rHi > rLo ? Math.min(1, Math.max(0, (target - rLo) / (rHi - rLo))) : 0.5;
  const lambda = Math.exp(Math.log(lo) + t * (Math.log(hi) - Math.log(lo)));
  return { lambda, residual: rLo + t * (rHi - rLo), trials };
}

/** ‖M F_c x − y‖² over the acquired samples of single-coil Cartesian data. */
export function cartesianResidual(input: ReconInput, image: ComplexImage): number {
  const { kspace, mask } = input;
  const spectrum = fft2c(image);
  let sum = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    sum += (spectrum.data[2 * i] - kspace.data[2 * i]) ** 2;
    sum += (spectrum.data[2 * i + 1] - kspace.data[2 * i + 1]) ** 2;
  }
  return sum;
}

/** ‖E x − y‖² on an encoding operator (y already weighted as E weighs, for trajectories). */
export function operatorResidual(
  operator: EncodingOperator<CoilSamples>,
  data: CoilSamples,
  image: ComplexImage,
): number {
  const predicted = operator.forward(image).data;
  let sum = 0;
  for (let i = 0; i < predicted.length; i++) sum += (predicted[i] - data.data[i]) ** 2;
  return sum;
}

/**
 * E‖n‖² of the data term cs-tv fits, from the noise σ per real channel of the data the method
 * reconstructs (input.noiseSigma): 2σ² per acquired complex sample and coil; on a trajectory
 * the samples are weighted by √w, so 2σ²·Σw per coil. 0 when σ is unknown or zero.
 */
export function dataNoiseEnergy(input: ReconInput): number {
  const sigma = input.noiseSigma ?? 0;
  if (!(sigma > 0)) return 0;
  const perSample = 2 * sigma * sigma;
  if (input.trajectory) {
    let weight = 0;
    for (const w of input.trajectory.weights) weight += w;
    return perSample * weight * input.trajectory.samples.coils;
  }
  let acquired = 0;
  for (let i = 0; i < input.mask.length; i++) if (input.mask[i]) acquired++;
  return perSample * acquired * (input.coils?.kspace.coils ?? 1);
}
