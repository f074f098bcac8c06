import { expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import type { Placement, Shape } from '../../src/phantoms/shape.ts';

/**
 * Checks shared by the shape and phantom transform tests: the Fourier shift and rotation theorems
 * (common practice) and Hermitian symmetry of the transform of a real object (docs/references.md §1.2).
 * Each takes the transform as a function of (kx, ky) so it serves single shapes and whole phantoms.
 */

export type Complex = [number, number];
export type TransformAt = (kx: number, ky: number) => Complex;

export function distance(a: Complex, b: Complex): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1]);
}

/** The exact transform of one shape at a single frequency. */
export function shapeTransform(shape: Pick<Shape, 'addTransform'>): TransformAt {
  return (kx, ky) => {
    const out = new Float64Array(2);
    shape.addTransform([kx], [ky], out);
    return [out[0], out[1]];
  };
}

/** The exact transform of one shape at (kx, ky). */
export function transformAt(shape: Pick<Shape, 'addTransform'>, kx: number, ky: number): Complex {
  return shapeTransform(shape)(kx, ky);
}

/** Shift theorem: the object moved by d has the transform K(k)·e^(−i2πk·d). */
export function expectShiftTheorem(
  base: TransformAt,
  moved: TransformAt,
  d: readonly [number, number],
  frequencies: ReadonlyArray<readonly [number, number]>,
  tolerance: number,
): void {
  for (const [kx, ky] of frequencies) {
    const [re, im] = base(kx, ky);
    const phase = -2 * Math.PI * (kx * d[0] + ky * d[1]);
    const expected: Complex = [
      re * Math.cos(phase) - im * Math.sin(phase),
      re * Math.sin(phase) + im * Math.cos(phase),
    ];
    expect(distance(moved(kx, ky), expected), `k = (${kx}, ${ky})`).toBeLessThan(tolerance);
  }
}

/** Rotation theorem: the object turned by φ about the origin has the transform turned by φ. */
export function expectRotationTheorem(
  base: TransformAt,
  turned: TransformAt,
  phiDeg: number,
  frequencies: ReadonlyArray<readonly [number, number]>,
  tolerance: number,
): void {
  const c = Math.cos((phiDeg * Math.PI) / 180);
  const s = Math.sin((phiDeg * Math.PI) / 180);
  for (const [kx, ky] of frequencies) {
    expect(
      distance(turned(c * kx - s * ky, s * kx + c * ky), base(kx, ky)),
      `k = (${kx}, ${ky})`,
    ).toBeLessThan(tolerance);
  }
}

/** Real object ⇒ K(−k) = conj K(k). */
export function expectHermitian(
  at: TransformAt,
  frequencies: ReadonlyArray<readonly [number, number]>,
  tolerance: number,
): void {
  for (const [kx, ky] of frequencies) {
    const [re, im] = at(kx, ky);
    expect(distance(at(-kx, -ky), [re, -im]), `k = (${kx}, ${ky})`).toBeLessThan(tolerance);
  }
}

