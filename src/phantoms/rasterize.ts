import type { RealImage } from '../core/real-image.ts';
import type { Shape } from './shape.ts';

/**
 * Raster of a sum of shapes on ny×nx pixels under the grid convention of grid.ts, each pixel the
 * average of ss×ss point samples on a regular sub-grid (ss = 1: the pixel centre):
 *   sample (s, t) of pixel (i, j) at x = (j − ⌊nx/2⌋)·hx + ((s + ½)/ss − ½)·hx,
 *                                    y = −(i − ⌊ny/2⌋)·hy − ((t + ½)/ss − ½)·hy,
 * with hx = 2/nx, hy = 2/ny. A sample counts when it lies in the closed shape.
 *
 * Instead of testing every sample, each fine row asks the shape for the x interval it covers
 * (shapes are convex) and counts the fine columns in it per pixel, so the cost is one interval per
 * fine row and one add per covered pixel; no per-pixel objects. The two end samples of each run are
 * settled with the shape's own point test, so a sample lying on an edge is counted exactly as
 * `contains` decides, whatever the rounding of the interval.
 */
export function rasterizeShapes(shapes: readonly Shape[], nx: number, ny: number, ss: number): RealImage {
  const data = new Float64Array(nx * ny);
  const hx = 2 / nx;
  const hy = 2 / ny;
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const fineCols = nx * ss;
  const fineRows = ny * ss;
  // Fine column m = j·ss + s and fine row r = i·ss + t (row 0 at the top).
  const xAt = (m: number): number => {
    const j = Math.floor(m / ss);
    return (j - cx) * hx + ((m - j * ss + 0.5) / ss - 0.5) * hx;
  };
  const yAt = (r: number): number => {
    const i = Math.floor(r / ss);
    return -(i - cy) * hy - ((r - i * ss + 0.5) / ss - 0.5) * hy;
  };
  // Approximate positions (for index arithmetic only): x ≈ x0 + m·dX, y ≈ y0 − r·dY.
  const dX = hx / ss;
  const dY = hy / ss;
  const xFine0 = xAt(0);
  const yFine0 = yAt(0);
  const span = new Float64Array(2);
  for (const shape of shapes) {
    const weight = shape.intensity / (ss * ss);
    shape.yRange(span);
    // One fine row of margin either side; spanAtY decides the rows at the very edge.
    const rFirst = Math.max(0, Math.ceil((yFine0 - span[1]) / dY) - 1);
    const rLast = Math.min(fineRows - 1, Math.floor((yFine0 - span[0]) / dY) + 1);
    for (let r = rFirst; r <= rLast; r++) {
      const y = yAt(r);
      if (!shape.spanAtY(y, span)) continue;
      let m0 = Math.min(fineCols, Math.max(0, Math.ceil((span[0] - xFine0) / dX)));
      let m1 = Math.max(-1, Math.min(fineCols - 1, Math.floor((span[1] - xFine0) / dX)));
      while (m0 > 0 && shape.contains(xAt(m0 - 1), y)) m0--;
      while (m0 <= m1 && !shape.contains(xAt(m0), y)) m0++;
      while (m1 < fineCols - 1 && m1 >= m0 - 1 && shape.contains(xAt(m1 + 1), y)) m1++;
      while (m1 >= m0 && !shape.contains(xAt(m1), y)) m1--;
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
