import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { nrmse } from '../../src/metrics/nrmse.ts';
import { griddingReconstruction } from '../../src/nufft/gridding.ts';
import { nufftPlanFor } from '../../src/nufft/plan-cache.ts';
import { radialRampWeights } from '../../src/nufft/radial-ramp-weights.ts';
import { runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { real, sheppLoganReferences } from '../nufft/shepp-logan-references.ts';

/**
 * The request path of a non-Cartesian acquisition: samples at the exact trajectory points
 * (analytic phantom transform, no gridding in the forward model), gridding as the zero-filled
 * reconstruction. Independent check: the same gridding computed here straight from the phantom's
 * closed-form transform (tests/nufft/shepp-logan-references.ts), which must agree to rounding.
 */
const side = 64;
const phantom = { phantom: 'shepp-logan-modified' } as const;
const matrix = { nx: side, ny: side };

describe('non-Cartesian reconstructions through the pipeline', () => {
  it('radial is non-Cartesian by default: exact angles, 2× readout oversampling, the grid picture as mask', () => {
    const m = generateMask(matrix, { pattern: 'radial', acceleration: 1 });
    expect(m.representation).toBe('non-cartesian');
    expect(m.trajectory?.readouts).toBe(101); // ⌈π/2·64⌉ Nyquist spokes
    expect(m.trajectory?.samplesPerReadout).toBe(128);
    expect(m.acquired).toEqual({ count: 101, unit: 'spokes' });
  });

  it('Nyquist radial gridding equals the gridding of the closed-form samples, and beats the rasterised spokes', async () => {
    const out = await runReconstruction(
      {
        source: phantom,
        matrix,
        sampling: { pattern: 'radial', acceleration: 1 },
        method: { name: 'zero-filled' },
      },
      undefined,
    );
    const { reference, samplesOf } = sheppLoganReferences(side);
    const t = radialTrajectory({ side, readoutOversampling: 2 });
    const direct = real(
      griddingReconstruction(nufftPlanFor(t, side, side), samplesOf(t), radialRampWeights(t)),
    );
    expect(nrmse(out.images.reconstruction, direct)).toBeLessThan(1e-12);
    // Measured 0.1037 against the fully sampled Cartesian reference (the k-space corners a spoke
    // never reaches cost 0.103 of it; tests/nufft/gridding-shepp-logan.test.ts).
    expect(out.metrics.nrmse).toBeCloseTo(nrmse(direct, reference), 12);
    expect(out.metrics.nrmse).toBeLessThan(0.105);
    expect(out.info).toMatchObject({ gridding: true, densityCompensation: 'radial-ramp' });
    const rasterised = await runReconstruction(
      {
        source: phantom,
        matrix,
        sampling: { pattern: 'radial', acceleration: 1, trajectory: 'rasterised' },
        method: { name: 'zero-filled' },
      },
      undefined,
    );
    // Measured 0.1135: spokes moved to the grid lose more than the true samples do.
    expect(rasterised.metrics.nrmse).toBeGreaterThan(out.metrics.nrmse);
  });

  it('spiral: interleaves counted against the Nyquist count, Pipe–Menon weights', async () => {
    const out = await runReconstruction(
      {
        source: phantom,
        matrix,
        sampling: { pattern: 'spiral', acceleration: 2, interleaves: 8, density: { power: 2 } },
        method: { name: 'zero-filled' },
      },
      undefined,
    );
    expect(out.acquired).toEqual({ count: 8, unit: 'interleaves' });
    expect(out.acceleration.requested).toBe(2);
    expect(out.acceleration.actual).toBeCloseTo(2, 12);
    expect(out.info).toMatchObject({ gridding: true, densityCompensation: 'pipe-menon' });
    // Measured 0.454 for this design (tests/nufft/gridding-spiral.test.ts, variable density, R = 2).
    expect(out.metrics.nrmse).toBeGreaterThan(0.4);
    expect(out.metrics.nrmse).toBeLessThan(0.5);
  });

  it('noise on the samples follows the image-domain SNR; same seed, same bytes', async () => {
    const request = {
      source: phantom,
      matrix,
      sampling: { pattern: 'radial', acceleration: 2, angles: 'golden' },
      noise: { snr: 20 },
      method: { name: 'zero-filled' },
    } as const;
    const a = await runReconstruction(request, 3);
    const b = await runReconstruction(request, 3);
    expect(a.images.reconstruction.data).toEqual(b.images.reconstruction.data);
    expect(a.notes.some((n) => n.startsWith('complex Gaussian noise'))).toBe(true);
  });

  it('cs-tv runs on the NUFFT operator and beats gridding at R = 4 golden-angle radial', async () => {
    const request = (method: { name: 'zero-filled' } | { name: 'cs-tv' }) =>
      runReconstruction(
        {
          source: phantom,
          matrix,
          sampling: { pattern: 'radial', acceleration: 4, angles: 'golden' },
          method,
        },
        undefined,
      );
    const gridded = await request({ name: 'zero-filled' });
    const tv = await request({ name: 'cs-tv' });
    // Measured 0.4676 (gridding) and 0.1579 (cs-tv, default λ and its default cap of 300 iterations of
    // the linearised primal–dual solver, density-weighted data term; 0.2141 after 100, 0.1341 after 1000).
    expect(gridded.metrics.nrmse).toBeCloseTo(0.4676, 3);
    expect(tv.metrics.nrmse).toBeLessThan(0.2);
    expect(String(tv.info.solver)).toContain('NUFFT');
  });

  it('a method that needs the grid refuses non-Cartesian samples, naming sampling.trajectory', async () => {
    const run = runReconstruction(
      {
        source: phantom,
        matrix,
        sampling: { pattern: 'radial', acceleration: 2 },
        method: { name: 'lowrank-hankel' },
      },
      undefined,
    );
    await expect(run).rejects.toBeInstanceOf(ValidationError);
    await expect(run).rejects.toMatchObject({ problems: [{ field: 'sampling.trajectory' }] });
  });
});
