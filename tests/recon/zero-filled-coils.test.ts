import { describe, expect, it } from 'vitest';
import { createMultiCoilArray } from '../../src/encoding/index.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { coilInput, encodedKspace, loopMaps, nrmse, phantomRaster, uniformLines } from './coil-helpers.ts';
import { fullMask, randomComplexImage, sampledKspace } from './helpers.ts';

describe('zero-filled on receive-array data (coil combination)', () => {
  it('one uniform coil (S = 1) gives the single-coil zero-filled image value for value', () => {
    const n = 48;
    const image = randomComplexImage(n, n, 5);
    const mask = uniformLines(n, 3, 8);
    const kspace = sampledKspace(image, mask);
    const single = reconstruct({ kspace, mask }, { name: 'zero-filled' });
    const maps = createMultiCoilArray(1, n, n);
    for (let i = 0; i < n * n; i++) maps.data[2 * i] = 1;
    const coils = { coils: 1, nx: n, ny: n, data: kspace.data.slice() };
    const combined = reconstruct(coilInput(coils, mask, maps), { name: 'zero-filled' });
    let mismatches = 0;
    for (let i = 0; i < single.image.data.length; i++)
      if (single.image.data[i] !== combined.image.data[i]) mismatches++;
    expect(mismatches).toBe(0);
    expect(combined.info.combination).toBe('sensitivity-weighted');
  });

  it('fully sampled 8-loop data: the sensitivity-weighted combination returns the object (Σ|S_c|² = 1, Roemer et al. 1990), root-sum-of-squares its magnitude', () => {
    const n = 32;
    const maps = loopMaps(n);
    const x = phantomRaster(n);
    const mask = fullMask(n, n);
    const y = encodedKspace(x, mask, maps);
    const weighted = reconstruct(coilInput(y, mask, maps), { name: 'zero-filled' });
    expect(weighted.info.combination).toBe('sensitivity-weighted');
    // Measured 2.6e-16 (rounding of the FFTs).
    expect(nrmse(weighted.image, x)).toBeLessThan(1e-13);
    const rss = reconstruct(coilInput(y, mask), { name: 'zero-filled' });
    expect(rss.info.combination).toBe('root-sum-of-squares');
    let worst = 0;
    for (let i = 0; i < n * n; i++) {
      worst = Math.max(worst, Math.abs(rss.image.data[2 * i] - Math.hypot(x.data[2 * i], x.data[2 * i + 1])));
      expect(rss.image.data[2 * i + 1]).toBe(0);
    }
    expect(worst).toBeLessThan(1e-13);
  });
});
