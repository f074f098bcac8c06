import { describe, expect, it } from 'vitest';
import {
  divergence,
  gradient,
  gradientNormSquared,
  totalVariation,
} from '../../src/recon/total-variation.ts';
import { randomComplexImage } from './helpers.ts';

describe('discrete gradient and divergence (Chambolle 2004)', () => {
  it('‖∇‖² by power iteration matches 8·cos²(π/(2n)) from below (docs/references.md §5.2 [C])', () => {
    // Tabulated to 7 digits; the eigen-gap shrinks with n, so n = 64 needs more iterations.
    for (const [n, expected, iterations] of [
      [16, 7.923141, 3000],
      [64, 7.995182, 10000],
    ] as const) {
      const value = gradientNormSquared(n, n, iterations);
      expect(value).toBeLessThanOrEqual(8 * Math.cos(Math.PI / (2 * n)) ** 2 + 1e-12);
      expect(Math.abs(value - expected)).toBeLessThan(1e-6);
      expect(value).toBeLessThan(8);
    }
  });

  it('div = −∇ᴴ: ⟨∇u, p⟩ + ⟨u, div p⟩ = 0 on a 13×17 complex array (docs/references.md §5.2 [C])', () => {
    const nx = 17;
    const ny = 13;
    const u = randomComplexImage(nx, ny, 1).data;
    const p1 = randomComplexImage(nx, ny, 2).data;
    const p2 = randomComplexImage(nx, ny, 3).data;
    const g1 = new Float64Array(u.length);
    const g2 = new Float64Array(u.length);
    const d = new Float64Array(u.length);
    gradient(g1, g2, u, nx, ny);
    divergence(d, p1, p2, nx, ny);
    // Complex inner product ⟨a, b⟩ = Σ conj(a) b, both parts.
    let re = 0;
    let im = 0;
    let scale = 0;
    for (let i = 0; i < u.length; i += 2) {
      for (const [a, b] of [
        [g1, p1],
        [g2, p2],
        [u, d],
      ] as const) {
        re += a[i] * b[i] + a[i + 1] * b[i + 1];
        im += a[i] * b[i + 1] - a[i + 1] * b[i];
        scale += Math.hypot(a[i], a[i + 1]) * Math.hypot(b[i], b[i + 1]);
      }
    }
    expect(Math.abs(re) / scale).toBeLessThan(1e-14);
    expect(Math.abs(im) / scale).toBeLessThan(1e-14);
  });

  it('TV of a constant is 0; TV of a unit step across 5 rows of width 7 is 5 (isotropic, definition)', () => {
    const nx = 7;
    const ny = 5;
    const c = new Float64Array(2 * nx * ny).fill(0.3);
    expect(totalVariation(c, nx, ny)).toBe(0);
    const step = new Float64Array(2 * nx * ny);
    for (let i = 0; i < ny; i++) for (let j = 4; j < nx; j++) step[2 * (i * nx + j)] = 1;
    expect(totalVariation(step, nx, ny)).toBeCloseTo(5, 14);
  });
});
