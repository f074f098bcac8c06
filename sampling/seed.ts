import { ValidationError } from '../src/core/errors.ts';
import { MAX_SEED } from './schema.ts';

/** The seed of a random pattern, which must be given (the same request must give the same bytes). */
export function requireSeed(seed: number | undefined, pattern: string): number {
  if (seed === undefined) {
    throw new ValidationError({
      field: 'sampling.seed',
      message: `is required by the ${pattern} pattern`,
      allowed: `integer, 0 ≤ seed ≤ ${MAX_SEED}`,
    });
  }
  return seed;
}

/** What a seeded variable-density pattern reads from its spec, defaults applied. */
export interface SeededPatternSettings {
  acceleration: number;
  /** Side of the fully sampled centre; 0 without one. */
  acs: number;
  seed: number;
  power: number;
}

export function seededPatternSettings(
  spec: { acceleration: number; acs?: number; seed?: number; density?: { power?: number } },
  pattern: string,
  defaultPower: number,
): SeededPatternSettings {
  return {
    acceleration: spec.acceleration,
    acs: spec.acs ?? 0,
    seed: requireSeed(spec.seed, pattern),
    power: spec.density?.power ?? defaultPower,
  };
}
