import { ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';

/**
 * Range checks shared by the reconstruction methods. Each throws a ValidationError naming the
 * request field (`method.lambda`, …) and the allowed range, so callers that bypass the zod schema
 * (plans, tests, workers) get the same answer as the HTTP layer.
 */
export interface NumberRule {
  min: number;
  max: number;
  integer?: boolean;
  /** Exclude the lower end (min < value). */
  minExclusive?: boolean;
  /** Exclude the upper end (value < max). */
  maxExclusive?: boolean;
}

export function describeRange(rule: NumberRule, field: string): string {
  const name = field.split('.').pop();
  const lo = rule.minExclusive ? '<' : '≤';
  const hi = rule.maxExclusive ? '<' : '≤';
  return `${rule.integer ? 'integer ' : ''}${rule.min} ${lo} ${name} ${hi} ${rule.max}`;
}

/** `value` if given and inside `rule`, `fallback` if undefined; otherwise a ValidationError. */
export function checkedNumber(value: unknown, field: string, rule: NumberRule, fallback: number): number {
  if (value === undefined) return fallback;
  const ok =
    typeof value === 'number' &&
    Number.isFinite(value) &&
    (!rule.integer || Number.isInteger(value)) &&
    (rule.minExclusive ? value > rule.min : value >= rule.min) &&
    (rule.maxExclusive ? value < rule.max : value <= rule.max);
  if (!ok) {
    throw new ValidationError({
      field,
      message: `must be ${rule.integer ? 'an integer' : 'a number'} in range, got ${JSON.stringify(value)}`,
      allowed: describeRange(rule, field),
    });
  }
  return value as number;
}

/** A relative stopping tolerance: 0 ≤ tolerance < 1. */
export const TOLERANCE_RULE: NumberRule = { min: 0, max: 1, maxExclusive: true };

/** `method.tolerance` checked against TOLERANCE_RULE, or the method's default. */
export function checkedTolerance(value: unknown, fallback: number): number {
  return checkedNumber(value, 'method.tolerance', TOLERANCE_RULE, fallback);
}

/**
 * The iteration count to run: the request's (already checked against limits.maxIterations by the
 * method schema, methodSchemaFor) or the method's default, never above the configured limit.
 */
export function iterationsToRun(value: number | undefined, fallback: number, limits: Limits): number {
  if (value === undefined) return Math.min(fallback, limits.maxIterations);
  if (!Number.isInteger(value) || value < 1 || value > limits.maxIterations) {
    throw new RangeError(
      `iterations must be an integer in 1…${limits.maxIterations} (the method schema checks requests), got ${value}`,
    );
  }
  return value;
}

export function checkedChoice<T extends string>(
  value: unknown,
  field: string,
  choices: readonly T[],
  fallback: T,
): T {
  if (value === undefined) return fallback;
  if (typeof value !== 'string' || !choices.includes(value as T)) {
    throw new ValidationError({
      field,
      message: `unknown value ${JSON.stringify(value)}`,
      allowed: choices.join(' | '),
    });
  }
  return value as T;
}

/** The anatomy rule of cs-wavelet λ = WAVELET_LAMBDA_SCALE·(1/f − 1)^WAVELET_LAMBDA_POWER (docs/design.md §3.12). */
export const WAVELET_LAMBDA_SCALE = 0.00011;
export const WAVELET_LAMBDA_POWER = 1.2;
/** Upper end of the default, kept from the phantom rule: beyond the tuned range (best λ ≤ 0.0016 down to f = 1/8). */
export const WAVELET_LAMBDA_DEFAULT_MAX = 0.02;

/**
 * Default relative wavelet weight of cs-wavelet (db4, 4 levels, cycle spinning) from the acquired
 * fraction f: λ = 0.00011·(1/f − 1)^1.2, at most 0.02; 0 at full sampling. Fitted (least squares in
 * log λ against log(1/f − 1): 0.000114·(1/f − 1)^1.195, rounded) to the best-NRMSE λ of 48 noiseless
 * cases of the anatomy tuning set of cs-tv (INIA19 T1 template, Debian mricron-data; nibabel's
 * example4d EPI, Debian python3-nibabel; 96², lines, Poisson-disc and rasterised golden-angle masks,
 * R 2–8 without Poisson-disc R 8, which fails at every λ): scripts/tune-defaults.ts --method=cs-wavelet,
 * docs/tuning/cs-wavelet-defaults.csv. The earlier rule 0.00025·(1/f − 1), chosen at R = 4 on
 * phantoms, was 2–3× the anatomy optimum at R = 2 and for radial masks.
 */
export function defaultCsWaveletLambda(fraction: number): number {
  return fractionPowerRule(fraction, WAVELET_LAMBDA_SCALE, WAVELET_LAMBDA_POWER, WAVELET_LAMBDA_DEFAULT_MAX);
}

/** The anatomy rule λ = TV_LAMBDA_SCALE·(1/f − 1)^TV_LAMBDA_POWER (docs/design.md §3.12). */
export const TV_LAMBDA_SCALE = 0.0009;
export const TV_LAMBDA_POWER = 1.75;
/** Upper end of the default: beyond the tuned range (best λ ≤ 0.043 down to f = 1/8). */
export const TV_LAMBDA_DEFAULT_MAX = 0.05;

/**
 * Default relative cs-tv λ (noiseless, or σ unknown) from the acquired fraction f:
 * λ = 0.0009·(1/f − 1)^1.75, at most 0.05; 0 at full sampling. Fitted (least squares in log λ
 * against log(1/f − 1)) to the best-NRMSE λ of 48 noiseless cases on real anatomy: slices of the
 * INIA19 macaque T1 template (Debian mricron-data) and of nibabel's example4d EPI (Debian
 * python3-nibabel) at 96², 1D variable-density lines, Poisson-disc and rasterised golden-angle
 * masks, R 2–8 (scripts/tune-defaults.ts, docs/tuning/cs-tv-defaults.csv). The earlier rule
 * 0.002·(1/f − 1), tuned on piecewise-constant phantoms, was 2–3× too strong at R = 2 and half the
 * anatomy optimum for Cartesian masks at R = 8.
 */
export function defaultTvLambda(fraction: number): number {
  return fractionPowerRule(fraction, TV_LAMBDA_SCALE, TV_LAMBDA_POWER, TV_LAMBDA_DEFAULT_MAX);
}

/**
 * The shape both tuned λ rules share: scale·(1/f − 1)^power of the acquired fraction f, at most
 * max (also for a fraction that is not positive); 0 at full sampling.
 */
function fractionPowerRule(fraction: number, scale: number, power: number, max: number): number {
  if (!(fraction > 0)) return max;
  const excess = 1 / Math.min(1, fraction) - 1;
  return Math.min(max, scale * excess ** power);
}
