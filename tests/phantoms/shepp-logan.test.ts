import { describe, expect, it } from 'vitest';
import { Ellipse } from '../../src/phantoms/ellipse.ts';
import { ShapePhantom } from '../../src/phantoms/phantom.ts';
import { sheppLogan, sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import {
  type Complex,
  distance,
  expectHermitian,
  expectRotationTheorem,
  expectShiftTheorem,
  type TransformAt,
} from './transform-checks.ts';

function valueAt(phantom: ShapePhantom, kx: number, ky: number): Complex {
  const out = phantom.kspaceAt([kx], [ky]);
  return [out[0], out[1]];
}

const transformOf =
  (phantom: ShapePhantom): TransformAt =>
  (kx, ky) =>
    valueAt(phantom, kx, ky);

/** The same phantom with every ellipse moved by (dx, dy) and the whole turned by phi° about the origin. */
function transformed(phantom: ShapePhantom, phiDeg: number, dx: number, dy: number): ShapePhantom {
  const c = Math.cos((phiDeg * Math.PI) / 180);
  const s = Math.sin((phiDeg * Math.PI) / 180);
  const shapes = phantom.shapes.map((shape) => {
    if (!(shape instanceof Ellipse)) throw new Error('Shepp–Logan is made of ellipses');
    return new Ellipse({
      x0: c * shape.x0 - s * shape.y0 + dx,
      y0: s * shape.x0 + c * shape.y0 + dy,
      a: shape.a,
      b: shape.b,
      thetaDeg: shape.thetaDeg + phiDeg,
      intensity: shape.intensity,
    });
  });
  return new ShapePhantom('moved', 'moved copy', shapes);
}

const POINTS: Array<[number, number]> = [
  [0.5, 0],
  [0, 0.5],
  [1, -1.5],
  [2.5, 3],
  [-7.25, 4.5],
  [13.1, -0.3],
  [40, 63.5],
];

describe('Shepp–Logan analytic k-space', () => {
  it('K(0) = Σ ρπab: 0.4952646048 modified, 2.2017566919 with the 1974 intensities (docs/references.md §1.2, tol 1e-9)', () => {
    expect(distance(valueAt(sheppLoganModified(), 0, 0), [0.4952646048, 0])).toBeLessThan(1e-9);
    expect(distance(valueAt(sheppLogan(), 0, 0), [2.2017566919, 0])).toBeLessThan(1e-9);
  });

  it('matches the docs/references.md §1.2 values at (0.5, 0), (0, 0.5), (1, −1.5), (2.5, 3) (tol 1e-9)', () => {
    const modified = sheppLoganModified();
    expect(distance(valueAt(modified, 0.5, 0), [0.205105882, -0.0116814271])).toBeLessThan(1e-9);
    expect(distance(valueAt(modified, 0, 0.5), [0.0255806687, -0.0389715318])).toBeLessThan(1e-9);
    expect(distance(valueAt(modified, 1.0, -1.5), [-0.0224432046, 0.0245491907])).toBeLessThan(1e-9);
    expect(distance(valueAt(modified, 2.5, 3.0), [0.024555098, 0.0004853277])).toBeLessThan(1e-9);
    expect(distance(valueAt(sheppLogan(), 0.5, 0), [1.082506134, -0.0011681427])).toBeLessThan(1e-9);
  });

  it('is Hermitian, K(−k) = conj K(k), since the phantom is real (docs/references.md §1.2, tol 1e-12)', () => {
    for (const phantom of [sheppLogan(), sheppLoganModified()])
      expectHermitian(transformOf(phantom), POINTS, 1e-12);
  });

  it('shifting the whole phantom by d multiplies K by e^(−i2πk·d) (shift theorem, common practice)', () => {
    const phantom = sheppLoganModified();
    const d = [0.061, -0.113] as const;
    expectShiftTheorem(
      transformOf(phantom),
      transformOf(transformed(phantom, 0, d[0], d[1])),
      d,
      POINTS,
      1e-12,
    );
  });

  it('turning the whole phantom by φ about the origin turns K by φ (rotation theorem, common practice)', () => {
    const phantom = sheppLoganModified();
    expectRotationTheorem(
      transformOf(phantom),
      transformOf(transformed(phantom, 31, 0, 0)),
      31,
      POINTS,
      1e-12,
    );
  });
});

describe('Shepp–Logan raster', () => {
  // On a 200-pixel side the pixel centres are x = (j − 100)/100, y = −(i − 100)/100 (docs/design.md §3.3).
  const at = (image: { nx: number; data: Float64Array }, x: number, y: number) =>
    image.data[Math.round(100 - 100 * y) * image.nx + Math.round(100 + 100 * x)];

  it('has the tissue values of docs/references.md §1.1 (brain 1.02 and 0.2, skull 2.0 and 1.0) at known points', () => {
    const original = sheppLogan().rasterize(200, 200);
    const modified = sheppLoganModified().rasterize(200, 200);
    expect(at(original, 0, 0)).toBeCloseTo(1.02, 12);
    expect(at(modified, 0, 0)).toBeCloseTo(0.2, 12);
    // Skull: inside ellipse 1 (b = 0.92) above ellipse 2 (top at −0.0184 + 0.874).
    expect(at(original, 0, 0.9)).toBeCloseTo(2.0, 12);
    expect(at(modified, 0, 0.9)).toBeCloseTo(1.0, 12);
    // Ellipse 3's centre: brain plus −0.02 / −0.2.
    expect(at(original, 0.22, 0)).toBeCloseTo(1.0, 12);
    expect(at(modified, 0.22, 0)).toBeCloseTo(0.0, 12);
    expect(at(modified, 0.95, 0.95)).toBe(0);
  });

  it('puts y up: ellipse 5 (y0 = +0.35) appears in the upper half, row 0 at the top (docs/design.md §3.3)', () => {
    const modified = sheppLoganModified().rasterize(200, 200);
    expect(at(modified, 0, 0.35)).toBeCloseTo(0.3, 12);
    expect(at(modified, 0, -0.35)).toBeCloseTo(0.2, 12);
    // Ellipse 9 (centre y = −0.605, radius 0.023) covers y = −0.61; its mirror y = +0.61 is just above ellipse 5.
    expect(at(modified, 0, -0.61)).toBeCloseTo(0.3, 12);
    expect(at(modified, 0, 0.61)).toBeCloseTo(0.2, 12);
  });

  it('integrates to K(0): Σ pixels · hx·hy of an 8× supersampled 256² raster is within 1e-3 of Σ ρπab (midpoint rule)', () => {
    for (const phantom of [sheppLogan(), sheppLoganModified()]) {
      const image = phantom.rasterize(256, 256, { supersample: 8 });
      const sum = image.data.reduce((s, v) => s + v, 0) * (2 / 256) * (2 / 256);
      const k0 = valueAt(phantom, 0, 0)[0];
      expect(Math.abs(sum - k0) / k0).toBeLessThan(1e-3);
    }
  });
});
