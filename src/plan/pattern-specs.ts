import type { PlanPattern } from './schema.ts';
import type { SamplingSpec } from './upstream.ts';

/** A custom (bring-your-own) mask has its own acceleration: it is not swept over the plan's R values. */
export function isCustomPattern(pattern: { pattern: string }): boolean {
  return pattern.pattern === 'custom';
}

/**
 * The sampling specs one plan pattern expands to, as [acceleration index, spec]: one per R of the
 * plan with `acceleration` filled in, or the custom spec alone with index null. A parsed pattern and
 * a parsed R give a valid spec, so the specs are typed and never parsed again.
 */
export function patternSpecs(
  pattern: PlanPattern,
  accelerations: readonly number[],
): Array<[number | null, SamplingSpec]> {
  if (pattern.pattern === 'custom') return [[null, { ...pattern }]];
  return accelerations.map((acceleration, j) => [j, { ...pattern, acceleration }]);
}
