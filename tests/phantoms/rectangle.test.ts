import { describe, expect, it } from 'vitest';
import { Rectangle, type RectangleParams, sinc } from '../../src/phantoms/rectangle.ts';
import { rectangleTransformByQuadrature } from './quadrature.ts';
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

// The check rectangle of docs/references.md §1.5: ρ = 1, w = (0.4, 0.2), centre (0.1, −0.3).
const CHECK: RectangleParams = { x0: 0.1, y0: -0.3, wx: 0.4, wy: 0.2, intensity: 1 };
const TILTED: RectangleParams = { x0: -0.25, y0: 0.4, wx: 0.3, wy: 0.07, thetaDeg: 30, intensity: 0.8 };

describe('sinc', () => {
  it('is sin(πt)/(πt): 1 at 0, 2/π at ½, exactly 0 at non-zero integers (definition, docs/references.md §1.5)', () => {
    expect(sinc(0)).toBe(1);
    expect(sinc(0.5)).toBeCloseTo(2 / Math.PI, 15);
    expect(sinc(-1.5)).toBeCloseTo(-2 / (3 * Math.PI), 15);
    for (const n of [1, -2, 3, 1e6]) expect(Math.abs(sinc(n))).toBe(0);
  });
});

describe('rectangle transform', () => {
  it('reproduces the docs/references.md §1.5 check values (tol 1e-9)', () => {
    const r = new Rectangle(CHECK);
    expect(distance(transformAt(r, 0, 0), [0.08, 0])).toBeLessThan(1e-12);
    expect(distance(transformAt(r, 1, 0), [0.0489828548, -0.0355881272])).toBeLessThan(1e-9);
    expect(distance(transformAt(r, 1, 2), [-0.0458229358, 0])).toBeLessThan(1e-9);
  });

  it('vanishes on the line kx = 1/wx = 2.5 for every ky (docs/references.md §1.5)', () => {
    const r = new Rectangle(CHECK);
    for (const ky of [-3.3, 0, 0.25, 1.7, 8]) {
      const [re, im] = transformAt(r, 2.5, ky);
      expect(Math.hypot(re, im)).toBeLessThan(1e-16);
    }
  });

  itObeysTransformTheorems({
    make: (p: RectangleParams) => new Rectangle(p),
    quadrature: {
      rule: 'direct 2D Gauss–Legendre integration over the rotated rectangle',
      instances: [CHECK, TILTED],
      transform: rectangleTransformByQuadrature,
      tolerance: 1e-13,
    },
    tilted: TILTED,
    shift: [-0.31, 0.077],
    shiftTolerance: 1e-14,
    rotationDeg: -41,
    rotationTolerance: 1e-14,
    hermitianTolerance: 1e-15,
  });

  it('a 90° turn equals swapping the widths (common practice)', () => {
    const upright = new Rectangle({ ...CHECK, thetaDeg: 90 });
    const swapped = new Rectangle({ ...CHECK, wx: CHECK.wy, wy: CHECK.wx });
    expectSameTransform(shapeTransform(upright), shapeTransform(swapped), FREQUENCIES, 1e-15);
  });
});

describe('rectangle geometry', () => {
  it('spans agree with the inside test on every line, rotated or not', () => {
    for (const p of [CHECK, TILTED]) {
      expect(spanLinesAgreeingWithContains(new Rectangle(p), 0.0031)).toBeGreaterThan(20);
    }
  });

  it('rejects a non-finite width with a ValidationError naming rectangle.wy', () => {
    expect(validationField(() => new Rectangle({ ...CHECK, wy: Number.NaN }))).toBe('rectangle.wy');
  });
});
