import { z } from 'zod';
import { ifft2c } from '../core/centered-fft.ts';
import { createComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { coilImages, combineCoilImages } from './coil-combination.ts';
import { griddingImage } from './gridding-recon.ts';
import type { CoilData, ReconInput, ReconMethod, ReconOutput } from './method.ts';

export const zeroFilledSchema = z.strictObject({
  name: z.literal('zero-filled'),
  densityCompensation: z
    .boolean()
    .optional()
    .describe('divide each acquired sample by its sampling probability (variable-density patterns only)'),
});
export type ZeroFilledSpec = z.infer<typeof zeroFilledSchema>;

/**
 * x = F_cᴴ(M ⊙ y) — the minimum-norm least-squares image (docs/references.md §5.1).
 * With density compensation, x = F_cᴴ(M ⊙ y / p): dividing by the per-point sampling probability p
 * makes the k-space estimate unbiased, E[M/p] = 1 (Pipe & Menon 1999 for the idea; on a Cartesian
 * grid the density is the pattern's own probability). Only applied when the pattern supplies a
 * density; `info.densityCompensated` says whether it was.
 * Multi-coil input: each coil is zero-filled the same way and the coil images are combined
 * (coil-combination.ts): sensitivity-weighted with `coils.maps`, else root-sum-of-squares;
 * `info.combination` says which.
 */
export function zeroFilledImage(input: ReconInput, densityCompensation = false): ReconOutput {
  if (input.trajectory) return griddingImage(input.trajectory, input.coils?.maps);
  const { kspace, mask, density } = input;
  if (input.coils) return zeroFilledCoils(input, input.coils, densityCompensation);
  const n = kspace.nx * kspace.ny;
  const masked = createComplexImage(kspace.nx, kspace.ny);
  const applyDensity = densityCompensation && density !== undefined;
  for (let i = 0; i < n; i++) {
    if (!mask[i]) continue;
    const w = applyDensity && density[i] > 0 ? 1 / density[i] : 1;
    masked.data[2 * i] = kspace.data[2 * i] * w;
    masked.data[2 * i + 1] = kspace.data[2 * i + 1] * w;
  }
  ifft2c(masked, masked);
  return {
    image: masked,
    info: {
      densityCompensated: applyDensity,
      ...(densityCompensation && !applyDensity
        ? { note: 'pattern has no sampling density; not compensated' }
        : {}),
    },
  };
}

function zeroFilledCoils(input: ReconInput, coils: CoilData, densityCompensation: boolean): ReconOutput {
  const { mask, density } = input;
  const applyDensity = densityCompensation && density !== undefined;
  let weights: Float64Array | undefined;
  if (applyDensity) {
    weights = new Float64Array(mask.length);
    for (let i = 0; i < mask.length; i++) weights[i] = density[i] > 0 ? 1 / density[i] : 1;
  }
  const { image, combination } = combineCoilImages(coilImages(coils.kspace, mask, weights), coils.maps);
  return {
    image,
    info: {
      densityCompensated: applyDensity,
      combination,
      coils: coils.kspace.coils,
      ...(densityCompensation && !applyDensity
        ? { note: 'pattern has no sampling density; not compensated' }
        : {}),
    },
  };
}

export const zeroFilled: ReconMethod<ZeroFilledSpec> = {
  name: 'zero-filled',
  schema: zeroFilledSchema,
  run(input, spec) {
    if (spec.densityCompensation !== undefined && typeof spec.densityCompensation !== 'boolean') {
      throw new ValidationError({
        field: 'method.densityCompensation',
        message: 'must be a boolean',
        allowed: 'true | false',
      });
    }
    return zeroFilledImage(input, spec.densityCompensation ?? false);
  },
};
