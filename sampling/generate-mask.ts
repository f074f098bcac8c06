import { ValidationError } from '../src/core/errors.ts';
import { defaultLimits, type Limits } from '../src/core/limits.ts';
import { type Matrix, validateMatrix } from '../src/core/matrix.ts';
import { cartesianRandomMask } from './cartesian-random.ts';
import { cartesianUniformMask } from './cartesian-uniform.ts';
import { decodeCustomMask } from './custom.ts';
import { poissonDiscMask } from './poisson-disc.ts';
import { radialMask } from './radial.ts';
import type { SampledMask } from './sampled-mask.ts';
import { parseSampling, type SamplingSpec } from './schema.ts';

/**
 * Generates the mask of a sampling spec on a matrix, synchronously, for every pattern but `custom`
 * (whose PNG is decoded asynchronously by resolveSampling). Matrix and spec are validated here too,
 * so a caller that skipped the schema still gets ValidationError / LimitError naming the field.
 * `signal` lets a caller cancel the one pattern that takes long on big matrices (poisson-disc).
 */
export function generateMask(
  matrix: Matrix,
  spec: SamplingSpec,
  limits: Limits = defaultLimits,
  signal?: AbortSignal,
): SampledMask {
  const size = validateMatrix(matrix, limits);
  const parsed = parseSampling(spec);
  switch (parsed.pattern) {
    case 'cartesian-uniform':
      return cartesianUniformMask(size, parsed);
    case 'cartesian-random':
      return cartesianRandomMask(size, parsed);
    case 'poisson-disc':
      return poissonDiscMask(size, parsed, signal);
    case 'radial':
      return radialMask(size, parsed);
    case 'custom':
      throw new ValidationError({
        field: 'sampling.pattern',
        message: "a 'custom' mask is a PNG to decode: use resolveSampling",
        allowed:
          "'cartesian-uniform', 'cartesian-random', 'poisson-disc', 'radial' (custom through resolveSampling)",
      });
  }
}

/** Like generateMask, and also decodes a custom mask's PNG (sharp). */
export async function resolveSampling(
  matrix: Matrix,
  spec: SamplingSpec,
  limits: Limits = defaultLimits,
  signal?: AbortSignal,
): Promise<SampledMask> {
  const size = validateMatrix(matrix, limits);
  const parsed = parseSampling(spec);
  if (parsed.pattern === 'custom') return decodeCustomMask(size, parsed, limits);
  return generateMask(size, parsed, limits, signal);
}
