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

/**
 * Default relative λ from the acquired fraction f: λ = 0.002·(1/f − 1), at most 0.05. Fewer
 * samples need more regularisation and at full sampling λ vanishes (a fixed λ can lose to
 * zero-filled at R = 2). Measured on the 1974 Shepp–Logan and the resolution-contrast phantoms
 * (analytic k-space, 128², seed 11, 400 iterations; the tests assert on the modified phantom with
 * another seed): the best λ was 0.001–0.0025 at R = 2, 0.004–0.0075 at R = 4 and 0.009–0.035 at R = 8
 * for both random lines and Poisson-disc, i.e. proportional to R − 1 = 1/f − 1; 0.002 sits in
 * the middle of the phantoms' optima.
 */
export function defaultTvLambda(fraction: number): number {
  if (!(fraction > 0)) return 0.05;
  return Math.min(0.05, 0.002 * (1 / Math.min(1, fraction) - 1));
}
