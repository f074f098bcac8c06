import { ifft2c } from '../core/centered-fft.ts';
import { contrastDetail, contrastDetailBackground } from '../phantoms/contrast-detail.ts';
import { phantomGridKspace } from '../phantoms/grid-kspace.ts';
import { type ContrastDetailCell, contrastDetailCells } from './contrast-detail-curve.ts';
import type { LesionSet } from './lesion-sources.ts';
import { objectSupport } from './object-support.ts';

/**
 * The `contrast-detail` phantom as a lesion set: without = the uniform background's exact grid
 * k-space, with = the whole phantom's, the 25 discs as lesions with their templates (row by row,
 * contrast; column by column, diameter), and the cells for contrastDetailCurve.
 */
export function contrastDetailLesionSet(nx: number, ny: number): LesionSet & { cells: ContrastDetailCell[] } {
  const cells = contrastDetailCells(nx, ny);
  const without = phantomGridKspace(contrastDetailBackground(), nx, ny);
  const reference = ifft2c(without);
  const { mask, meanIntensity } = objectSupport(reference);
  return {
    without,
    withLesions: phantomGridKspace(contrastDetail(), nx, ny),
    reference,
    objectMask: mask,
    meanIntensity,
    lesions: cells.map((c) => c.lesion),
    templates: cells.map((c) => c.template),
    cells,
  };
}
