import { ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { CONTRAST_DETAIL_LAYOUT, contrastDetailDisc } from '../phantoms/contrast-detail.ts';
import { gridKx, gridKy, gridScale } from '../phantoms/grid.ts';
import type { Lesion } from './lesion.ts';

/** One disc of the contrast–detail phantom as a lesion, with its design values. */
export interface ContrastDetailCell {
  /** Diameter in phantom units (the column) and contrast (the row). */
  diameterUnits: number;
  contrast: number;
  /** Centre rounded to the nearest pixel (exact when the side is a multiple of 16); diameter in pixels along x. */
  lesion: Lesion;
  /** ifft2c of the disc's exact grid k-space: its fully sampled noiseless response. */
  template: ComplexImage;
}

/**
 * The 25 discs of `contrast-detail` as lesions on an ny×nx grid, row by row (contrast) and column
 * by column (diameter). A study runs the full phantom as "with" and contrastDetailBackground() as
 * "without", so the response is exactly the discs' (DEVELOPERS.md "Feature fidelity").
 */
export function contrastDetailCells(nx: number, ny: number): ContrastDetailCell[] {
  const { diameters, contrasts, background } = CONTRAST_DETAIL_LAYOUT;
  const kxAxis = Float64Array.from({ length: nx }, (_, u) => gridKx(u, nx));
  const kyAxis = Float64Array.from({ length: ny }, (_, v) => gridKy(v, ny));
  const scale = gridScale(nx, ny);
  const cells: ContrastDetailCell[] = [];
  for (let row = 0; row < contrasts.length; row++) {
    for (let col = 0; col < diameters.length; col++) {
      const disc = contrastDetailDisc(row, col);
      const k = createComplexImage(nx, ny);
      disc.addGridTransform(kxAxis, kyAxis, k.data);
      for (let i = 0; i < k.data.length; i++) k.data[i] *= scale;
      cells.push({
        diameterUnits: diameters[col],
        contrast: contrasts[row],
        lesion: {
          row: Math.round(Math.floor(ny / 2) - (disc.y0 * ny) / 2),
          col: Math.round(Math.floor(nx / 2) + (disc.x0 * nx) / 2),
          diameter: (diameters[col] * nx) / 2,
          amplitude: contrasts[row] * background.intensity,
          shape: 'disc',
        },
        template: ifft2c(k),
      });
    }
  }
  return cells;
}

/** One point of a contrast–detail curve: the smallest contrast resolved at a diameter, or null. */
export interface ContrastDetailPoint {
  diameterUnits: number;
  diameterPixels: number;
  smallestContrast: number | null;
}

/**
 * The contrast–detail curve of one reconstruction: per diameter, the smallest contrast such that
 * this disc and every disc of higher contrast at that diameter are resolved (Rose's criterion), so
 * one lucky noise draw below an unresolved disc does not lower the curve; null when even the
 * highest contrast is not resolved. `resolved[i]` belongs to `cells[i]`.
 */
export function contrastDetailCurve(
  cells: readonly ContrastDetailCell[],
  resolved: readonly boolean[],
): ContrastDetailPoint[] {
  if (resolved.length !== cells.length) throw new RangeError('one resolved flag per cell is needed');
  const diameters = [...new Set(cells.map((c) => c.diameterUnits))];
  return diameters.map((d) => {
    const column = cells
      .map((cell, i) => ({ cell, ok: resolved[i] }))
      .filter(({ cell }) => cell.diameterUnits === d)
      .sort((a, b) => b.cell.contrast - a.cell.contrast);
    let smallest: number | null = null;
    for (const { cell, ok } of column) {
      if (!ok) break;
      smallest = cell.contrast;
    }
    return { diameterUnits: d, diameterPixels: column[0].cell.lesion.diameter, smallestContrast: smallest };
  });
}
