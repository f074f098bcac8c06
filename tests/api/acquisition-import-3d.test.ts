import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { relativeMaxError } from '../error-measures.ts';
import {
  peakRelativeError,
  raw3dBytes,
  raw3dFileName,
  raw3dReference as reference,
  rssVolume,
} from '../io/ismrmrd/raw-3d-fixture.ts';
import { VOLUME_FIXTURE } from '../volume/fixture.ts';
import {
  type BundleJson,
  differing,
  download,
  exported,
  importBundle,
  reconstructWithBundle,
  VOXELS_AT,
  voxels,
} from './acquisition-helpers.ts';
import { expectDocumented, expectProblem, sharedTestApp, uploadFile } from './helpers.ts';

/**
 * POST /v1/raw with the acquisition bundle of a volume (docs/design.md §4.8, §4.11): a fully
 * sampled 3D export is stored as 3D raw data (nz > 1), as a 3D ISMRMRD import is. Data: the 3D file
 * of tests/reference/generate_ismrmrd_3d_fixture.py (h5py and numpy: 4 coils, 16 × 16 × 12, noise
 * scans) and the 32³ volume of Debian mricron-data's inia19-t1-brain.nii.gz (tests/volume/fixture.ts).
 * The samples are float32 in the bundle and in the raw store, so the import is asked to be exact.
 */
const t = sharedTestApp({ workers: 2 });
const matrix3d = { nx: reference.nx, ny: reference.ny, nz: reference.nz };
const fullySampled = { pattern: 'cartesian-uniform', acceleration: 1 };

async function importFixture(): Promise<string> {
  const res = await t.http().post('/v1/raw').attach('file', raw3dBytes(raw3dFileName), raw3dFileName);
  expect(res.status).toBe(201);
  return res.body.id;
}

async function uploadVolume(): Promise<string> {
  const res = await uploadFile(t, readFileSync(VOLUME_FIXTURE), 'brain.nii.gz', '/v1/images?slices=all');
  expect(res.status).toBe(201);
  return res.body.id;
}

