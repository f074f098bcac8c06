import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { whitenedRawKspace } from '../../src/acquisition/index.ts';
import { readRawKspace } from '../../src/io/ismrmrd/read-raw-kspace.ts';
import { download, reconstructWithBundle } from './acquisition-helpers.ts';
import { binary, expectDocumented, expectProblem, sharedTestApp, type TestApp } from './helpers.ts';

/**
 * The acquisition bundle (docs/design.md §4.11) read outside the service: Debian's python3-nibabel
 * and python3-numpy (tests/reference/acquisition_bundle_check.py) reconstruct the zero-filled image
 * from acquisition.nii and acquisition.json and compare it with the service's images.nii.
 */
const fixture = readFileSync(new URL('../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url));
const checkScript = new URL('../reference/acquisition_bundle_check.py', import.meta.url).pathname;

/** Writes a result's bundle and images.nii to a folder and runs the numpy check on it. */
async function numpyCheck(t: TestApp, id: string) {
  const folder = mkdtempSync(join(tmpdir(), 'kspace-acquisition-'));
  for (const name of ['acquisition.nii', 'acquisition.json', 'images.nii']) {
    writeFileSync(join(folder, name), await download(t, `/v1/results/${id}/${name}`));
  }
  const out = execFileSync('/usr/bin/python3', [checkScript, folder], { encoding: 'utf8' });
  return JSON.parse(out) as {
    dtype: string;
    shape: number[];
    datatype: number;
    tableCount: number;
    nonzeroOutsideTable: number;
    maxRelativeDifference: number;
  };
}

describe('acquisition export', () => {
  const t = sharedTestApp();
  let rawId = '';

  it('raw 4-coil data at R = 2: numpy’s zero-filled RSS of the exported k-space is the service’s zero-filled image', async () => {
    rawId = (await t.http().post('/v1/raw').attach('file', fixture, 'a.h5')).body.id;
    const id = await reconstructWithBundle(t, {
      source: { rawId },
      matrix: { nx: 64, ny: 64 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2, acs: 8 },
    });
    const header = (await t.http().get(`/v1/results/${id}/acquisition.json`)).body;
    expect(header).toMatchObject({
      resultId: id,
      geometry: 'cartesian',
      matrix: { nx: 64, ny: 64 },
      coils: 4,
      samples: { datatype: 'complex64', dims: [64, 64, 1, 4] },
      // The fixture has a noise scan: prewhitened, unit variance per complex sample, nothing added.
      noise: { prewhitened: true, variancePerSample: 1 },
      ordering: 'linear',
      table: { columns: ['order', 'ky', 'kx'], unit: 'grid index' },
    });
    const facts = await numpyCheck(t, id);
    expect(facts).toMatchObject({ dtype: 'complex64', shape: [64, 64, 1, 4], datatype: 32 });
    // Every 2nd line plus the 8 ACS lines (36 of 64, 64 points each): the table counts the fraction's points.
    expect(facts.tableCount).toBe(header.sampling.fraction * 64 * 64);
    expect(facts.tableCount).toBe(36 * 64);
    expect(facts.nonzeroOutsideTable).toBe(0);
    expect(facts.maxRelativeDifference).toBeLessThan(1e-6);
  });

  it('single coil phantom with noise: the same check, and the noise variance is 2σ² of the note', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 48, ny: 40 },
      sampling: { pattern: 'cartesian-random', acceleration: 3, acs: 6, seed: 5 },
      noise: { snr: 30 },
    });
    const header = (await t.http().get(`/v1/results/${id}/acquisition.json`)).body;
    const note = (await t.http().get(`/v1/reconstructions/${id}`)).body.notes.find((n: string) =>
      n.startsWith('complex Gaussian noise'),
    );
    const sigma = Number(/σ = ([0-9.e+-]+)/.exec(note)![1]);
    expect(header.noise.prewhitened).toBe(false);
    expect(header.noise.variancePerSample / (2 * sigma * sigma)).toBeCloseTo(1, 3);
    const facts = await numpyCheck(t, id);
    expect(facts.shape).toEqual([48, 40, 1, 1]);
    expect(facts.nonzeroOutsideTable).toBe(0);
    expect(facts.maxRelativeDifference).toBeLessThan(1e-6);
  });

  it('a fully sampled raw export holds the imported, prewhitened k-space sample for sample', async () => {
    const id = await reconstructWithBundle(t, {
      source: { rawId },
      matrix: { nx: 64, ny: 64 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
    });
    const nii = await download(t, `/v1/results/${id}/acquisition.nii`);
    const imported = await readRawKspace(new Uint8Array(fixture));
    // The service stores raw k-space as float32 (table raw_kspace): round the same way first.
    const kspace = { ...imported.kspace, data: Float64Array.from(Float32Array.from(imported.kspace.data)) };
    const whitened = whitenedRawKspace({ kspace, noiseCovariance: imported.noise!.covariance });
    const expected = Float32Array.from(whitened.data);
    const exported = new Float32Array(nii.buffer.slice(nii.byteOffset + 352, nii.byteOffset + nii.length));
    expect(exported.length).toBe(expected.length);
    let differing = 0;
    for (let i = 0; i < expected.length; i++) if (exported[i] !== expected[i]) differing++;
    expect(differing).toBe(0);
  });

  it('radial samples: dims [samples per readout, readouts, 1, coils] and the trajectory table in cycles per FOV', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'radial', acceleration: 4, trajectory: 'non-cartesian' },
    });
    const header = (await t.http().get(`/v1/results/${id}/acquisition.json`)).body;
    const table = (
      await t
        .http()
        .post('/v1/masks')
        .send({
          matrix: { nx: 32, ny: 32 },
          sampling: { pattern: 'radial', acceleration: 4, trajectory: 'non-cartesian' },
        })
    ).body;
    const maskTable = (await t.http().get(table.tables.json)).body;
    expect(header.geometry).toBe('non-cartesian');
    expect(header.table.columns).toEqual(['order', 'kx', 'ky']);
    // The same points as the mask's own sample table.
    expect(header.table.rows).toEqual(maskTable.samples);
    const [perReadout, readouts, one, coils] = header.samples.dims;
    expect(one).toBe(1);
    expect(coils).toBe(1);
    expect(perReadout * readouts).toBe(maskTable.count);
    const nii = await download(t, `/v1/results/${id}/acquisition.nii`);
    expect(nii.length).toBe(352 + 8 * perReadout * readouts);
    expect(nii.readInt16LE(70)).toBe(32);
  });

  it('acquisition.h5 is a documented 404 of type format-not-available with a Link to the bundle', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 16, ny: 16 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
    });
    const res = await t.http().get(`/v1/results/${id}/acquisition.h5`);
    const problem = expectProblem(res, 404, 'id');
    expect(problem.type).toBe('/problems/format-not-available');
    expect(res.headers.link).toContain(`</v1/results/${id}/acquisition.nii>; rel="alternate"`);
    expect(res.headers.link).toContain(`</v1/results/${id}/acquisition.json>; rel="describedby"`);
    await expectDocumented('GET', `/v1/results/${id}/acquisition.h5`, res);
    const documented = await t.http().get('/problems/format-not-available');
    expect(documented.status).toBe(200);
    await expectDocumented(
      'GET',
      `/v1/results/${id}/acquisition.nii`,
      await t.http().get(`/v1/results/${id}/acquisition.nii`).buffer(true).parse(binary),
    );
    expectProblem(await t.http().get('/v1/results/nope/acquisition.nii'), 404, 'id');
    expectProblem(await t.http().get('/v1/results/nope/acquisition.json'), 404, 'id');
    expectProblem(await t.http().get('/v1/results/nope/acquisition.h5'), 404, 'id');
  });

  it('deleting the result deletes its acquisition', async () => {
    const id = await reconstructWithBundle(t, {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 16, ny: 16 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
    });
    expect((await t.http().delete(`/v1/results/${id}`)).status).toBe(204);
    expectProblem(await t.http().get(`/v1/results/${id}/acquisition.nii`), 404, 'id');
    expect(t.app.services.store.getResultAcquisition(id)).toBeUndefined();
  });
});
