import { z } from 'zod';
import { LimitError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';

/** The matrix piece (docs/design.md §4.3). The configured per-side limit is checked by checkMatrixLimit. */
export const matrixSchema = z
  .strictObject({
    nx: z.int().min(2).max(65_536).describe('readout columns (kx)'),
    ny: z.int().min(2).max(65_536).describe('phase-encode rows (ky)'),
  })
  .meta({ id: 'Matrix', description: 'Image matrix: ny rows (phase encode) × nx columns (readout)' });

export const idParams = z.object({ id: z.string().min(1).max(200).describe('Resource id') });

/** Refuses matrices beyond the configured limit (422, LimitError) before any work starts. */
export function checkMatrixLimit(
  matrix: { nx: number; ny: number },
  limits: Limits,
  prefix = 'matrix',
): void {
  const problems = (['nx', 'ny'] as const)
    .filter((key) => matrix[key] > limits.maxMatrixSide)
    .map((key) => ({
      field: `${prefix}.${key}`,
      message: `${matrix[key]} is larger than the configured limit`,
      allowed: `≤ ${limits.maxMatrixSide}`,
    }));
  if (problems.length > 0) throw new LimitError(problems);
}

/** Refuses iteration counts beyond the configured limit. */
export function checkIterationLimit(method: unknown, limits: Limits, field = 'method.iterations'): void {
  const iterations = (method as { iterations?: unknown } | null)?.iterations;
  if (typeof iterations === 'number' && iterations > limits.maxIterations) {
    throw new LimitError({
      field,
      message: `${iterations} iterations is more than the configured limit`,
      allowed: `≤ ${limits.maxIterations}`,
    });
  }
}