describe('POST /v1/raw (acquisition bundle of a 3D volume)', () => {
  it('3D ISMRMRD file → fully sampled volume → bundle → import: the same samples bit for bit, stored as 3D raw data', async () => {
    const rawId = await importFixture();
    const request = { matrix: matrix3d, sampling: fullySampled };
    const firstId = await reconstructWithBundle(t, { source: { rawId }, ...request });
    const first = await exported(t, firstId);
    expect(first.json).toMatchObject({
      matrix: matrix3d,
      volume: { acquisition: '3d' },
      coils: reference.coils,
      samples: { dims: [reference.nx, reference.ny, reference.nz, reference.coils] },
      // Prewhitened with the file's noise scans, nothing added: unit variance per complex sample.
      noise: { prewhitened: true, variancePerSample: 1 },
    });
    expect(first.json.samples.count).toBe(reference.nx * reference.ny * reference.nz);

    const res = await importBundle(t, first.nifti, first.header);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/raw', res);
    expect(res.body).toMatchObject({
      ...matrix3d,
      coils: reference.coils,
      readoutOversampling: 1,
      readoutSamples: reference.nx,
      noiseScans: 0,
      format: 'acquisition-bundle',
      noiseVariancePerSample: 1,
      encodedFieldOfViewMm: null,
    });
    expect((await t.http().get(`/v1/raw/${res.body.id}`)).body.nz).toBe(reference.nz);
    const stored = t.app.services.store.getRawKspace(res.body.id)!;
    expect(stored.nz).toBe(reference.nz);
    expect(stored.kspace.coils).toBe(reference.coils);
    expect(differing(Float32Array.from(stored.kspace.data), voxels(first.nifti))).toBe(0);
    // The layout against numpy (generate_ismrmrd_3d_fixture.py): the RSS of the inverse 3D DFT of
    // the imported samples is the file's prewhitened RSS volume, to float32 rounding.
    expect(peakRelativeError(rssVolume(stored.kspace, reference.nz), reference.rssWhitened)).toBeLessThan(
      1e-5,
    );

    // Reconstructed again as a volume from the imported data (Ψ = 1·I): the same samples and volume.
    const secondId = await reconstructWithBundle(t, { source: { rawId: res.body.id }, ...request });
    const second = await exported(t, secondId);
    expect(second.json.noise).toEqual({ ...first.json.noise, seed: second.json.noise.seed });
    // The samples went through the readout transform there and back in float64 and were rounded to
    // float32 again: the same bits (measured: 0 of 24576 values differ).
    expect(differing(voxels(second.nifti), voxels(first.nifti))).toBe(0);
    // The images agree to float32 rounding (the first run saw float64 samples, the second float32).
    const [again, before] = await Promise.all(
      [secondId, firstId].map(async (id) => voxels(await download(t, `/v1/results/${id}/images.nii`))),
    );
    expect(again.length).toBe(before.length);
    expect(relativeMaxError(again, before)).toBeLessThan(1e-6);
  });

  it('a fully sampled single-coil volume (uploaded, SNR 30) round-trips exactly and keeps its noise variance', async () => {
    const imageId = await uploadVolume();
    const request = { matrix: { nx: 32, ny: 32, nz: 32 }, sampling: fullySampled };
    const id = await reconstructWithBundle(t, { source: { imageId }, ...request, noise: { snr: 30 } });
    const bundle = await exported(t, id);
    const variance = bundle.json.noise.variancePerSample;
    expect(variance).toBeGreaterThan(0);
    const res = await importBundle(t, bundle.nifti, bundle.header);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ nx: 32, ny: 32, nz: 32, coils: 1, noiseVariancePerSample: variance });
    const stored = t.app.services.store.getRawKspace(res.body.id)!;
    expect(stored.nz).toBe(32);
    expect(differing(Float32Array.from(stored.kspace.data), voxels(bundle.nifti))).toBe(0);
    expect(Array.from(stored.noiseCovariance!)).toEqual([variance, 0]);
    // Reconstructed from the import, the data are prewhitened with Ψ = v·I: the samples ÷ √v.
    const again = await exported(
      t,
      await reconstructWithBundle(t, { source: { rawId: res.body.id }, ...request }),
    );
    expect(again.json.noise).toMatchObject({ prewhitened: true, variancePerSample: 1 });
    const unwhitened = voxels(again.nifti).map((value) => value * Math.sqrt(variance));
    expect(relativeMaxError(unwhitened, voxels(bundle.nifti))).toBeLessThan(1e-6);
  });

  it('an undersampled 3D export is a 422 on header.samples.count with the ky–kz points acquired', async () => {
    const rawId = await importFixture();
    const id = await reconstructWithBundle(t, {
      source: { rawId },
      matrix: matrix3d,
      sampling: { pattern: 'poisson-disc', acceleration: 4, seed: 2 },
    });
    const bundle = await exported(t, id);
    const problem = expectProblem(
      await importBundle(t, bundle.nifti, bundle.header),
      422,
      'header.samples.count',
    );
    // The sample table lists the acquired ky–kz points (every kx of each is in samples.count).
    const lines = bundle.json.table.rows.length;
    const total = reference.ny * reference.nz;
    expect(lines).toBeLessThan(total);
    expect(bundle.json.samples.count).toBe(lines * reference.nx);
    expect(problem.errors[0].message).toContain(
      `not fully sampled: ${lines} of ${total} ky–kz points acquired`,
    );
  });

  it('a multi-slice export is a 422 on header.volume.acquisition: its slices are not one 3D acquisition', async () => {
    const imageId = await uploadVolume();
    const id = await reconstructWithBundle(t, {
      source: { imageId },
      matrix: { nx: 32, ny: 32, nz: 32 },
      acquisition: 'multi-slice',
      sampling: fullySampled,
    });
    const bundle = await exported(t, id);
    expect(bundle.json.volume).toEqual({ acquisition: 'multi-slice' });
    const res = await importBundle(t, bundle.nifti, bundle.header);
    const problem = expectProblem(res, 422, 'header.volume.acquisition');
    await expectDocumented('POST', '/v1/raw', res);
    expect(problem.errors[0].message).toContain('separate 2D acquisitions');
  });

  it('a damaged 3D bundle is a 422 naming the field, never a 500', async () => {
    const rawId = await importFixture();
    const bundle = await exported(
      t,
      await reconstructWithBundle(t, { source: { rawId }, matrix: matrix3d, sampling: fullySampled }),
    );
    const header = (change: (json: BundleJson) => void) => {
      const json = structuredClone(bundle.json);
      change(json);
      return JSON.stringify(json);
    };
    const { nx, ny, nz, coils } = { ...matrix3d, coils: reference.coils };
    const cases: [string, Buffer, string, string][] = [
      [
        'dims of a 2D slice',
        bundle.nifti,
        header((j) => {
          j.samples.dims = [nx, ny, 1, coils];
        }),
        'header.samples.dims',
      ],
      [
        'matrix.nz against dims',
        bundle.nifti,
        header((j) => {
          j.matrix.nz = nz - 2;
        }),
        'header.samples.dims',
      ],
      ['no matrix.nz', bundle.nifti, header((j) => void delete j.matrix.nz), 'header.matrix.nz'],
      ['no volume', bundle.nifti, header((j) => void delete j.volume), 'header.volume'],
      [
        'nz 1',
        bundle.nifti,
        header((j) => {
          j.matrix.nz = 1;
          j.samples.dims = [nx, ny, 1, coils];
        }),
        'header.matrix.nz',
      ],
      [
        'count not whole lines',
        bundle.nifti,
        header((j) => {
          j.samples.count -= 1;
        }),
        'header.samples.count',
      ],
      ['table rows missing', bundle.nifti, header((j) => void j.table.rows.pop()), 'header.table.rows'],
      [
        'header and NIfTI of other partitions',
        bundle.nifti,
        header((j) => {
          j.matrix.nz = nz + 2;
          j.samples.dims = [nx, ny, nz + 2, coils];
          j.samples.count = nx * ny * (nz + 2);
          j.table.rows = new Array(ny * (nz + 2)).fill([0, 0, 0]);
        }),
        'nifti.dim[3]',
      ],
    ];
    for (const [what, nifti, json, field] of cases) {
      const res = await importBundle(t, nifti, json);
      expect(res.status, what).toBe(422);
      expectProblem(res, 422, field);
    }
    const nan = Buffer.from(bundle.nifti);
    // Voxel (u 3, v 2, w 5, coil 1): 8 bytes per complex voxel, x fastest, then y, z, coil.
    nan.writeFloatLE(Number.NaN, VOXELS_AT + 8 * (((1 * nz + 5) * ny + 2) * nx + 3));
    const notFinite = expectProblem(await importBundle(t, nan, bundle.header), 422, 'nifti');
    expect(notFinite.errors[0].message).toContain('(u 3, v 2, w 5, coil 1) is not a finite number');
  });
});
