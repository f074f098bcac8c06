import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import {
  kernelVariance,
  weightSupport,
  zeroFilledNoiseKernel,
  zeroFilledVariance,
} from '../../src/fidelity/observer-noise.ts';

// The kernel form of the zero-filled noise variance, σ²·wᴴ(F_cᴴ D² F_c)w with the circulant written
// as one inverse DFT (convolution theorem; any DSP text, e.g. Oppenheim & Schafer, circular
// convolution), must give the per-observer transform's σ²‖D ⊙ F_c w‖² — the two are the same sum
// taken in the image and in k-space (Parseval).

function observer(nx: number, ny: number, seed: number, centre: [number, number], radius: number) {
  const w = createComplexImage(nx, ny);
  const rng = new SeededRandom(seed);
  for (let i = 0; i < ny; i++) {
    for (let j = 0; j < nx; j++) {
      // A window that wraps over the image edge too (the kernel is circular).
      const di = Math.min(Math.abs(i - centre[0]), ny - Math.abs(i - centre[0]));
      const dj = Math.min(Math.abs(j - centre[1]), nx - Math.abs(j - centre[1]));
      if (di * di + dj * dj > radius * radius) continue;
      w.data[2 * (i * nx + j)] = rng.normal();
      w.data[2 * (i * nx + j) + 1] = rng.normal();
    }
  }
  return w;
}

describe('zero-filled noise kernel', () => {
  for (const [nx, ny] of [
    [48, 40],
    [33, 27],
  ]) {
    it(`equals the per-observer transform on random masks and complex windows (${ny}×${nx}, odd and even)`, () => {
      const { mask, density } = generateMask(
        { nx, ny },
        { pattern: 'poisson-disc', acceleration: 3, acs: 6, seed: 5 },
      );
      for (const d of [undefined, density]) {
        const kernel = zeroFilledNoiseKernel(mask, nx, ny, d);
        for (const [seed, centre] of [
          [1, [10, 12]],
          [2, [0, nx - 2]],
        ] as const) {
          const w = observer(nx, ny, seed, [centre[0], centre[1]], 4.5);
          const direct = zeroFilledVariance(w, mask, 0.3, d);
          const viaKernel = kernelVariance(w, weightSupport(w), kernel, 0.3);
          // Same sum in two orders: measured ≤ 3.8e-15 relative.
          expect(Math.abs(viaKernel - direct) / direct).toBeLessThan(1e-12);
        }
      }
    });
  }
});
