import { Ellipse } from './ellipse.ts';
import { ShapePhantom } from './phantom.ts';
import { Rectangle } from './rectangle.ts';

/**
 * Layout of the contrast–detail phantom (our own design, phantom units, y up): a uniform square
 * background 1.8 wide of intensity 1 carrying a 5 × 5 grid of discs. Columns (left to right) hold
 * the diameters 0.12, 0.06, 0.03, 0.02, 0.012 units (15.4, 7.7, 3.8, 2.6, 1.5 px at 256²); rows
 * (top to bottom) the contrasts 0.4, 0.2, 0.1, 0.05, 0.025, each disc adding contrast × the
 * background intensity. Centres are 0.375 = 3/8 units apart on x, y ∈ {0, ±0.375, ±0.75}, so they
 * fall on pixel centres whenever the side is a multiple of 16, and the alias of a row half a field
 * of view (1 unit) away lands 0.125 units from the nearest disc row, between rows. The discs add about 0.4 % to the
 * object's mean, so the contrasts are also relative to the mean intensity to that accuracy.
 */
export const CONTRAST_DETAIL_LAYOUT = Object.freeze({
  background: { width: 1.8, intensity: 1 },
  diameters: [0.12, 0.06, 0.03, 0.02, 0.012],
  contrasts: [0.4, 0.2, 0.1, 0.05, 0.025],
  positions: [-0.75, -0.375, 0, 0.375, 0.75],
});

/** The lesion-free background alone (the "without" run of a contrast–detail study). */
export function contrastDetailBackground(): ShapePhantom {
  const { width, intensity } = CONTRAST_DETAIL_LAYOUT.background;
  return new ShapePhantom(
    'contrast-detail-background',
    'Uniform square background of the contrast–detail phantom.',
    [new Rectangle({ x0: 0, y0: 0, wx: width, wy: width, intensity })],
  );
}

/** Disc of column `col` (diameter) and row `row` (contrast) of the grid. */
export function contrastDetailDisc(row: number, col: number): Ellipse {
  const { background, diameters, contrasts, positions } = CONTRAST_DETAIL_LAYOUT;
  const r = diameters[col] / 2;
  return new Ellipse({
    x0: positions[col],
    y0: -positions[row],
    a: r,
    b: r,
    intensity: contrasts[row] * background.intensity,
  });
}

export function contrastDetail(): ShapePhantom {
  const { diameters, contrasts } = CONTRAST_DETAIL_LAYOUT;
  const discs: Ellipse[] = [];
  for (let row = 0; row < contrasts.length; row++) {
    for (let col = 0; col < diameters.length; col++) discs.push(contrastDetailDisc(row, col));
  }
  return new ShapePhantom(
    'contrast-detail',
    'Contrast–detail test object: a uniform square with a 5 × 5 grid of discs, diameters 0.12 to 0.012 ' +
      'units (left to right) and contrasts 40 % to 2.5 % (top to bottom).',
    [...contrastDetailBackground().shapes, ...discs],
  );
}
