import { beforeAll, describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import type { RealVolume } from '../../src/core/real-volume.ts';
import {
  parseReconstructionRequest,
  type ReconstructionRequest,
  runReconstruction,
} from '../../src/pipeline/run-reconstruction.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { fixtureVolume } from './fixture.ts';

// The volume: 32³ of Debian mricron-data's inia19-t1-brain.nii.gz (tests/volume/fixture.ts).
let volume: RealVolume;
beforeAll(async () => {
  volume = await fixtureVolume();
});

const ctx = () => ({ loadVolume: async () => volume });
const base = {
  source: { imageId: 'brain' },
  matrix: { nx: 32, ny: 32, nz: 32 },
  method: { name: 'zero-filled' },
};

function request(extra: Record<string, unknown>): ReconstructionRequest {
  return parseReconstructionRequest({ ...base, ...extra });
}

function maxAbsDifference(a: Float64Array, b: Float64Array): number {
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

describe('volume reconstructions (matrix.nz > 1)', () => {
  it('decodes the fixture as 32³ with content (the NIfTI reader keeps every slice)', () => {
    expect([volume.nx, volume.ny, volume.nz]).toEqual([32, 32, 32]);
    expect(Math.max(...volume.data)).toBe(1000);
  });

  for (const acquisition of ['3d', 'multi-slice'] as const) {
    it(`${acquisition}, fully sampled: the reconstruction is the volume to float tolerance`, async () => {
      const outcome = await runReconstruction(
        request({ acquisition, sampling: { pattern: 'cartesian-uniform', acceleration: 1 } }),
        1,
        ctx(),
      );
      const v = outcome.volume!;
      expect(v.acquisition).toBe(acquisition);
      expect(v.slices.nrmse).toHaveLength(32);
      // The stacked reference is |volume| itself, and the reconstruction matches it voxel by voxel.
      expect(maxAbsDifference(v.volumes.reference.data, volume.data)).toBe(0);
      expect(maxAbsDifference(v.volumes.reconstruction.data, volume.data)).toBeLessThan(1e-9);
      expect(outcome.metrics.nrmse).toBeLessThan(1e-12);
      expect(outcome.images.reconstruction.nx * outcome.images.reconstruction.ny).toBe(32 * 32);
    });
  }

  it('3D at R = 4 Poisson-disc: per-plane scores equal the 2D pipeline run on each hybrid-space plane', async () => {
    const sampling = { pattern: 'poisson-disc', acceleration: 4 };
    const method = { name: 'cs-tv', lambda: 0.01, iterations: 30 };
    const outcome = await runReconstruction(request({ sampling, method }), 3, ctx());
    const v = outcome.volume!;
    expect(v.planeAxis).toBe('x');
    // The ky–kz mask: ny rows × nz columns.
    expect([outcome.sampled.ny, outcome.sampled.nx]).toEqual([32, 32]);
    let compared = 0;
    for (let x = 0; x < volume.nx; x++) {
      // Independently: the y–z plane at x as a 2D image (rows y, columns z). With the readout fully
      // sampled and no noise, its hybrid-space k-space is the plane's own 2D DFT, which the 2D
      // pipeline makes from the upload.
      const data = new Float64Array(volume.ny * volume.nz);
      for (let y = 0; y < volume.ny; y++)
        for (let z = 0; z < volume.nz; z++)
          data[y * volume.nz + z] = volume.data[(z * volume.ny + y) * volume.nx + x];
      const plane: RealImage = { nx: volume.nz, ny: volume.ny, data };
      if (data.every((value) => value === 0)) {
        expect(v.slices.nrmse[x]).toBeNull();
        continue;
      }
      const single = await runReconstruction(
        parseReconstructionRequest({
          source: { imageId: 'plane' },
          matrix: { nx: 32, ny: 32 },
          sampling,
          method,
        }),
        3,
        { loadImage: async () => plane },
      );
      expect(v.slices.nrmse[x]).toBeCloseTo(single.metrics.nrmse, 10);
      expect(v.slices.psnr[x]).toBeCloseTo(single.metrics.psnr, 8);
      expect(v.slices.ssim[x]).toBeCloseTo(single.metrics.ssim, 10);
      compared++;
    }
    expect(compared).toBeGreaterThan(20);
    // Undersampled, so not exact, yet far better than nothing.
    expect(outcome.metrics.nrmse).toBeGreaterThan(0.01);
    expect(outcome.metrics.nrmse).toBeLessThan(0.5);
  });

  it('multi-slice R = 4 keeps the volume scores consistent with its planes (mean SSIM)', async () => {
    const outcome = await runReconstruction(
      request({ acquisition: 'multi-slice', sampling: { pattern: 'poisson-disc', acceleration: 4 } }),
      2,
      ctx(),
    );
    const v = outcome.volume!;
    expect(v.planeAxis).toBe('z');
    expect([outcome.sampled.ny, outcome.sampled.nx]).toEqual([32, 32]);
    const scored = v.slices.ssim.filter((s) => s !== null);
    expect(scored.length).toBeGreaterThan(20);
    const mean = scored.reduce((a, b) => a + b, 0) / scored.length;
    expect(outcome.metrics.ssim).toBeCloseTo(mean, 12);
  });

  it('refuses what volumes do not support, naming the field (422)', async () => {
    const refusals: Array<[Record<string, unknown>, string]> = [
      [{ source: { phantom: 'shepp-logan' } }, 'source.phantom'],
      [{ coils: { array: 'loops', count: 4 } }, 'coils'],
      [{ sampling: { pattern: 'radial', acceleration: 2 } }, 'sampling.trajectory'],
      [{ phase: { order: 1, seed: 1 } }, 'phase'],
    ];
    for (const [extra, field] of refusals) {
      const req = { ...request({ sampling: { pattern: 'poisson-disc', acceleration: 4 } }), ...extra };
      const error = await runReconstruction(req as ReconstructionRequest, 1, ctx()).catch((e) => e);
      expect(error, field).toBeInstanceOf(ValidationError);
      expect((error as ValidationError).problems[0].field).toBe(field);
    }
    const flat = parseReconstructionRequest({
      ...base,
      matrix: { nx: 32, ny: 32 },
      acquisition: '3d',
      sampling: { pattern: 'poisson-disc', acceleration: 4 },
    });
    const error = await runReconstruction(flat, 1, { loadImage: async () => volume as RealImage }).catch(
      (e) => e,
    );
    expect((error as ValidationError).problems[0].field).toBe('acquisition');
  });

  it('the matrix schema takes nz = 1 or ≥ 11, bounded by the voxel limit', () => {
    const field = (matrix: unknown) =>
      caughtValidationError(() =>
        parseReconstructionRequest({
          ...base,
          matrix,
          sampling: { pattern: 'poisson-disc', acceleration: 4 },
        }),
      ).problems.map((p) => p.field);
    expect(field({ nx: 32, ny: 32, nz: 5 })).toEqual(['matrix.nz']);
    expect(field({ nx: 1024, ny: 1024, nz: 16 })).toEqual(['matrix.nz']);
    expect(
      parseReconstructionRequest({
        ...base,
        matrix: { nx: 32, ny: 32, nz: 1 },
        sampling: { pattern: 'poisson-disc', acceleration: 4 },
      }).matrix.nz,
    ).toBe(1);
  });
});
