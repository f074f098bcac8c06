import { generateMask } from '../../sampling/index.ts';
import { coilArrayMaps } from '../../src/coils/index.ts';
import {
  type ComplexImage,
  complexFromReal,
  createComplexImage,
  magnitude,
} from '../../src/core/complex-image.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { CartesianEncoding, type CoilMaps, type MultiCoilKspace } from '../../src/encoding/index.ts';
import { nrmse } from '../../src/metrics/index.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import type { ReconInput } from '../../src/recon/index.ts';

/** The 8-loop array of the multi-coil checks (phantom-frame units; DEVELOPERS.md "coil arrays"). */
export const EIGHT_LOOPS = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 } as const;

/**
 * Noiseless multi-coil data by the exact discrete model: y = E x with x the modified Shepp–Logan
 * raster and E = CartesianEncoding(mask, maps) of the 8 loops (maps normalised so Σ_c |S_c|² = 1,
 * hence the sensitivity-weighted reference Σ S_c* F⁻¹y_c / Σ|S_c|² of the full data is x itself).
 */
export function loopCoilProblem(
  n: number,
  mask: Uint8Array,
): { truth: ComplexImage; maps: CoilMaps; kspace: MultiCoilKspace; operator: CartesianEncoding } {
  const raster = getPhantom('shepp-logan-modified').rasterize(n, n);
  const truth = complexFromReal(raster.data, n, n);
  const maps = coilArrayMaps(EIGHT_LOOPS, n, n);
  const operator = new CartesianEncoding(n, n, mask, maps);
  return { truth, maps, kspace: operator.forward(truth), operator };
}

/** A recon input carrying coil data (the single-coil k-space is unused by the multi-coil methods). */
export function coilInput(mask: Uint8Array, kspace: MultiCoilKspace, maps?: CoilMaps): ReconInput {
  return {
    kspace: createComplexImage(kspace.nx, kspace.ny),
    mask,
    coils: maps ? { kspace, maps } : { kspace },
  };
}

export function lineMask(
  n: number,
  pattern: 'cartesian-random' | 'cartesian-uniform',
  r: number,
  acs: number,
): Uint8Array {
  return generateMask({ nx: n, ny: n }, { pattern, acceleration: r, acs, seed: 1 }).mask;
}

/** NRMSE of magnitudes (docs/design.md §3.6). */
export function magnitudeNrmse(estimate: ComplexImage, reference: ComplexImage): number {
  const real = (image: ComplexImage): RealImage => ({ nx: image.nx, ny: image.ny, data: magnitude(image) });
  return nrmse(real(estimate), real(reference));
}
