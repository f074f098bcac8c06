import { describe, expect, it } from 'vitest';
import { reconstruct } from '../../src/recon/index.ts';
import { relativeError } from '../error-measures.ts';
import { randomProblem } from './helpers.ts';

describe('methods do not depend on the image scale (DEVELOPERS.md: λ is relative to max |F_cᴴ y|)', () => {
  // Scaling the data by s must scale the reconstruction by s: cs-tv's λ_abs scales with
  // max |F_cᴴ y|, and the Hankel projection is invariant to the scale. Odd 25×18 matrix.
  const nx = 25;
  const ny = 18;
  const { mask, kspace } = randomProblem(nx, ny, 12, 0.5, 13);
  const scaled = { nx, ny, data: kspace.data.map((v) => 1000 * v) };
  for (const method of [
    { name: 'cs-tv' as const, iterations: 40 },
    { name: 'lowrank-hankel' as const, kernel: 5, iterations: 10 },
    { name: 'zero-filled' as const },
  ]) {
    it(`${method.name}: reconstruct(1000·y) = 1000·reconstruct(y)`, () => {
      const a = reconstruct({ kspace, mask }, method);
      const b = reconstruct({ kspace: scaled, mask }, method);
      const expected = a.image.data.map((v) => 1000 * v);
      expect(relativeError(b.image.data, expected)).toBeLessThan(1e-10);
      expect(b.info.iterations ?? 0).toBe(a.info.iterations ?? 0);
    });
  }
});
