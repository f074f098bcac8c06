import type { z } from 'zod';
import type { ComplexImage } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';

/** Acquired k-space (zeros where not sampled) with its mask and, for variable-density patterns, the sampling density. */
export interface ReconInput {
  kspace: ComplexImage;
  /** ny·nx, 1 = acquired; same row-major layout as `kspace`. */
  mask: Uint8Array;
  /** Per grid point sampling probability (0 < p ≤ 1 where sampled), for density compensation. */
  density?: Float64Array;
}

export interface ReconOptions {
  signal?: AbortSignal;
  limits?: Limits;
}

export interface ReconOutput {
  image: ComplexImage;
  info: Record<string, unknown>;
}

/**
 * One reconstruction method: its request schema (zod, also the OpenAPI source) and the solver.
 * `run` validates its own parameters (ValidationError naming `method.*` and the allowed range,
 * LimitError beyond `limits`) because plans and workers call it without going through HTTP.
 * Adding a method = one file exporting a ReconMethod + one line in registry.ts.
 */
export interface ReconMethod<Spec extends { name: string } = { name: string }> {
  readonly name: Spec['name'];
  readonly schema: z.ZodType<Spec>;
  run(input: ReconInput, spec: Spec, options: { signal?: AbortSignal; limits: Limits }): ReconOutput;
}
