import { describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import type { ComplexImage } from '../../src/core/complex-image.ts';
import {
  DELTA_PER_SIGMA,
  RELAXATION,
  solveCsTvPreconditioned,
} from '../../src/recon/cs-tv-preconditioned.ts';
import { relaxedTvDualPass } from '../../src/recon/total-variation.ts';
import { relativeMaxError } from '../error-measures.ts';
import { randomProblem } from './helpers.ts';

/**
 * The solver runs in DC-first k-space on an un-centred DFT (batched column passes for power-of-two
 * heights, gathered columns otherwise). The same iteration written
 * directly in the centred formulation of its doc comment (fft2c / ifft2c, centred frequencies,
 * X̃ = (F_c div p + t·X + M y)/(M + t), t = σ(4sin²(π(c − ⌊nx/2⌋)/nx) + 4sin²(π(r − ⌊ny/2⌋)/ny)) + δ)
 * must give the same iterates to rounding, for odd and even sizes and power-of-two heights with an
 * odd (8, 32) and an even (16) number of radix-2 stages.
 */
function centredIterates(
  kspace: ComplexImage,
  mask: Uint8Array,
  lambda: number,
  sigma: number,
  rho: number,
  iterations: number,
): Float64Array {
  const { nx, ny } = kspace;
  const delta = DELTA_PER_SIGMA * sigma;
  const spectrum: ComplexImage = { nx, ny, data: kspace.data.map((v, k) => v * mask[k >> 1]) };
  const data = spectrum.data.slice();
  let x = ifft2c(spectrum).data;
  const div: ComplexImage = { nx, ny, data: new Float64Array(2 * nx * ny) };
  const px = new Float64Array(2 * nx * ny);
  const py = new Float64Array(2 * nx * ny);
  relaxedTvDualPass(div.data, px, py, x.slice(), x, nx, ny, sigma, lambda, 1);
  const eigen = (a: number, n: number) => 4 * Math.sin((Math.PI * (a - Math.floor(n / 2))) / n) ** 2;
  for (let it = 0; it < iterations; it++) {
    const d = fft2c(div).data;
    const step: ComplexImage = { nx, ny, data: new Float64Array(2 * nx * ny) };
    for (let r = 0; r < ny; r++) {
      for (let c = 0; c < nx; c++) {
        const i = r * nx + c;
        const t = sigma * (eigen(c, nx) + eigen(r, ny)) + delta;
        for (const k of [2 * i, 2 * i + 1]) {
          step.data[k] = (d[k] + t * spectrum.data[k] + data[k]) / (mask[i] + t);
          spectrum.data[k] = rho * step.data[k] + (1 - rho) * spectrum.data[k];
        }
      }
    }
    const xt = ifft2c(step).data;
    relaxedTvDualPass(div.data, px, py, xt, x, nx, ny, sigma, lambda, rho);
    x = xt;
  }
  return x;
}

describe('cs-tv preconditioned: the un-centred loop equals the centred formulation', () => {
  for (const [nx, ny] of [
    [16, 12],
    [15, 21],
    [20, 9],
    [12, 8],
    [16, 16],
    [9, 32],
  ]) {
    it(`${ny}×${nx}: 30 iterates agree to 1e-12 relative`, () => {
      const { kspace, mask } = randomProblem(nx, ny, 3, 0.4, 5);
      const lambda = 0.05;
      const sigma = 2;
      const solved = solveCsTvPreconditioned({ kspace, mask }, lambda, 30, 0, { sigma });
      expect(solved.iterations).toBe(30);
      const expected = centredIterates(kspace, mask, lambda, sigma, RELAXATION, 30);
      expect(relativeMaxError(solved.image.data, expected)).toBeLessThan(1e-12);
      // The iterates moved: the check compares 30 steps, not the common start.
      const start = ifft2c(kspace).data;
      expect(relativeMaxError(expected, start)).toBeGreaterThan(1e-3);
    });
  }
});
