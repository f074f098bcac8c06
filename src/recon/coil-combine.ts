import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { type CoilMaps, type MultiCoilArray, transformPlaneInPlace } from '../encoding/index.ts';
import type { CoilData } from './method.ts';

/** F⁻¹ of every coil's k-space plane (centred orthonormal DFT, as ifft2c), into a new array. */
export function coilImages(kspace: MultiCoilArray): MultiCoilArray {
  const { coils, nx, ny } = kspace;
  const out = { coils, nx, ny, data: kspace.data.slice() };
  for (let c = 0; c < coils; c++) transformPlaneInPlace(out.data, c * nx * ny, nx, ny, 1);
  return out;
}

/**
 * One image from coil images. With maps, the sensitivity-weighted combination
 *   x = Σ_c S_c*·x_c / Σ_c |S_c|²
 * (Roemer et al. 1990; on prewhitened data and maps it is the noise-optimal SᴴΨ⁻¹x / SᴴΨ⁻¹S), 0 where
 * no coil sees the pixel. Without maps, the root-sum-of-squares √(Σ_c |x_c|²), real and non-negative
 * (common practice).
 */
export function combineCoilImages(images: MultiCoilArray, maps?: CoilMaps): ComplexImage {
  const { coils, nx, ny, data } = images;
  const n = nx * ny;
  const out = createComplexImage(nx, ny);
  for (let i = 0; i < n; i++) {
    let re = 0;
    let im = 0;
    let weight = 0;
    for (let c = 0; c < coils; c++) {
      const at = 2 * (c * n + i);
      const xr = data[at];
      const xi = data[at + 1];
      if (maps) {
        const sr = maps.data[at];
        const si = maps.data[at + 1];
        re += sr * xr + si * xi;
        im += sr * xi - si * xr;
        weight += sr * sr + si * si;
      } else {
        re += xr * xr + xi * xi;
      }
    }
    if (maps) {
      if (weight > 0) {
        out.data[2 * i] = re / weight;
        out.data[2 * i + 1] = im / weight;
      }
    } else {
      out.data[2 * i] = Math.sqrt(re);
    }
  }
  return out;
}

/** The zero-filled multi-coil image: each coil's acquired k-space inverted, then combined (maps or RSS). */
export function zeroFilledCoilCombination(coils: CoilData): ComplexImage {
  return combineCoilImages(coilImages(coils.kspace), coils.maps);
}
