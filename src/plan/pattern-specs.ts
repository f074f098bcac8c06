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

/**
 * The protocol's `partialFourier` is the deprecated alias of `sampling.partialFourier` (the same
 * rows): a Cartesian spec without its own fraction takes the protocol's, so the simulation leaves
 * those rows out as the scan time does. Radial and spiral specs have none (the scan-time model refuses them).
 */
export function withProtocolPartialFourier(spec: SamplingSpec, fraction: number): SamplingSpec {
  if (fraction >= 1 || spec.pattern === 'radial' || spec.pattern === 'spiral') return spec;
  if (spec.partialFourier !== undefined) return spec;
  return { ...spec, partialFourier: fraction };
}
