import type { RealImage } from '../core/real-image.ts';
import type { MultiCoilArray } from '../encoding/index.ts';

/**
 * |S_c| of every coil side by side: ⌈√C⌉ tiles per row, coil 0 top left, row by row, each tile the
 * coil's ny×nx plane in picture orientation, unused tiles 0. One image, so one grey scale shows how
 * the coils' sensitivities compare.
 */
export function coilMagnitudeMontage(maps: MultiCoilArray): RealImage {
  const { coils, nx, ny, data } = maps;
  const across = Math.ceil(Math.sqrt(coils));
  const down = Math.ceil(coils / across);
  const width = across * nx;
  const out = new Float64Array(width * down * ny);
  for (let c = 0; c < coils; c++) {
    const left = (c % across) * nx;
    const top = Math.floor(c / across) * ny;
    for (let i = 0; i < ny; i++) {
      for (let j = 0; j < nx; j++) {
        const at = 2 * (c * nx * ny + i * nx + j);
        out[(top + i) * width + left + j] = Math.hypot(data[at], data[at + 1]);
      }
    }
  }
  return { nx: width, ny: down * ny, data: out };
}

/** g shown white at this value and above (linear from black at 0, so g = 1 is a third grey). */
export const G_FACTOR_WHITE = 3;
