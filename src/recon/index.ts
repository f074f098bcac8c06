import { assertMatrixSize } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { defaultLimits } from '../core/limits.ts';
import type { ReconInput, ReconOptions, ReconOutput } from './method.ts';
import { type MethodSpec, reconMethods, runMethod } from './registry.ts';

export { zeroFilledPeak } from './cs-tv.ts';
export type { ReconInput, ReconMethod, ReconOptions, ReconOutput } from './method.ts';
export { type MethodName, type MethodSpec, methodSchema, methodSchemaFor, reconMethods } from './registry.ts';
export { zeroFilledImage } from './zero-filled.ts';

/**
 * Reconstructs one image from acquired k-space: looks the method up by name, checks the input
 * shape and the limits, and runs it. Bad parameters → ValidationError naming `method.*`;
 * work beyond `limits` → LimitError; a fired `signal` → CancelledError between iterations.
 */
export function reconstruct(input: ReconInput, method: MethodSpec, options: ReconOptions = {}): ReconOutput {
  const limits = options.limits ?? defaultLimits;
  const name = (method as { name?: unknown } | undefined)?.name;
  if (typeof name !== 'string' || !reconMethods.has(name)) {
    throw new ValidationError({
      field: 'method.name',
      message: `unknown method ${JSON.stringify(name)}`,
      allowed: [...reconMethods.keys()].join(' | '),
    });
  }
  const { kspace, mask, density } = input;
  // The matrix was checked against the limits at the edge; a malformed one is a programming mistake.
  assertMatrixSize(kspace.nx, kspace.ny);
  const n = kspace.nx * kspace.ny;
  if (kspace.data.length !== 2 * n || mask.length !== n || (density !== undefined && density.length !== n)) {
    throw new ValidationError({
      field: 'sampling',
      message: `k-space, mask and density must all cover the ${kspace.ny}×${kspace.nx} matrix`,
      allowed: `mask length ${n}, k-space length ${2 * n}`,
    });
  }
  return runMethod(input, method, { signal: options.signal, limits });
}
