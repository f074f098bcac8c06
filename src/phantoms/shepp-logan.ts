import { Ellipse } from './ellipse.ts';
import { ShapePhantom } from './phantom.ts';

/**
 * Shepp–Logan head phantom geometry (Shepp & Logan 1974, as tabulated in docs/references.md §1.1):
 * [x0, y0, a, b, θ°], domain [−1, 1]², y up, θ counter-clockwise from +x, a along x before rotation.
 * This table is pinned: ellipse 9 at y0 = −0.605 (some copies use −0.606), ellipses 3 and 4 at ∓18°.
 */
const GEOMETRY: readonly (readonly [number, number, number, number, number])[] = [
  [0, 0, 0.69, 0.92, 0],
  [0, -0.0184, 0.6624, 0.874, 0],
  [0.22, 0, 0.11, 0.31, -18],
  [-0.22, 0, 0.16, 0.41, 18],
  [0, 0.35, 0.21, 0.25, 0],
  [0, 0.1, 0.046, 0.046, 0],
  [0, -0.1, 0.046, 0.046, 0],
  [-0.08, -0.605, 0.046, 0.023, 0],
  [0, -0.605, 0.023, 0.023, 0],
  [0.06, -0.605, 0.023, 0.046, 0],
];

/** Intensities of Shepp & Logan 1974 (skull 2.0, so the brain is 2.0 − 0.98 = 1.02). */
const INTENSITIES_1974 = [2.0, -0.98, -0.02, -0.02, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01];
/** Higher-contrast intensities of Toft 1996, pp. 199–200 (brain 1.0 − 0.8 = 0.2). */
const INTENSITIES_MODIFIED = [1.0, -0.8, -0.2, -0.2, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1];

function sheppLoganEllipses(intensities: readonly number[]): Ellipse[] {
  return GEOMETRY.map(
    ([x0, y0, a, b, thetaDeg], i) => new Ellipse({ x0, y0, a, b, thetaDeg, intensity: intensities[i] }),
  );
}

export function sheppLogan(): ShapePhantom {
  return new ShapePhantom(
    'shepp-logan',
    'Shepp–Logan head phantom with the original 1974 intensities (skull 2.0, brain 1.02): ten ellipses in [−1, 1]².',
    sheppLoganEllipses(INTENSITIES_1974),
  );
}

export function sheppLoganModified(): ShapePhantom {
  return new ShapePhantom(
    'shepp-logan-modified',
    'Shepp–Logan geometry with the higher-contrast intensities of Toft 1996 (skull 1.0, brain 0.2).',
    sheppLoganEllipses(INTENSITIES_MODIFIED),
  );
}
