import { describe, expect, it } from 'vitest';
import { Ellipse, type EllipseParams } from '../../src/phantoms/ellipse.ts';
import { ellipseTransformByQuadrature } from './quadrature.ts';
import {
  distance,
  expectSameTransform,
  SHAPE_FREQUENCIES as FREQUENCIES,
  itObeysTransformTheorems,
  shapeTransform,
  spanLinesAgreeingWithContains,
  transformAt,
  validationField,
} from './transform-checks.ts';

const ELLIPSE_3: EllipseParams = { x0: 0.22, y0: 0, a: 0.11, b: 0.31, thetaDeg: -18, intensity: 1 };
const TILTED: EllipseParams = { x0: 0.3, y0: -0.2, a: 0.25, b: 0.1, thetaDeg: 37, intensity: 1.5 };

describe('ellipse transform', () => {
  it('single Shepp–Logan ellipse #3 at (1.5, 0) equals the 4000² brute-force sum (docs/references.md §1.2, tol 2e-6)', () => {
    const value = transformAt(new Ellipse(ELLIPSE_3), 1.5, 0);
    expect(distance(value, [-0.040907, -0.074409])).toBeLessThan(2e-6);
  });

  it('equals ρπab at k = 0 (docs/references.md §1.2 limit)', () => {
    const value = transformAt(new Ellipse(TILTED), 0, 0);
    expect(value[0]).toBeCloseTo(1.5 * Math.PI * 0.25 * 0.1, 15);
    expect(value[1]).toBe(0);
  });

  itObeysTransformTheorems({
    make: (p: EllipseParams) => new Ellipse(p),
    quadrature: {
      rule: 'direct Gauss–Legendre × trapezoid integration over the ellipse',
      instances: [ELLIPSE_3, TILTED],
      transform: ellipseTransformByQuadrature,
      tolerance: 1e-13,
    },
    tilted: TILTED,
    shift: [0.137, -0.41],
    shiftTolerance: 1e-13,
    rotationDeg: 23,
    rotationTolerance: 1e-13,
    hermitianTolerance: 1e-15,
  });

  it('treats the swapped-axis variants of docs/references.md §1.1 (a ↔ b, θ + 90°) as the same shape', () => {
    const pairs: [EllipseParams, EllipseParams][] = [
      [ELLIPSE_3, { ...ELLIPSE_3, a: 0.31, b: 0.11, thetaDeg: 72 }],
      [
        { x0: -0.22, y0: 0, a: 0.16, b: 0.41, thetaDeg: 18, intensity: 1 },
        { x0: -0.22, y0: 0, a: 0.41, b: 0.16, thetaDeg: 108, intensity: 1 },
      ],
      [
        { x0: 0.06, y0: -0.605, a: 0.023, b: 0.046, intensity: 1 },
        { x0: 0.06, y0: -0.605, a: 0.046, b: 0.023, thetaDeg: 90, intensity: 1 },
      ],
    ];
    for (const [p, q] of pairs) {
      expectSameTransform(shapeTransform(new Ellipse(p)), shapeTransform(new Ellipse(q)), FREQUENCIES, 1e-14);
    }
  });
});

describe('ellipse geometry', () => {
  it('contains its centre and the tips of its rotated axes, and not points just beyond them (docs/references.md §1.1 inside test)', () => {
    const e = new Ellipse(TILTED);
    const t = (37 * Math.PI) / 180;
    const along = (scale: number): [number, number] => [
      TILTED.x0 + scale * 0.25 * Math.cos(t),
      TILTED.y0 + scale * 0.25 * Math.sin(t),
    ];
    const across = (scale: number): [number, number] => [
      TILTED.x0 - scale * 0.1 * Math.sin(t),
      TILTED.y0 + scale * 0.1 * Math.cos(t),
    ];
    expect(e.contains(TILTED.x0, TILTED.y0)).toBe(true);
    expect(e.contains(...along(0.999))).toBe(true);
    expect(e.contains(...along(1.001))).toBe(false);
    expect(e.contains(...across(-0.999))).toBe(true);
    expect(e.contains(...across(-1.001))).toBe(false);
  });

  it('reports per-line spans whose inside and outside agree with the point test', () => {
    expect(spanLinesAgreeingWithContains(new Ellipse(TILTED), 0.0037)).toBeGreaterThan(50);
  });

  it('rejects a non-positive semi-axis with a ValidationError naming ellipse.a', () => {
    for (const a of [0, -1]) expect(validationField(() => new Ellipse({ ...TILTED, a }))).toBe('ellipse.a');
  });
});
