import { beforeAll, describe, expect, it } from 'vitest';
import type { RawKspace } from '../../src/acquisition/index.ts';
import { type FieldProblem, ValidationError } from '../../src/core/errors.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { importRawKspace } from '../../src/io/ismrmrd/import-raw-kspace.ts';
import {
  parseReconstructionRequest,
  type ReconstructionRequest,
  runReconstruction,
} from '../../src/pipeline/run-reconstruction.ts';
import {
  hybridPlane,
  peakRelativeError,
  raw3dBytes,
  raw3dFileName,
  raw3dReference as reference,
} from '../io/ismrmrd/raw-3d-fixture.ts';

// The 3D file of tests/reference/generate_ismrmrd_3d_fixture.py: 4 coils, 16 × 16 × 12, noise scans.
let raw: RawKspace;
beforeAll(async () => {
  const imported = await importRawKspace(new Uint8Array(raw3dBytes(raw3dFileName)), defaultLimits);
  raw = imported;
});

const ctx = () => ({ loadRaw: async () => raw });
const matrix = { nx: reference.nx, ny: reference.ny, nz: reference.nz };
const request = (extra: Record<string, unknown> = {}): ReconstructionRequest =>
  parseReconstructionRequest({
    source: { rawId: 'volume' },
    matrix,
    sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
    method: { name: 'zero-filled' },
    ...extra,
  });

describe('volume reconstructions from 3D raw data', () => {
  it('fully sampled: reference and reconstruction are numpy’s prewhitened root-sum-of-squares (1e-6)', async () => {
    const outcome = await runReconstruction(request(), 1, ctx());
    const v = outcome.volume!;
    expect(v.acquisition).toBe('3d');
    expect(v.planeAxis).toBe('x');
    expect(v.slices.nrmse).toHaveLength(reference.nx);
    // numpy: L⁻¹ of cholesky(numpy.cov(noise scans)) across coils, then sqrt(Σ_c |ifftn(k_c)|²).
    expect(peakRelativeError(v.volumes.reference.data, reference.rssWhitened)).toBeLessThan(1e-6);
    expect(peakRelativeError(v.volumes.reconstruction.data, reference.rssWhitened)).toBeLessThan(1e-6);
    expect(outcome.metrics.nrmse).toBeLessThan(1e-12);
    expect(outcome.info.combination).toBe('root-sum-of-squares');
    expect(outcome.notes.join(' ')).toMatch(/raw data, 4 coils, prewhitened/);
    expect(outcome.acquisition).toMatchObject({ coils: 4, noise: { prewhitened: true, variance: 1 } });
  });

  // Poisson-disc R = 4 with lowrank-hankel (coil data without maps), and uniform R = 2 with SENSE
  // (maps estimated from the ACS block of each plane): the two coil handlings of 2D raw requests.
  const cases = [
    {
      sampling: { pattern: 'poisson-disc', acceleration: 4 },
      method: { name: 'lowrank-hankel', iterations: 30 },
    },
    { sampling: { pattern: 'cartesian-uniform', acceleration: 2, acs: 6 }, method: { name: 'sense' } },
  ];
  it.each(cases)(
    '$sampling.pattern, $method.name: each plane scores as the 2D raw pipeline on its hybrid-space plane',
    async ({ sampling, method }) => {
      const outcome = await runReconstruction(request({ sampling, method }), 5, ctx());
      const v = outcome.volume!;
      // The ky–kz mask: ny rows × nz columns, one for every x.
      expect([outcome.sampled.ny, outcome.sampled.nx]).toEqual([reference.ny, reference.nz]);
      expect(outcome.metrics.nrmse).toBeGreaterThan(0.01);
      for (let x = 0; x < reference.nx; x++) {
        // Independently: the plane at x by the written-out inverse DFT along kx, given to the 2D
        // pipeline as raw data of its own (ky × kz matrix, same noise covariance, same pattern and seed).
        const plane = {
          kspace: hybridPlane(raw.kspace, reference.nz, x),
          noiseCovariance: raw.noiseCovariance,
        };
        const flat = await runReconstruction(
          parseReconstructionRequest({
            source: { rawId: 'plane' },
            matrix: { nx: reference.nz, ny: reference.ny },
            sampling,
            method,
          }),
          5,
          { loadRaw: async () => plane },
        );
        expect(Array.from(flat.sampled.mask)).toEqual(Array.from(outcome.sampled.mask));
        // Same operations in another order (prewhitening and the readout DFT commute): rounding only
        // (measured ≤ 6e-14 relative for lowrank-hankel, 5e-15 for SENSE).
        expect(v.slices.nrmse[x]).toBeCloseTo(flat.metrics.nrmse, 9);
        expect(v.slices.psnr[x]).toBeCloseTo(flat.metrics.psnr, 7);
        expect(v.slices.ssim[x]).toBeCloseTo(flat.metrics.ssim, 9);
        expect(v.slices.hfen[x]).toBeCloseTo(flat.metrics.hfen, 9);
      }
    },
  );

  it('refuses multi-slice (422 on acquisition), another matrix or a 2D request (matrix), a coil array (coils)', async () => {
    const refused = async (extra: Record<string, unknown>): Promise<FieldProblem> => {
      const error = await runReconstruction(request(extra), 1, ctx()).then(
        () => null,
        (e: unknown) => e,
      );
      expect(error).toBeInstanceOf(ValidationError);
      return (error as ValidationError).problems[0];
    };
    expect((await refused({ acquisition: 'multi-slice' })).field).toBe('acquisition');
    expect(await refused({ matrix: { ...matrix, nz: 16 } })).toMatchObject({
      field: 'matrix',
      allowed: '{ nx: 16, ny: 16, nz: 12 }',
    });
    expect((await refused({ matrix: { nx: matrix.nx, ny: matrix.ny } })).field).toBe('matrix');
    const array = { array: 'gaussian', count: 4, width: 0.5, ringRadius: 1 };
    expect((await refused({ coils: array })).field).toBe('coils');
  });
});
