import { describe, expect, it } from 'vitest';
import { CancelledError } from '../../src/core/errors.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import {
  analyticCoilProblem,
  coilInput,
  encodedKspace,
  loopMaps,
  maskCoils,
  nrmse,
  phantomRaster,
  uniformLines,
} from './coil-helpers.ts';
import { randomComplexImage, sampledKspace } from './helpers.ts';

const limits = { ...defaultLimits, maxIterations: 1000 };

describe('iterative SENSE (Pruessmann, Weiger, Börnert & Boesiger 2001)', () => {
  it('true maps, noiseless data exactly in the discrete model, uniform R = 2 and 4 ≤ 8 coils: the fully sampled reference', () => {
    const n = 64;
    const maps = loopMaps(n);
    const x = phantomRaster(n);
    for (const R of [2, 4]) {
      const mask = uniformLines(n, R, 0);
      const y = encodedKspace(x, mask, maps);
      const result = reconstruct(
        coilInput(y, mask, maps),
        { name: 'sense', iterations: 300, tolerance: 1e-10 },
        { limits },
      );
      // EᴴE is invertible for R ≤ coils (SENSE's condition), so CG converges to x itself.
      // Measured 2.3e-11 (R = 2, 14 iterations) and 5.7e-9 (R = 4, 138 iterations).
      expect(nrmse(result.image, x)).toBeLessThan(1e-4);
      expect(result.info).toMatchObject({ maps: 'true', converged: true });
      expect(result.info.mapsNote).toMatch(/optimistic/);
    }
  });

  it('analytic coil k-space (exact transforms, Guerquin-Kern et al. 2012), fitted maps, R = 2 without ACS: measured error against the multi-coil reference', () => {
    const n = 64;
    const { maps, full, reference } = analyticCoilProblem(n);
    const mask = uniformLines(n, 2, 0);
    const y = maskCoils({ ...full, data: full.data.slice() }, mask);
    const result = reconstruct(
      coilInput(y, mask, maps),
      { name: 'sense', iterations: 200, tolerance: 1e-10 },
      { limits },
    );
    // Not the model's own data: the analytic k-space holds the object's content beyond the grid's
    // band, which folds differently than the discrete model assumes. Measured 0.0177.
    expect(nrmse(result.image, reference)).toBeLessThan(0.02);
    expect(nrmse(result.image, reference)).toBeGreaterThan(1e-3);
  });

  it('single coil (S = 1) is allowed and equals the zero-filled image up to the tolerance', () => {
    const n = 32;
    const mask = uniformLines(n, 2, 4);
    const kspace = sampledKspace(randomComplexImage(n, n, 9), mask);
    const zf = reconstruct({ kspace, mask }, { name: 'zero-filled' });
    const result = reconstruct({ kspace, mask }, { name: 'sense' });
    expect(result.info.maps).toBe('uniform');
    // MᴴM x = Fᴴ y is solved by the first CG step (EᴴE is a projection): measured 1.6e-16.
    expect(nrmse(result.image, zf.image)).toBeLessThan(1e-12);
  });

  it('Tikhonov shrinks the solution towards 0: (EᴴE + λI)x = Eᴴy at full sampling gives x/(1 + λ) exactly', () => {
    const n = 32;
    const maps = loopMaps(n);
    const x = phantomRaster(n);
    const mask = new Uint8Array(n * n).fill(1);
    const y = encodedKspace(x, mask, maps);
    const result = reconstruct(coilInput(y, mask, maps), { name: 'sense', tikhonov: 0.25 }, { limits });
    const scaled = { ...x, data: x.data.map((v) => v / 1.25) };
    expect(nrmse(result.image, scaled)).toBeLessThan(1e-12);
    expect(result.info.tikhonovAbsolute).toBeCloseTo(0.25, 12);
  });

  it('refuses "true" maps when none are known (method.maps) and "acs" without calibration lines (sampling.acs)', () => {
    const n = 32;
    const maps = loopMaps(n);
    const mask = uniformLines(n, 2, 0);
    const y = encodedKspace(phantomRaster(n), mask, maps);
    expect(
      caughtValidationError(() => reconstruct(coilInput(y, mask), { name: 'sense', maps: 'true' }))
        .problems[0].field,
    ).toBe('method.maps');
    expect(
      caughtValidationError(() => reconstruct(coilInput(y, mask), { name: 'sense' })).problems[0].field,
    ).toBe('sampling.acs');
  });

  it('SENSE and GRAPPA stop with CancelledError when the signal has fired', () => {
    const n = 32;
    const maps = loopMaps(n);
    const mask = uniformLines(n, 2, 8);
    const y = encodedKspace(phantomRaster(n), mask, maps);
    const controller = new AbortController();
    controller.abort();
    const options = { signal: controller.signal, limits };
    expect(() => reconstruct(coilInput(y, mask, maps), { name: 'sense' }, options)).toThrow(CancelledError);
    expect(() => reconstruct(coilInput(y, mask), { name: 'grappa' }, options)).toThrow(CancelledError);
  });
});
