import { assertMatrixSize } from '../src/core/complex-image.ts';
import { ValidationError } from '../src/core/errors.ts';
import { defaultLimits, type Limits } from '../src/core/limits.ts';
import type { Matrix } from '../src/core/matrix.ts';
import { cartesianRandomMask } from './cartesian-random.ts';
import { cartesianUniformMask } from './cartesian-uniform.ts';
import { decodeCustomMask } from './custom.ts';
import { latticeMask } from './lattice.ts';
import { spiralMask } from './non-cartesian.ts';
import { applyPartialFourier } from './partial-fourier.ts';
import { poissonDiscMask } from './poisson-disc.ts';
import { radialMask } from './radial.ts';
import type { SampledMask } from './sampled-mask.ts';
import type { SamplingSpec } from './schema.ts';

/**
 * Generates the mask of a sampling spec on a matrix, synchronously, for every pattern but `custom`
 * (whose PNG is decoded asynchronously by resolveSampling). Matrix and spec are validated once, at
 * the edge (the request schema, or validateMatrix + parseSampling); this trusts them and checks only
 * what needs the matrix (R too high for it, ACS wider than N/R). A malformed matrix is a programming
 * mistake (RangeError). `signal` lets a caller cancel the one pattern that takes long on big matrices (poisson-disc).
 */
export function generateMask(
  matrix: Matrix,
  spec: SamplingSpec,
  // Kept in the signature for resolveSampling's callers: the limits were checked at the edge.
  _limits: Limits = defaultLimits,
  signal?: AbortSignal,
): SampledMask {
  assertMatrixSize(matrix.nx, matrix.ny);
  switch (spec.pattern) {
    case 'cartesian-uniform':
      return applyPartialFourier(cartesianUniformMask(matrix, spec), spec.partialFourier);
    case 'cartesian-random':
      return applyPartialFourier(cartesianRandomMask(matrix, spec), spec.partialFourier);
    case 'poisson-disc':
      return applyPartialFourier(poissonDiscMask(matrix, spec, signal), spec.partialFourier);
    case 'lattice':
      return applyPartialFourier(latticeMask(matrix, spec), spec.partialFourier);
    case 'radial':
      return radialMask(matrix, spec);
    case 'spiral':
      return spiralMask(matrix, spec);
    case 'custom':
      throw new ValidationError({
        field: 'sampling.pattern',
        message: "a 'custom' mask is a PNG to decode: use resolveSampling",
        allowed:
          "'cartesian-uniform', 'cartesian-random', 'poisson-disc', 'radial', 'spiral', 'lattice' (custom through resolveSampling)",
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
  if (spec.pattern === 'custom') {
    assertMatrixSize(matrix.nx, matrix.ny);
    return applyPartialFourier(await decodeCustomMask(matrix, spec, limits), spec.partialFourier);
  }
  return generateMask(matrix, spec, limits, signal);
}
