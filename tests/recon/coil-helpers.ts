import { generateMask } from '../../sampling/index.ts';
import {
  analyticCoilKspace,
  coilArrayMaps,
  evaluateTrigPolynomial,
  fitTrigPolynomial,
} from '../../src/coils/index.ts';
import { type ComplexImage, complexFromReal } from '../../src/core/complex-image.ts';
import { CartesianEncoding, type CoilMaps, type MultiCoilKspace } from '../../src/encoding/index.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import { coilImages, combineCoilImages, type ReconInput } from '../../src/recon/index.ts';
import { relativeError } from '../error-measures.ts';

/** The 8-loop array of the coil tests (loop radius 0.35, ring radius 1.25), normalised Σ|S_c|² = 1. */
export function loopMaps(n: number, count = 8): CoilMaps {
  return coilArrayMaps({ array: 'loops', count, loopRadius: 0.35, ringRadius: 1.25 }, n, n);
}

/** The modified Shepp–Logan raster (4×4 box average) as a complex image. */
export function phantomRaster(n: number): ComplexImage {
  const raster = getPhantom('shepp-logan-modified').rasterize(n, n, { supersample: 4 });
  return complexFromReal(raster.data, n, n);
}

/** A cartesian-uniform line mask (every R-th row through the centre, plus `acs` central rows). */
export function uniformLines(n: number, acceleration: number, acs: number): Uint8Array {
  return generateMask({ nx: n, ny: n }, { pattern: 'cartesian-uniform', acceleration, acs }).mask;
}

/** E x with the encoding's own maps: coil k-space exactly in the discrete model (the inverse crime, on purpose). */
export function encodedKspace(image: ComplexImage, mask: Uint8Array, maps: CoilMaps): MultiCoilKspace {
  return new CartesianEncoding(image.nx, image.ny, mask, maps).forward(image);
}

/** A multi-coil reconstruction input; `kspace` is the masked first coil (only its shape is read here). */
export function coilInput(kspace: MultiCoilKspace, mask: Uint8Array, maps?: CoilMaps): ReconInput {
  const n = kspace.nx * kspace.ny;
  return {
    kspace: { nx: kspace.nx, ny: kspace.ny, data: kspace.data.slice(0, 2 * n) },
    mask,
    coils: { kspace, ...(maps ? { maps } : {}) },
  };
}

/** NRMSE of complex images, ‖a − b‖ / ‖b‖. */
export function nrmse(a: ComplexImage, b: ComplexImage): number {
  return relativeError(a.data, b.data);
}

/** NRMSE of the magnitudes, ‖|a| − |b|‖ / ‖b‖ (the scores' comparison, docs/design.md §3.6). */
export function magnitudeNrmse(a: ComplexImage, b: ComplexImage): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < b.data.length; i += 2) {
    const ma = Math.hypot(a.data[i], a.data[i + 1]);
    const mb = Math.hypot(b.data[i], b.data[i + 1]);
    num += (ma - mb) ** 2;
    den += mb * mb;
  }
  return Math.sqrt(num / den);
}

/** Zeroes the unacquired samples of every coil plane, in place. */
export function maskCoils(kspace: MultiCoilKspace, mask: Uint8Array): MultiCoilKspace {
  const n = kspace.nx * kspace.ny;
  for (let c = 0; c < kspace.coils; c++) {
    for (let i = 0; i < n; i++) {
      if (mask[i]) continue;
      kspace.data[2 * (c * n + i)] = 0;
      kspace.data[2 * (c * n + i) + 1] = 0;
    }
  }
  return kspace;
}

/**
 * The 8-loop array fitted by trigonometric polynomials (P = 6, L = 2) and the exact analytic coil
 * k-space of the modified Shepp–Logan through those maps (Guerquin-Kern et al. 2012), with the
 * multi-coil reference Σ S_c*·F⁻¹y_c / Σ|S_c|² of the fully sampled data.
 */
export function analyticCoilProblem(n: number): {
  maps: CoilMaps;
  full: MultiCoilKspace;
  reference: ComplexImage;
} {
  const fit = fitTrigPolynomial(loopMaps(n), { order: 6, periodFactor: 2 });
  const maps = evaluateTrigPolynomial(fit, n, n);
  const full = analyticCoilKspace(getPhantom('shepp-logan-modified'), fit, n, n);
  const reference = combineCoilImages(coilImages(full), maps).image;
  return { maps, full, reference };
}
