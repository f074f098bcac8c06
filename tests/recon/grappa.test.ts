import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { fft2c } from '../../src/core/centered-fft.ts';
import { createMultiCoilArray } from '../../src/encoding/index.ts';
import { prepareGrappa, reconstruct } from '../../src/recon/index.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { relativeError } from '../error-measures.ts';
import {
  analyticCoilProblem,
  coilInput,
  magnitudeNrmse,
  maskCoils,
  nrmse,
  uniformLines,
} from './coil-helpers.ts';
import { fullMask, randomComplexImage } from './helpers.ts';

describe('GRAPPA (Griswold et al. 2002)', () => {
  it('R = 1 returns the data: the filled k-space is the acquired k-space and the image their combination', () => {
    const n = 32;
    const { maps, full } = analyticCoilProblem(n);
    const mask = fullMask(n, n);
    const input = coilInput(full, mask, maps);
    const filled = prepareGrappa(input, { name: 'grappa' }).fill(full, mask);
    let mismatches = 0;
    for (let i = 0; i < full.data.length; i++) if (filled.data[i] !== full.data[i]) mismatches++;
    expect(mismatches).toBe(0);
    const image = reconstruct(input, { name: 'grappa' });
    const zf = reconstruct(input, { name: 'zero-filled' });
    expect(nrmse(image.image, zf.image)).toBe(0);
    expect(image.info).toMatchObject({
      combination: 'sensitivity-weighted',
      kernelsCalibrated: 0,
      acs: null,
    });
  });

  it('exact where a coil is a whole-row k-space shift of another (shift theorem: S₂ = e^(−iπ·ny·y/2)·S₁ gives y₂[v] = y₁[v + 1])', () => {
    // Two coils whose k-spaces are G and G shifted by one row: every missing row of one coil is an
    // acquired row of the other, so the ACS-trained kernel is exact. G is white (a random image's
    // k-space), so the calibration matrix is well conditioned and that relation is the only one.
    const n = 64;
    const grid = fft2c(randomComplexImage(n, n, 21));
    const coils = createMultiCoilArray(2, n, n);
    const px = n * n;
    coils.data.set(grid.data, 0);
    for (let v = 0; v < n - 1; v++)
      coils.data.set(grid.data.subarray(2 * (v + 1) * n, 2 * (v + 2) * n), 2 * (px + v * n));
    const mask = uniformLines(n, 2, 24);
    const acquired = maskCoils({ ...coils, data: coils.data.slice() }, mask);
    const filled = prepareGrappa(coilInput(acquired, mask), { name: 'grappa', tikhonov: 1e-12 }).fill(
      acquired,
      mask,
    );
    // Coil 2's last row would be y₁ beyond the grid (set to 0 here): no kernel can know it, so it is
    // left out. Measured 1.7e-15 relative over the rest (rows off by about 1e-11 in absolute terms).
    const known = 2 * (2 * px - n);
    expect(relativeError(filled.data.subarray(0, known), coils.data.subarray(0, known))).toBeLessThan(1e-12);
  });

  it('8 loops, analytic k-space, uniform R = 2 + 24 ACS, 128², noiseless: GRAPPA 0.0046 beside SENSE with ACS maps 0.020 (magnitude NRMSE)', () => {
    const n = 128;
    const { full, reference } = analyticCoilProblem(n);
    const mask = uniformLines(n, 2, 24);
    const y = maskCoils({ ...full, data: full.data.slice() }, mask);
    const input = coilInput(y, mask);
    const g = reconstruct(input, { name: 'grappa' });
    const s = reconstruct(input, { name: 'sense', maps: 'acs' });
    const zf = reconstruct(input, { name: 'zero-filled' });
    expect(g.info).toMatchObject({
      combination: 'root-sum-of-squares',
      kernel: [4, 5],
      acs: { rows: 25, columns: 128 },
    });
    expect(s.info).toMatchObject({ maps: 'acs', mapsCalibration: 'acs-lowres-rss' });
    const eg = magnitudeNrmse(g.image, reference);
    const es = magnitudeNrmse(s.image, reference);
    const ez = magnitudeNrmse(zf.image, reference);
    // Measured: GRAPPA 0.00458, SENSE (ACS maps) 0.0201, zero-filled root-sum-of-squares 0.224.
    expect(eg).toBeLessThan(0.0055);
    expect(es).toBeLessThan(0.024);
    expect(eg).toBeLessThan(es);
    expect(ez).toBeGreaterThan(0.2);
  });

  it('random lines (cartesian-random R = 2, 16 ACS, 64², seed 4): a kernel per gap geometry, the sparse edge left empty, 0.166 against zero-filled 0.238', () => {
    const n = 64;
    const { full, maps, reference } = analyticCoilProblem(n);
    const mask = generateMask(
      { nx: n, ny: n },
      { pattern: 'cartesian-random', acceleration: 2, acs: 16, seed: 4 },
    ).mask;
    const y = maskCoils({ ...full, data: full.data.slice() }, mask);
    const input = coilInput(y, mask, maps);
    const g = reconstruct(input, { name: 'grappa' });
    const zf = reconstruct(input, { name: 'zero-filled' });
    // Measured: 17 kernels; 15 of the 32 missing lines, far beyond the outermost acquired lines, left empty.
    expect(g.info).toMatchObject({ kernelsCalibrated: 17, linesLeftEmpty: 15 });
    // Measured: GRAPPA 0.166, zero-filled 0.238 (random gaps are wider than uniform R = 2's, and the
    // sparse variable-density edge is not extrapolated).
    const eg = nrmse(g.image, reference);
    expect(eg).toBeLessThan(0.18);
    expect(eg).toBeLessThan(0.75 * nrmse(zf.image, reference));
  });

  it('refuses partly sampled rows (sampling.pattern) and masks without an ACS block (sampling.acs)', () => {
    const n = 32;
    const { full } = analyticCoilProblem(n);
    const disc = generateMask(
      { nx: n, ny: n },
      { pattern: 'poisson-disc', acceleration: 2, acs: 8, seed: 1 },
    ).mask;
    expect(
      caughtValidationError(() => reconstruct(coilInput(full, disc), { name: 'grappa' })).problems[0].field,
    ).toBe('sampling.pattern');
    const noAcs = uniformLines(n, 2, 0);
    expect(
      caughtValidationError(() => reconstruct(coilInput(full, noAcs), { name: 'grappa' })).problems[0].field,
    ).toBe('sampling.acs');
    expect(
      caughtValidationError(() =>
        reconstruct(coilInput(full, fullMask(n, n)), { name: 'grappa', kernel: [4, 4] }),
      ).problems[0].field,
    ).toBe('method.kernel.1');
  });
});
