import { z } from 'zod';
import type { Limits } from '../core/limits.ts';
import { matrixSchemaFor } from '../core/matrix.ts';
import { scoredMatrixSchemaFor } from '../pipeline/run-reconstruction.ts';
import { planSchemaFor } from '../plan/schema.ts';
import { methodSchemaFor } from '../recon/index.ts';

/**
 * The request pieces with the configured limits baked in (docs/design.md §4.3), so the parse at the
 * HTTP boundary checks everything that needs no computation: matrix sides (1, or 11 for scored
 * requests, up to limits.maxMatrixSide), method iterations (≤ limits.maxIterations) and plan cells.
 * A limit beyond its bound is a 422 /problems/limit-exceeded naming the field (error-handler.ts).
 */
export function requestSchemas(limits: Limits) {
  return {
    /** Masks and scan time: any side from 1. */
    matrix: matrixSchemaFor(limits),
    /** Reconstructions: one whole SSIM window (11×11) at least. */
    scoredMatrix: scoredMatrixSchemaFor(limits),
    method: methodSchemaFor(limits),
    plan: planSchemaFor(limits),
  };
}

export const idParams = z.object({ id: z.string().min(1).max(200).describe('Resource id') });

/**
 * One schema object per set of limits: a route body built from the limits carries an OpenAPI id,
 * and zod's registry maps an id to one object, so every app with the same limits (tests build
 * several in one process) must share it.
 */
export function perLimits<T>(build: (limits: Limits) => T): (limits: Limits) => T {
  const built = new Map<string, T>();
  return (limits) => {
    const key = JSON.stringify(limits);
    let value = built.get(key);
    if (value === undefined) {
      value = build(limits);
      built.set(key, value);
    }
    return value;
  };
}
