import { describe, expect, it } from 'vitest';
import { radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { createNufftPlan } from '../../src/nufft/nufft-plan.ts';
import { radialRampWeights } from '../../src/nufft/radial-ramp-weights.ts';
import { toeplitzNormalOperator } from '../../src/nufft/toeplitz.ts';
import { relativeError } from '../error-measures.ts';
import { directAdjointNdft, directNdft } from './direct-ndft.ts';
import { uniformPoints } from './random-points.ts';

describe('Toeplitz embedding of AᴴWA (Fessler et al. 2005)', () => {
  it.each([
    [16, 16],
    [15, 12],
  ])('%i×%i, random points and weights: equals the exact direct AᴴWA to the NUFFT accuracy', (nx, ny) => {
    const rng = new SeededRandom(nx * 100 + ny);
    const x = createComplexImage(nx, ny);
    for (let i = 0; i < x.data.length; i++) x.data[i] = rng.normal();
    const count = 300;
    const { kx, ky } = uniformPoints(count, nx, ny, rng);
    const w = Float64Array.from({ length: count }, () => rng.uniform());
    const y = directNdft(x, kx, ky);
    for (let p = 0; p < count; p++) {
      y[2 * p] *= w[p];
      y[2 * p + 1] *= w[p];
    }
    const exact = directAdjointNdft(y, kx, ky, nx, ny);
    const toeplitz = toeplitzNormalOperator(nx, ny, kx, ky, w, { width: 6 });
    // Measured 3.7e-6 (16×16) and 2.9e-6 (15×12) against the exact direct sums; bound: the W = 6
    // NUFFT goal 2e-5.
    expect(relativeError(toeplitz.apply(x).data, exact)).toBeLessThan(2e-5);
  });

  it('agrees with the gridding pair adjoint(w ⊙ forward(x)) on radial with the ramp DCF', () => {
    const side = 32;
    const t = radialTrajectory({ side, readoutOversampling: 2 });
    const w = radialRampWeights(t);
    const rng = new SeededRandom(4);
    const x = createComplexImage(side, side);
    for (let i = 0; i < x.data.length; i++) x.data[i] = rng.normal();
    const plan = createNufftPlan(side, side, t.kx, t.ky, { width: 6 });
    const y = plan.forward(x);
    for (let p = 0; p < plan.count; p++) {
      y[2 * p] *= w[p];
      y[2 * p + 1] *= w[p];
    }
    const viaGridding = plan.adjoint(y);
    const viaToeplitz = toeplitzNormalOperator(side, side, t.kx, t.ky, w, { width: 6 }).apply(x);
    // Both carry a W = 6 NUFFT error of their own; measured 7.0e-6 apart.
    expect(relativeError(viaToeplitz.data, viaGridding.data)).toBeLessThan(4e-5);
  });
});
