import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import type { CoilMaps, MultiCoilArray } from '../encoding/index.ts';

/**
 * One image from per-coil images: with maps the sensitivity-weighted combination
 * Σ_c conj(S_c)·x_c / Σ_c |S_c|² (Roemer et al. 1990, docs/references.md §5.4; 0 where Σ|S_c|² = 0), without maps the
 * root-sum-of-squares √(Σ_c |x_c|²) (real, non-negative; Roemer et al. 1990).
 */
export function combineCoilImages(images: MultiCoilArray, maps?: CoilMaps): ComplexImage {
  const { nx, ny, coils, data } = images;
  const n = nx * ny;
  const out = createComplexImage(nx, ny);
  const o = out.data;
  if (!maps) {
    for (let i = 0; i < n; i++) {
      let sum = 0;
      for (let c = 0; c < coils; c++) {
        const k = 2 * (c * n + i);
        sum += data[k] * data[k] + data[k + 1] * data[k + 1];
      }
      o[2 * i] = Math.sqrt(sum);
    }
    return out;
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
      re += sr * data[k] + si * data[k + 1];
      im += sr * data[k + 1] - si * data[k];
      weight += sr * sr + si * si;
    }
    if (weight > 0) {
      o[2 * i] = re / weight;
      o[2 * i + 1] = im / weight;
    }
  }
  return out;
}
