import { describe, expect, it } from 'vitest';
import { CartesianEncoding } from '../../src/encoding/index.ts';
import { NormalProxSolver } from '../../src/recon/normal-prox.ts';
import { randomMask, randomStack } from '../encoding/helpers.ts';
import { randomComplexImage } from './helpers.ts';

/** ‖b − (x + τEᴴE x)‖ / ‖b‖, the residual of the proximal system (its definition). */
function relativeResidual(op: CartesianEncoding, x: Float64Array, b: Float64Array, tau: number): number {
  const ex = op.normal({ nx: op.shapes.nx, ny: op.shapes.ny, data: x });
  let r = 0;
  let bb = 0;
  for (let i = 0; i < b.length; i++) {
    r += (b[i] - x[i] - tau * ex.data[i]) ** 2;
    bb += b[i] ** 2;
  }
  return Math.sqrt(r / bb);
}

describe('NormalProxSolver: (I + τEᴴE) x = b by conjugate gradients (Hestenes & Stiefel 1952, docs/references.md §5.4)', () => {
  const tau = 0.99 / Math.sqrt(8);

  it('4 random coils, 40 % random points: meets the requested residual from a cold start', () => {
    const nx = 16;
    const ny = 12;
    const op = new CartesianEncoding(nx, ny, randomMask(nx, ny, 0.4, 3), randomStack(4, nx, ny, 4));
    const b = randomComplexImage(nx, ny, 5).data;
    const x = op.createImage();
    const steps = new NormalProxSolver(op).solve(x, b, tau, 1e-10, 100);
    expect(relativeResidual(op, x.data, b, tau)).toBeLessThan(1e-10);
    expect(steps).toBeGreaterThan(2);
    // The maps are not normalised here (‖E‖² up to max Σ|S_c|² ≈ 20), so κ is large and CG needs
    // more steps than for normalised maps; it still stops well before the cap.
    expect(steps).toBeLessThan(100);
  });

  it('one coil without maps (EᴴE = F⁻¹MF, eigenvalues 1 and 1 + τ): exact after two steps', () => {
    const nx = 10;
    const ny = 14;
    const op = new CartesianEncoding(nx, ny, randomMask(nx, ny, 0.5, 6));
    const b = randomComplexImage(nx, ny, 7).data;
    const x = randomComplexImage(nx, ny, 8); // warm start anywhere
    const steps = new NormalProxSolver(op).solve(x, b, tau, 1e-13, 10);
    expect(steps).toBe(2);
    expect(relativeResidual(op, x.data, b, tau)).toBeLessThan(1e-13);
  });
});
