import { describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { relativeError } from '../error-measures.ts';
import { fullMask, randomComplexImage } from './helpers.ts';

describe('zero-filled', () => {
  it('full sampling, no noise: returns the reference to 1e-10 (docs/references.md §5.1, odd and even sizes)', () => {
    for (const [nx, ny] of [
      [32, 32],
      [27, 20],
    ]) {
      const image = randomComplexImage(nx, ny, nx);
      const out = reconstruct({ kspace: fft2c(image), mask: fullMask(nx, ny) }, { name: 'zero-filled' });
      expect(relativeError(out.image.data, image.data)).toBeLessThan(1e-10);
      expect(out.info.densityCompensated).toBe(false);
    }
  });

  it('density compensation divides each sample by its probability, so E[F_cᴴ(M y / p)] = x (Pipe & Menon 1999 idea)', () => {
    // Average over many independent masks drawn with a variable density p: the compensated
    // zero-filled images average to the fully sampled image, the uncompensated ones do not.
    const nx = 12;
    const ny = 12;
    const image = randomComplexImage(nx, ny, 2);
    const full = fft2c(image);
    const density = new Float64Array(nx * ny);
    for (let v = 0; v < ny; v++) {
      for (let u = 0; u < nx; u++) {
        const r = Math.hypot(u - nx / 2, v - ny / 2) / (nx / 2);
        density[v * nx + u] = Math.max(0.15, Math.min(1, 1 - 0.8 * r));
      }
    }
    const rng = new SeededRandom(7);
    const draws = 400;
    const sumCompensated = new Float64Array(2 * nx * ny);
    const sumPlain = new Float64Array(2 * nx * ny);
    for (let d = 0; d < draws; d++) {
      const mask = new Uint8Array(nx * ny);
      const kspace = createComplexImage(nx, ny);
      for (let i = 0; i < nx * ny; i++) {
        if (rng.uniform() < density[i]) {
          mask[i] = 1;
          kspace.data[2 * i] = full.data[2 * i];
          kspace.data[2 * i + 1] = full.data[2 * i + 1];
        }
      }
      const comp = reconstruct({ kspace, mask, density }, { name: 'zero-filled', densityCompensation: true });
      expect(comp.info.densityCompensated).toBe(true);
      const plain = reconstruct({ kspace, mask, density }, { name: 'zero-filled' });
      for (let i = 0; i < sumPlain.length; i++) {
        sumCompensated[i] += comp.image.data[i] / draws;
        sumPlain[i] += plain.image.data[i] / draws;
      }
    }
    // Monte-Carlo spread: per-sample relative variance (1 − p)/p ≤ 5.7, averaged over 400 draws → ≈ 0.1.
    expect(relativeError(sumCompensated, image.data)).toBeLessThan(0.15);
    expect(relativeError(sumPlain, image.data)).toBeGreaterThan(0.3);
  });

  it('density compensation without a density leaves the data as they are and says so', () => {
    const nx = 8;
    const ny = 8;
    const image = randomComplexImage(nx, ny, 3);
    const mask = fullMask(nx, ny);
    mask[5] = 0;
    const kspace = fft2c(image);
    kspace.data[10] = 0;
    kspace.data[11] = 0;
    const out = reconstruct({ kspace, mask }, { name: 'zero-filled', densityCompensation: true });
    expect(out.info.densityCompensated).toBe(false);
    expect(relativeError(out.image.data, ifft2c(kspace).data)).toBeLessThan(1e-14);
  });
});
