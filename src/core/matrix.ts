import { z } from 'zod';
import { defaultLimits, type Limits, limitsId } from './limits.ts';
import { parseOrThrow, withinLimit } from './zod-problems.ts';

export interface Matrix {
  nx: number;
  ny: number;
}

const cache = new Map<string, z.ZodType<Matrix, Matrix>>();

/**
 * The matrix piece of every request, built from the configured limits: integer sides from
 * `minSide` (1, or the SSIM window for requests that are scored) to limits.maxMatrixSide, the
 * one upper bound (a LimitError beyond it). One schema object per (limit, lower bound), so that the
 * OpenAPI names it once.
 */
export function matrixSchemaFor(limits: Limits, minSide = 1, whyMin = ''): z.ZodType<Matrix, Matrix> {
  const key = `${limits.maxMatrixSide}|${minSide}|${whyMin}`;
  let schema = cache.get(key);
  if (!schema) {
    const tooSmall = whyMin
      ? { error: (issue: { input?: unknown }) => `${String(issue.input)} is too small: ${whyMin}` }
      : {};
    const side = () => withinLimit(z.int().min(minSide, tooSmall), limits.maxMatrixSide);
    schema = z
      .strictObject({
        nx: side().describe('readout columns (kx); in 3D the second phase-encode axis kz'),
        ny: side().describe('phase-encode rows (ky)'),
      })
      .describe('Image matrix: ny rows (phase encode) × nx columns (readout)')
      .meta({ id: limitsId(minSide > 1 ? 'ScoredMatrix' : 'Matrix', limits, ['maxMatrixSide']) });
    cache.set(key, schema);
  }
  return schema;
}

/** Checks a matrix outside a request schema (scripts, tests): the same schema, the same problems. */
export function validateMatrix(matrix: unknown, limits: Limits = defaultLimits): Matrix {
  return parseOrThrow(matrixSchemaFor(limits), matrix, 'matrix');
}