/** The field the ValidationError thrown by `build` names first (fails when nothing or something else is thrown). */
export function validationField(build: () => unknown): string {
  let caught: unknown;
  try {
    build();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(ValidationError);
  return (caught as ValidationError).problems[0].field;
}

/**
 * Walks horizontal lines across a shape (step `dy`, a little beyond its y range) and checks that
 * spanAtY agrees with contains: a line that misses has no inside point across [−1, 1]; a line that
 * hits has its midpoint and both ends (inset by 1e-9 of the width) inside and points 1e-6 beyond
 * either end outside. Returns how many lines hit, so a caller can insist the walk saw the shape.
 */
export function spanLinesAgreeingWithContains(
  shape: Pick<Shape, 'contains' | 'yRange' | 'spanAtY'>,
  dy: number,
): number {
  const range = new Float64Array(2);
  const span = new Float64Array(2);
  shape.yRange(range);
  let lines = 0;
  for (let y = range[0] - 0.01; y <= range[1] + 0.01; y += dy) {
    if (!shape.spanAtY(y, span)) {
      for (let x = -1; x <= 1; x += 0.01) expect(shape.contains(x, y), `(${x}, ${y})`).toBe(false);
      continue;
    }
    lines++;
    const inset = 1e-9 * (span[1] - span[0]) + 1e-12;
    expect(shape.contains(0.5 * (span[0] + span[1]), y)).toBe(true);
    expect(shape.contains(span[0] + inset, y)).toBe(true);
    expect(shape.contains(span[1] - inset, y)).toBe(true);
    expect(shape.contains(span[0] - 1e-6, y)).toBe(false);
    expect(shape.contains(span[1] + 1e-6, y)).toBe(false);
  }
  return lines;
}

/**
 * Frequencies (cycles per unit length) the primitive shapes are checked at: the origin, points on
 * each axis, both quadrant signs, and far out where a shape's transform has decayed.
 */
export const SHAPE_FREQUENCIES: ReadonlyArray<readonly [number, number]> = [
  [0, 0],
  [1, 0],
  [1.5, 0],
  [0.7, -2.3],
  [-3.1, 1.2],
  [4, 4],
  [5, 5],
  [0, -6.5],
  [0, -9.5],
];

/** A unit-intensity transform scaled by the intensity ρ (the transform is linear in ρ). */
export function scaledTransform(intensity: number, unit: TransformAt): TransformAt {
  return (kx, ky) => {
    const [re, im] = unit(kx, ky);
    return [intensity * re, intensity * im];
  };
}

/** Two descriptions of the same object have the same transform at every frequency. */
export function expectSameTransform(
  a: TransformAt,
  b: TransformAt,
  frequencies: ReadonlyArray<readonly [number, number]>,
  tolerance: number,
): void {
  for (const [kx, ky] of frequencies) {
    expect(distance(a(kx, ky), b(kx, ky)), `k = (${kx}, ${ky})`).toBeLessThan(tolerance);
  }
}

/** One kind of shape and the values its transform checks (at SHAPE_FREQUENCIES) use. */
export interface ShapeTheoremCase<P extends Placement> {
  make: (params: P) => Shape;
  /** The reference: a quadrature of the defining integral (tests/phantoms/quadrature.ts). */
  quadrature: {
    /** The quadrature rule, as the test's title names it. */
    rule: string;
    instances: P[];
    /** The unit-intensity integral for the shape of `params` turned by `theta` radians. */
    transform: (shape: P & { theta: number }, kx: number, ky: number) => Complex;
    tolerance: number;
  };
  /** A rotated, off-centre instance. */
  tilted: P;
  shift: readonly [number, number];
  shiftTolerance: number;
  rotationDeg: number;
  rotationTolerance: number;
  hermitianTolerance: number;
}

/**
 * The quadrature reference, the shift and rotation theorems and Hermitian symmetry for one kind of
 * shape, as `it` blocks of the caller's describe: the same four checks every primitive must pass.
 */
export function itObeysTransformTheorems<P extends Placement>(c: ShapeTheoremCase<P>): void {
  const { make, tilted, quadrature } = c;
  const frequencies = SHAPE_FREQUENCIES;
  it(`agrees with ${quadrature.rule} (tests/phantoms/quadrature.ts, ${quadrature.tolerance})`, () => {
    for (const p of quadrature.instances) {
      const theta = ((p.thetaDeg ?? 0) * Math.PI) / 180;
      const reference = scaledTransform(p.intensity, (kx, ky) =>
        quadrature.transform({ ...p, theta }, kx, ky),
      );
      expectSameTransform(shapeTransform(make(p)), reference, frequencies, quadrature.tolerance);
    }
  });

  it(`obeys the shift theorem: moving the shape by d multiplies its transform by e^(−i2πk·d) (Bracewell, common practice; ${c.shiftTolerance})`, () => {
    const d = c.shift;
    const moved = make({ ...tilted, x0: tilted.x0 + d[0], y0: tilted.y0 + d[1] });
    expectShiftTheorem(shapeTransform(make(tilted)), shapeTransform(moved), d, frequencies, c.shiftTolerance);
  });

  it(`obeys the rotation theorem: rotating the object by φ rotates its transform by φ (common practice; ${c.rotationTolerance})`, () => {
    const centred: P = { ...tilted, x0: 0, y0: 0 };
    const turned = make({ ...centred, thetaDeg: (centred.thetaDeg ?? 0) + c.rotationDeg });
    expectRotationTheorem(
      shapeTransform(make(centred)),
      shapeTransform(turned),
      c.rotationDeg,
      frequencies,
      c.rotationTolerance,
    );
  });

  it(`is Hermitian for a real shape: K(−k) = conj K(k) (docs/references.md §1.2; ${c.hermitianTolerance})`, () => {
    expectHermitian(shapeTransform(make(tilted)), frequencies, c.hermitianTolerance);
  });
}
