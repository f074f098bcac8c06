import { describe, expect, it } from 'vitest';
import { addLoopField, type CircularLoop } from '../../src/coils/loop-field.ts';
import { coilFixture } from './fixture.ts';

function field(loop: CircularLoop, segments: number, p: [number, number, number]): [number, number, number] {
  const bx = new Float64Array(1);
  const by = new Float64Array(1);
  const bz = new Float64Array(1);
  addLoopField(loop, segments, [p[0]], [p[1]], [p[2]], bx, by, bz);
  return [bx[0], by[0], bz[0]];
}

// A loop in a general orientation: axis = u × v along (1, 2, 2)/3.
const u: [number, number, number] = [2 / 3, -2 / 3, 1 / 3];
const v: [number, number, number] = [2 / 3, 1 / 3, -2 / 3];
const axis: [number, number, number] = [
  u[1] * v[2] - u[2] * v[1],
  u[2] * v[0] - u[0] * v[2],
  u[0] * v[1] - u[1] * v[0],
];
const tilted: CircularLoop = { centre: [0.3, -1.1, 0.2], u, v, radius: 0.35 };

describe('numerical Biot–Savart field of a circular loop', () => {
  it('on-axis B(z)/B(0) = (1 + z²/a²)^(−3/2) to 1e-6 (textbook magnetostatics); 2^(−3/2) at z = a', () => {
    const a = tilted.radius;
    const centre = field(tilted, 128, [...tilted.centre]);
    const b0 = Math.hypot(...centre);
    // At the centre B points along u × v (right-hand rule for the current u → v).
    const along = (centre[0] * axis[0] + centre[1] * axis[1] + centre[2] * axis[2]) / b0;
    expect(along).toBeCloseTo(1, 12);
    let worst = 0;
    for (const zOverA of [-3, -1, 0.1, 0.5, 1, 2, 5, 10]) {
      const z = zOverA * a;
      const p: [number, number, number] = [
        tilted.centre[0] + z * axis[0],
        tilted.centre[1] + z * axis[1],
        tilted.centre[2] + z * axis[2],
      ];
      const b = field(tilted, 128, p);
      const axial = b[0] * axis[0] + b[1] * axis[1] + b[2] * axis[2];
      const expected = (1 + zOverA * zOverA) ** -1.5;
      worst = Math.max(worst, Math.abs(axial / b0 - expected));
      // No transverse field on the axis.
      expect(
        Math.hypot(b[0] - axial * axis[0], b[1] - axial * axis[1], b[2] - axial * axis[2]) / b0,
      ).toBeLessThan(1e-12);
      if (zOverA === 1) expect(axial / b0).toBeCloseTo(0.353553, 6);
    }
    expect(worst).toBeLessThan(1e-6); // measured 1.9e-15 at 128 segments (the on-axis integrand is constant round the loop)
    // B(0) = μ0·I/(2a) ↔ 2π/a in units of μ0·I/4π.
    expect(b0).toBeCloseTo((2 * Math.PI) / a, 10);
  });

  it('off-axis field equals the elliptic-integral closed form (scipy fixture) to 1e-10 relative at 256 segments', () => {
    const { radius, points, field: expected } = coilFixture.loop_field;
    const flat: CircularLoop = { centre: [0, 0, 0], u: [1, 0, 0], v: [0, 1, 0], radius };
    const errorAt = (segments: number): number => {
      let worst = 0;
      points.forEach((p, k) => {
        const b = field(flat, segments, p);
        const e = expected[k];
        worst = Math.max(worst, Math.hypot(b[0] - e[0], b[1] - e[1], b[2] - e[2]) / Math.hypot(...e));
      });
      return worst;
    };
    const fine = errorAt(256);
    const coarse = errorAt(16);
    expect(fine).toBeLessThan(1e-10); // measured 2.0e-14 (64 segments: 3.4e-11; 32: 2.1e-5; 16: 1.4e-2)
    // Geometric convergence of the periodic midpoint rule: 16 segments are visibly worse near the wire.
    expect(coarse).toBeGreaterThan(1e3 * fine);
  });

  it('refuses too few segments', () => {
    const b = new Float64Array(1);
    expect(() => addLoopField(tilted, 3, [0], [0], [0], b, b, b)).toThrow(/segments/);
  });
});
