import type { RealImage } from '../core/real-image.ts';

/**
 * Bilinear resampling of a real image to ny×nx, pixel centres mapped onto pixel centres
 * (source coordinate = (i + ½)·n_src/n_dst − ½, clamped at the edges). Used when an uploaded image
 * does not match the requested matrix; the outcome notes say so.
 */
export function resampleBilinear(image: RealImage, nx: number, ny: number): RealImage {
  if (image.nx === nx && image.ny === ny) return image;
  const out = new Float64Array(nx * ny);
  const sx = image.nx / nx;
  const sy = image.ny / ny;
  for (let i = 0; i < ny; i++) {
    const y = Math.min(Math.max((i + 0.5) * sy - 0.5, 0), image.ny - 1);
    const y0 = Math.floor(y);
    const y1 = Math.min(y0 + 1, image.ny - 1);
    const fy = y - y0;
    for (let j = 0; j < nx; j++) {
      const x = Math.min(Math.max((j + 0.5) * sx - 0.5, 0), image.nx - 1);
      const x0 = Math.floor(x);
      const x1 = Math.min(x0 + 1, image.nx - 1);
      const fx = x - x0;
      const d = image.data;
      const top = d[y0 * image.nx + x0] * (1 - fx) + d[y0 * image.nx + x1] * fx;
      const bottom = d[y1 * image.nx + x0] * (1 - fx) + d[y1 * image.nx + x1] * fx;
      out[i * nx + j] = top * (1 - fy) + bottom * fy;
    }
  }
  return { nx, ny, data: out };
}
