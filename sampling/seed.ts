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
