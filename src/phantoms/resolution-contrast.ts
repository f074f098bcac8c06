import { Ellipse } from './ellipse.ts';
import { ShapePhantom } from './phantom.ts';
import { Rectangle } from './rectangle.ts';
import type { Shape } from './shape.ts';

/**
 * Layout of the resolution-and-contrast phantom (our own design, phantom units, y up):
 * - a background disc of radius 0.9 and intensity 0.5;
 * - upper row (centre y = 0.42): line-pair groups whose bars run along y, so they resolve along x
 *   (readout); middle row (centre y = 0.08): the same groups turned 90°, resolving along y
 *   (phase encode). Each group has 4 bars of width w separated by gaps of w (one line pair = 2w),
 *   bars 0.18 long and 0.5 brighter than the background; w falls from 0.05 to 0.01 left to right.
 *   A bar pattern can be resolved on an n-point grid only when w ≥ 2/n (docs/references.md §1.5), so at
 *   n = 128 the two finest groups are below the pixel size and at n = 256 all are above it;
 * - lower three rows: discs of radius 0.08, 0.05, 0.03, 0.015 (left to right) whose intensity
 *   exceeds the background by 10 %, 5 % and 2.5 % (top to bottom row).
 */
export const RESOLUTION_CONTRAST_LAYOUT = Object.freeze({
  background: { radius: 0.9, intensity: 0.5 },
  bars: {
    widths: [0.05, 0.035, 0.025, 0.015, 0.01],
    perGroup: 4,
    length: 0.18,
    intensity: 0.5,
    alongXCentreY: 0.42,
    alongYCentreY: 0.08,
    groupGap: 0.06,
  },
  discs: {
    radii: [0.08, 0.05, 0.03, 0.015],
    columnsX: [-0.42, -0.14, 0.14, 0.42],
    rowsY: [-0.3, -0.48, -0.66],
    contrasts: [0.1, 0.05, 0.025],
  },
});

/** Centre x of each bar group: columns as wide as the group's larger extent, packed around x = 0. */
export function barGroupCentres(): number[] {
  const { widths, perGroup, length, groupGap } = RESOLUTION_CONTRAST_LAYOUT.bars;
  const columns = widths.map((w) => Math.max((2 * perGroup - 1) * w, length));
  const total = columns.reduce((s, c) => s + c, 0) + groupGap * (columns.length - 1);
  const centres: number[] = [];
  let left = -total / 2;
  for (const c of columns) {
    centres.push(left + c / 2);
    left += c + groupGap;
  }
  return centres;
}

function barShapes(): Shape[] {
  const { widths, perGroup, length, intensity, alongXCentreY, alongYCentreY } =
    RESOLUTION_CONTRAST_LAYOUT.bars;
  const centres = barGroupCentres();
  const shapes: Shape[] = [];
  widths.forEach((w, g) => {
    for (let k = 0; k < perGroup; k++) {
      // Bar k's offset from the group centre: bars and gaps of width w, pattern period 2w.
      const offset = (2 * k - (perGroup - 1)) * w;
      shapes.push(
        new Rectangle({ x0: centres[g] + offset, y0: alongXCentreY, wx: w, wy: length, intensity }),
      );
      shapes.push(
        new Rectangle({ x0: centres[g], y0: alongYCentreY + offset, wx: length, wy: w, intensity }),
      );
    }
  });
  return shapes;
}

function discShapes(): Shape[] {
  const { background, discs } = RESOLUTION_CONTRAST_LAYOUT;
  const shapes: Shape[] = [];
  discs.rowsY.forEach((y0, row) => {
    discs.columnsX.forEach((x0, col) => {
      const r = discs.radii[col];
      const intensity = discs.contrasts[row] * background.intensity;
      shapes.push(new Ellipse({ x0, y0, a: r, b: r, intensity }));
    });
  });
  return shapes;
}

export function resolutionContrast(): ShapePhantom {
  const { background } = RESOLUTION_CONTRAST_LAYOUT;
  return new ShapePhantom(
    'resolution-contrast',
    'Resolution and contrast test object: a disc with line-pair bar groups along x and along y ' +
      '(bar widths 0.05 to 0.01 units) and low-contrast discs (10 %, 5 %, 2.5 %) of decreasing size.',
    [
      new Ellipse({
        x0: 0,
        y0: 0,
        a: background.radius,
        b: background.radius,
        intensity: background.intensity,
      }),
      ...barShapes(),
      ...discShapes(),
    ],
  );
}
