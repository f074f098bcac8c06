import type { RealImage } from '../core/real-image.ts';
import type { Shape } from './shape.ts';

/**
 * Raster of a sum of shapes on ny×nx pixels under the grid convention of grid.ts, each pixel the
 * average of ss×ss point samples on a regular sub-grid (ss = 1: the pixel centre):
 *   sample (s, t) of pixel (i, j) at x = x_j + ((s + ½)/ss − ½)·hx,  y = y_i − ((t + ½)/ss − ½)·hy,
 * with hx = 2/nx, hy = 2/ny. A sample counts when it lies in the closed shape.
 *
 * Instead of testing every sample, each fine row asks the shape for the x interval it covers
 * (shapes are convex) and counts the fine columns in it per pixel, so the cost is one interval per
 * fine row and one add per covered pixel; no per-pixel objects.
 */
export function rasterizeShapes(shapes: readonly Shape[], nx: number, ny: number, ss: number): RealImage {
  const data = new Float64Array(nx * ny);
  const hx = 2 / nx;
  const hy = 2 / ny;
  const fineCols = nx * ss;
  const fineRows = ny * ss;
  // Fine column m sits at xFine0 + m·dX; fine row r at yFine0 − r·dY (row 0 at the top).
  const dX = hx / ss;
  const dY = hy / ss;
  const xFine0 = -Math.floor(nx / 2) * hx - 0.5 * hx + 0.5 * dX;
  const yFine0 = Math.floor(ny / 2) * hy + 0.5 * hy - 0.5 * dY;
  const span = new Float64Array(2);
  for (const shape of shapes) {
    const weight = shape.intensity / (ss * ss);
    shape.yRange(span);
    const rFirst = Math.max(0, Math.ceil((yFine0 - span[1]) / dY));
    const rLast = Math.min(fineRows - 1, Math.floor((yFine0 - span[0]) / dY));
    for (let r = rFirst; r <= rLast; r++) {
      if (!shape.spanAtY(yFine0 - r * dY, span)) continue;
      const m0 = Math.max(0, Math.ceil((span[0] - xFine0) / dX));
      const m1 = Math.min(fineCols - 1, Math.floor((span[1] - xFine0) / dX));
      if (m0 > m1) continue;
      addCoveredRun(data, Math.floor(r / ss) * nx, m0, m1, ss, weight);
    }
  }
  return { nx, ny, data };
}

/** Adds weight × (number of fine columns m0…m1 inside each pixel) to the pixels of one raster row. */
function addCoveredRun(
  data: Float64Array,
  rowStart: number,
  m0: number,
  m1: number,
  ss: number,
  weight: number,
): void {
  const p0 = Math.floor(m0 / ss);
  const p1 = Math.floor(m1 / ss);
  if (p0 === p1) {
    data[rowStart + p0] += (m1 - m0 + 1) * weight;
    return;
  }
  data[rowStart + p0] += ((p0 + 1) * ss - m0) * weight;
  const full = ss * weight;
  for (let p = p0 + 1; p < p1; p++) data[rowStart + p] += full;
  data[rowStart + p1] += (m1 - p1 * ss + 1) * weight;
}
