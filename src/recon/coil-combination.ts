import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import {
  type CoilMaps,
  createMultiCoilArray,
  type MultiCoilArray,
  sumOfSquaresOverCoils,
  transformPlaneInPlace,
} from '../encoding/index.ts';
import type { CoilData } from './method.ts';

/** How coil images became one image: with the maps, or without them. */
export type CoilCombination = 'sensitivity-weighted' | 'root-sum-of-squares';

/**
 * The coil images F⁻¹(w ⊙ M ⊙ y_c), one plane per coil (coil-major), where w is an optional
 * per-sample weight (density compensation) and M the mask (when given, unacquired samples are
 * dropped; without it the data are taken as they are).
 */
export function coilImages(
  kspace: MultiCoilArray,
  mask?: Uint8Array,
  weights?: Float64Array,
): MultiCoilArray {
  const { coils, nx, ny } = kspace;
  const n = nx * ny;
  const images = createMultiCoilArray(coils, nx, ny);
  const source = kspace.data;
  const target = images.data;
  for (let c = 0; c < coils; c++) {
    const base = 2 * c * n;
    for (let i = 0; i < n; i++) {
      if (mask && !mask[i]) continue;
      const w = weights ? weights[i] : 1;
      target[base + 2 * i] = source[base + 2 * i] * w;
      target[base + 2 * i + 1] = source[base + 2 * i + 1] * w;
    }
    transformPlaneInPlace(target, c * n, nx, ny, 1);
  }
  return images;
}

/**
 * One image from coil images. With maps, the sensitivity-weighted combination
 *   x = Σ_c conj(S_c)·x_c / Σ_c |S_c|²
 * (the least-squares estimate of the object from fully sampled coil images with white noise,
 * Roemer et al. 1990; it returns the object itself when x_c = S_c·x), 0 where Σ|S_c|² = 0.
 * Without maps, the root-sum-of-squares √(Σ_c |x_c|²) (Roemer et al. 1990), a real image: it equals
 * |x| when the maps satisfy Σ|S_c|² = 1, and it loses the object's phase.
 */
export function combineCoilImages(
  images: MultiCoilArray,
  maps?: CoilMaps,
): { image: ComplexImage; combination: CoilCombination } {
  const { coils, nx, ny } = images;
  const n = nx * ny;
  const image = createComplexImage(nx, ny);
  const out = image.data;
  const d = images.data;
  if (!maps) {
    const power = sumOfSquaresOverCoils(images);
    for (let i = 0; i < n; i++) out[2 * i] = Math.sqrt(power[i]);
    return { image, combination: 'root-sum-of-squares' };
  }
  if (maps.coils !== coils || maps.nx !== nx || maps.ny !== ny) {
    throw new RangeError(
      `maps are ${maps.coils} coils of ${maps.ny}×${maps.nx}, images ${coils} of ${ny}×${nx}`,
    );
  }
  const s = maps.data;
  for (let i = 0; i < n; i++) {
    let re = 0;
    let im = 0;
    let weight = 0;
    for (let c = 0; c < coils; c++) {
      const k = 2 * (c * n + i);
      const sr = s[k];
      const si = s[k + 1];
      re += sr * d[k] + si * d[k + 1];
      im += sr * d[k + 1] - si * d[k];
      weight += sr * sr + si * si;
    }
    if (weight > 0) {
      out[2 * i] = re / weight;
      out[2 * i + 1] = im / weight;
    }
  }
  return { image, combination: 'sensitivity-weighted' };
}

/** The zero-filled multi-coil image: each coil's acquired k-space inverted, then combined (maps or RSS). */
export function zeroFilledCoilCombination(coils: CoilData): ComplexImage {
  return combineCoilImages(coilImages(coils.kspace), coils.maps).image;
}
