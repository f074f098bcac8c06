import { z } from 'zod';
import { defaultLimits, type Limits, limitsId } from './limits.ts';
import { parseOrThrow, withinLimit } from './zod-problems.ts';

export interface Matrix {
  nx: number;
  ny: number;
  /** Slices of a volume (scored requests only); absent or 1: a 2D matrix. */
  nz?: number;
}

/**
 * Largest volume (nx·ny·nz voxels) a request may simulate: 2²³ voxels, e.g. 256×256×128. One
 * complex copy of it is 128 MiB, and a 3D run keeps a few (k-space, planes, reconstructions).
 */
export const MAX_VOLUME_VOXELS = 2 ** 23;

const cache = new Map<string, z.ZodType<Matrix, Matrix>>();

/**
 * The matrix piece of every request, built from the configured limits: integer sides from
 * `minSide` (1, or the SSIM window for requests that are scored) to limits.maxMatrixSide, the
 * one upper bound (a LimitError beyond it). One schema object per (limit, lower bound), so that the
 * OpenAPI names it once.
 */
export function matrixSchemaFor(
  limits: Limits,
  minSide = 1,
  whyMin = '',
  volumes = false,
): z.ZodType<Matrix, Matrix> {
  const key = `${limits.maxMatrixSide}|${minSide}|${whyMin}|${volumes}`;
  let schema = cache.get(key);
  if (!schema) {
    const tooSmall = whyMin
      ? { error: (issue: { input?: unknown }) => `${String(issue.input)} is too small: ${whyMin}` }
      : {};
    const side = () => withinLimit(z.int().min(minSide, tooSmall), limits.maxMatrixSide);
    const sides = {
      nx: side().describe(
        'readout columns (kx); with a 2D source and protocol.dimensions 3d the second phase-encode axis kz',
      ),
      ny: side().describe('phase-encode rows (ky)'),
    };
    const depth = withinLimit(
      z
        .int()
        .min(1)
        .refine((nz) => nz === 1 || nz >= minSide, {
          error: (issue) => `${String(issue.input)} slices: ${whyMin || 'too few'}`,
          params: { allowed: `1 (2D) or ${minSide} … ${limits.maxMatrixSide}` },
        }),
      limits.maxMatrixSide,
    )
      .optional()
      .describe(
        'slices of a volume source (uploaded with slices=all, or the partitions of 3D raw data): in 3D ' +
          'the second phase-encode axis kz; absent or 1: 2D',
      );
    const object = volumes ? z.strictObject({ ...sides, nz: depth }) : z.strictObject(sides);
    schema = object
      .superRefine((m, ctx) => {
        const nz = (m as Matrix).nz ?? 1;
        if (nz > 1 && m.nx * m.ny * nz > MAX_VOLUME_VOXELS) {
          ctx.addIssue({
            code: 'custom',
            path: ['nz'],
            message: `${m.nx}×${m.ny}×${nz} voxels is larger than the configured limit`,
            params: { limit: true, allowed: `nx·ny·nz ≤ ${MAX_VOLUME_VOXELS}` },
          });
        }
      })
      .describe(
        volumes
          ? 'Image matrix: ny rows (phase encode) × nx columns (readout), × nz slices for a volume'
          : 'Image matrix: ny rows (phase encode) × nx columns (readout)',
      )
      .meta({ id: limitsId(minSide > 1 ? 'ScoredMatrix' : 'Matrix', limits, ['maxMatrixSide']) });
    cache.set(key, schema);
  }
  return schema;
}

/** Checks a matrix outside a request schema (scripts, tests): the same schema, the same problems. */
export function validateMatrix(matrix: unknown, limits: Limits = defaultLimits): Matrix {
  return parseOrThrow(matrixSchemaFor(limits), matrix, 'matrix');
}
