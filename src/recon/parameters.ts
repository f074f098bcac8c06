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
