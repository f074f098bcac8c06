import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { relativeMaxError } from '../error-measures.ts';
import {
  differing,
  download,
  exported,
  importBundle,
  type BundleJson as Json,
  reconstructWithBundle,
  VOXELS_AT,
  voxels,
} from './acquisition-helpers.ts';
import { expectDocumented, expectProblem, sharedTestApp } from './helpers.ts';

/**
 * POST /v1/raw with an acquisition bundle (docs/design.md §4.8, §4.11): what GET
 * /v1/results/{id}/acquisition.nii and .json export is imported again as raw k-space. The raw data
 * are the 4-coil file of Debian's ismrmrd-tools generator (tests/fixtures/ismrmrd, see
 * tests/reference/generate_ismrmrd_fixture.py); the exactness asked is bit for bit, since the
 * bundle's samples are float32 and the raw store keeps float32.
 */
const fixture = readFileSync(new URL('../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url));

const fullySampled = { pattern: 'cartesian-uniform', acceleration: 1 };

describe('POST /v1/raw (acquisition bundle)', () => {
  const t = sharedTestApp();

  it('a fully sampled single-coil phantom export imports as raw k-space holding the exported samples bit for bit', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 48, ny: 40 },
      sampling: fullySampled,
      noise: { snr: 30 },
    });
    const bundle = await exported(t, id);
    const res = await importBundle(t, bundle.nifti, bundle.header);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/raw', res);
    const variance = bundle.json.noise.variancePerSample;
    expect(variance).toBeGreaterThan(0);
    expect(res.body).toMatchObject({
      nx: 48,
      ny: 40,
      nz: 1,
      coils: 1,
      readoutOversampling: 1,
      noiseScans: 0,
      format: 'acquisition-bundle',
      noiseVariancePerSample: variance,
      encodedFieldOfViewMm: null,
    });
    expect(res.headers.location).toBe(`/v1/raw/${res.body.id}`);
    expect((await t.http().get(res.headers.location)).body).toEqual(res.body);

    // The stored raw k-space through the read path reconstructions use: the exported numbers, and
    // the header's variance kept as Ψ = v·I.
    const stored = t.app.services.store.getRawKspace(res.body.id);
    expect(stored).toBeDefined();
    expect(differing(Float32Array.from(stored!.kspace.data), voxels(bundle.nifti))).toBe(0);
    expect(Array.from(stored!.noiseCovariance!)).toEqual([variance, 0]);
    // The same NIfTI gzipped (node:zlib, RFC 1952) reads the same samples.
    const gzipped = await importBundle(t, gzipSync(bundle.nifti), bundle.header);
    expect(gzipped.status).toBe(201);
    const fromGzip = t.app.services.store.getRawKspace(gzipped.body.id)!;
    expect(differing(Float32Array.from(fromGzip.kspace.data), voxels(bundle.nifti))).toBe(0);

    // A reconstruction of the imported data is prewhitened with Ψ: its samples are the exported ones
    // divided by √v, and its noise is then unit variance per complex sample.
    const again = await reconstructWithBundle(t, {
      source: { rawId: res.body.id },
      matrix: { nx: 48, ny: 40 },
      sampling: fullySampled,
    });
    const second = await exported(t, again);
    expect(second.json.noise).toMatchObject({ prewhitened: true, variancePerSample: 1 });
    const whitened = voxels(second.nifti).map((value) => value * Math.sqrt(variance));
    expect(whitened.length).toBe(2 * 48 * 40);
    expect(relativeMaxError(whitened, voxels(bundle.nifti))).toBeLessThan(1e-6);
  });

  it('a fully sampled raw-source export round-trips: imported and reconstructed again, the samples are the same bits', async () => {
    const rawId = (await t.http().post('/v1/raw').attach('file', fixture, 'a.h5')).body.id;
    const request = { matrix: { nx: 64, ny: 64 }, sampling: fullySampled };
    const firstId = await reconstructWithBundle(t, { source: { rawId }, ...request });
    const first = await exported(t, firstId);
    // The fixture's noise scan prewhitens the data to unit variance; nothing is added.
    expect(first.json.noise).toMatchObject({ prewhitened: true, variancePerSample: 1 });

    const res = await importBundle(t, first.nifti, first.header);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ nx: 64, ny: 64, nz: 1, coils: 4, noiseVariancePerSample: 1 });
    const stored = t.app.services.store.getRawKspace(res.body.id)!;
    expect(differing(Float32Array.from(stored.kspace.data), voxels(first.nifti))).toBe(0);

    const secondId = await reconstructWithBundle(t, { source: { rawId: res.body.id }, ...request });
    const second = await exported(t, secondId);
    expect(differing(voxels(second.nifti), voxels(first.nifti))).toBe(0);
    expect(second.json.noise).toEqual({ ...first.json.noise, seed: second.json.noise.seed });
    // The images agree to float32 rounding, not bit for bit: the first reconstruction ran on the
    // prewhitened samples in float64, the export (and so the second) on them rounded to complex64.
    // (Consecutive voxel pairs are compared as complex pairs, relative to the largest pair.)
    const [again, before] = await Promise.all(
      [secondId, firstId].map(async (id) => voxels(await download(t, `/v1/results/${id}/images.nii`))),
    );
    expect(again.length).toBe(before.length);
    expect(relativeMaxError(again, before)).toBeLessThan(1e-6);
  });

  it('an undersampled export is refused: 422 on header.samples.count saying it is not fully sampled, with the fraction', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2, acs: 4 },
    });
    const bundle = await exported(t, id);
    const res = await importBundle(t, bundle.nifti, bundle.header);
    const problem = expectProblem(res, 422, 'header.samples.count');
    await expectDocumented('POST', '/v1/raw', res);
    const acquired = bundle.json.samples.count;
    // Every 2nd of 32 lines plus the ACS lines the uniform pattern adds: fewer than all 32·32 points.
    expect(acquired).toBeLessThan(32 * 32);
    expect(problem.errors[0].message).toContain('not fully sampled');
    expect(problem.errors[0].message).toContain(`${acquired} of 1024 grid points`);
    expect(problem.errors[0].message).toContain(
      `fraction ${Number(bundle.json.sampling.fraction.toPrecision(4))}`,
    );
  });

  it('a non-Cartesian export is refused: 422 on header.geometry', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'radial', acceleration: 1, trajectory: 'non-cartesian' },
    });
    const bundle = await exported(t, id);
    const problem = expectProblem(await importBundle(t, bundle.nifti, bundle.header), 422, 'header.geometry');
    expect(problem.errors[0].message).toContain('non-Cartesian raw data are not accepted');
  });

  it('a damaged or mismatched bundle is a 422 (400 for missing parts) naming the field, never a 500', async () => {
    const small = await exported(
      t,
      await reconstructWithBundle(t, {
        source: { phantom: 'shepp-logan' },
        matrix: { nx: 16, ny: 16 },
        sampling: fullySampled,
      }),
    );
    const other = await exported(
      t,
      await reconstructWithBundle(t, {
        source: { phantom: 'shepp-logan' },
        matrix: { nx: 16, ny: 20 },
        sampling: fullySampled,
      }),
    );
    const header = (change: (json: Json) => void) => {
      const json = structuredClone(small.json);
      change(json);
      return JSON.stringify(json);
    };
    const cases: [string, Buffer, Buffer | string, string][] = [
      ['NIfTI of another matrix', other.nifti, small.header, 'nifti.dim[2]'],
      ['truncated NIfTI', small.nifti.subarray(0, small.nifti.length - 8), small.header, 'nifti'],
      ['not a NIfTI', Buffer.from('not a nifti file at all'), small.header, 'nifti'],
      [
        'float32 images instead of samples',
        await download(t, `/v1/results/${small.json.resultId}/images.nii`),
        small.header,
        'nifti.datatype',
      ],
      ['header not JSON', small.nifti, '{"format": ', 'header'],
      [
        'another format',
        small.nifti,
        header((j) => {
          j.format = 'kspace-planner acquisition 2';
        }),
        'header.format',
      ],
      [
        'no coils field',
        small.nifti,
        header((j) => {
          delete j.coils;
        }),
        'header.coils',
      ],
      [
        'dims against matrix',
        small.nifti,
        header((j) => {
          j.samples.dims = [16, 16, 1, 2];
        }),
        'header.samples.dims',
      ],
      [
        'table rows missing',
        small.nifti,
        header((j) => {
          j.table.rows.pop();
        }),
        'header.table.rows',
      ],
      [
        'negative variance',
        small.nifti,
        header((j) => {
          j.noise.variancePerSample = -1;
        }),
        'header.noise.variancePerSample',
      ],
    ];
    for (const [what, nifti, json, field] of cases) {
      const res = await importBundle(t, nifti, json);
      expect(res.status, what).toBe(422);
      expectProblem(res, 422, field);
      await expectDocumented('POST', '/v1/raw', res);
    }
    const nan = Buffer.from(small.nifti);
    nan.writeFloatLE(Number.NaN, VOXELS_AT + 8 * 5);
    const notFinite = expectProblem(await importBundle(t, nan, small.header), 422, 'nifti');
    expect(notFinite.errors[0].message).toContain('(u 5, v 0, coil 0) is not a finite number');

    const onlyNifti = await t.http().post('/v1/raw').attach('nifti', small.nifti, 'acquisition.nii');
    expectProblem(onlyNifti, 400, 'header');
    await expectDocumented('POST', '/v1/raw', onlyNifti);
    const both = t
      .http()
      .post('/v1/raw')
      .attach('file', fixture, 'a.h5')
      .attach('header', small.header, 'a.json');
    expectProblem(await both, 400, 'header');
  });
});
