/** A custom (bring-your-own) mask has its own acceleration: it is not swept over the plan's R values. */
export function isCustomPattern(pattern: { pattern: string }): boolean {
  return pattern.pattern === 'custom';
}

/**
 * The sampling specs one plan pattern expands to, as [acceleration index, spec]: one per R of the
 * plan with `acceleration` filled in, or the custom spec alone with index null.
 */
export function patternSpecs(
  pattern: { pattern: string },
  accelerations: readonly number[],
): Array<[number | null, Record<string, unknown>]> {
  if (isCustomPattern(pattern)) return [[null, { ...pattern }]];
  return accelerations.map((acceleration, j) => [j, { ...pattern, acceleration }]);
}
