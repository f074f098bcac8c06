import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../src/io/decode-image.ts';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { fixtureVolume, VOLUME_FIXTURE, volumePlanBody } from '../volume/fixture.ts';
import {
  binary,
  expectDocumented,
  expectProblem,
  finishedPlanBody,
  sharedTestApp,
  uploadFile,
} from './helpers.ts';

// The volume: 32³ of Debian mricron-data's inia19-t1-brain.nii.gz (tests/volume/fixture.ts).
// Two worker threads, so a volume's planes are split over the pool (src/services/volume-runs.ts).
const t = sharedTestApp({ workers: 2 });

async function uploadVolume(): Promise<string> {
  const res = await uploadFile(t, readFileSync(VOLUME_FIXTURE), 'brain.nii.gz', '/v1/images?slices=all');
  expect(res.status).toBe(201);
  expect(res.body.nz).toBe(32);
  return res.body.id;
}

/** A 3D reconstruction request on an uploaded volume: Poisson-disc R = 4, zero-filled. */
const volumeRequest = (imageId: string, extra: Record<string, unknown> = {}) => ({
  source: { imageId },
  matrix: { nx: 32, ny: 32, nz: 32 },
  sampling: { pattern: 'poisson-disc', acceleration: 4, seed: 1 },
  method: { name: 'zero-filled' },
  ...extra,
});

describe('volumes over HTTP', () => {
  it('uploads a NIfTI volume, reconstructs it in 3D and answers per-plane scores (documented)', async () => {
    const id = await uploadVolume();
    const res = await t.http().post('/v1/reconstructions').send(volumeRequest(id));
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.volume.acquisition).toBe('3d');
    expect(res.body.volume.slices.nrmse).toHaveLength(32);
    expect(res.body.metrics.nrmse).toBeGreaterThan(0);
    // The planes ran in two runs on two threads: the same numbers as the whole request in one thread.
    const direct = await runReconstruction(parseReconstructionRequest(volumeRequest(id)), undefined, {
      loadVolume: fixtureVolume,
    });
    expect(res.body.metrics).toEqual(direct.metrics);
    expect(res.body.volume.slices.ssim).toEqual(direct.volume?.slices.ssim);
    expect(res.body.zeroFilledMetrics).toEqual(direct.metrics);
    const png = await t.http().get(res.body.images.reconstruction);
    expect(png.status).toBe(200);
  });

  it('images.nii of a volume: float32 nx × ny × nz volumes, read back by the NIfTI reader', async () => {
    const id = await uploadVolume();
    const res = await t.http().post('/v1/reconstructions').send(volumeRequest(id));
    expect(res.status).toBe(201);
    const path = `/v1/results/${res.body.id}/images.nii`;
    const nii = await t.http().get(path).buffer(true).parse(binary);
    expect(nii.status).toBe(200);
    await expectDocumented('GET', path, nii);
    expect(nii.headers['x-volumes']).toBe('reconstruction,zero-filled,reference,error-map');
    const bytes = nii.body as Buffer;
    // NIfTI-1 dim (nifti1.h, docs/references.md §10.2): [4, nx, ny, nz, volumes], float32 from byte 352.
    expect([0, 1, 2, 3, 4].map((i) => bytes.readInt16LE(40 + 2 * i))).toEqual([4, 32, 32, 32, 4]);
    expect(bytes.length).toBe(352 + 4 * 32 ** 3 * 4);
    const volumes = await Promise.all(
      [0, 1, 2, 3].map(async (volume) => (await decodeImage(bytes, { volume, wholeVolume: true })).volume!),
    );
    const [reconstruction, zeroFilled, reference, errorMap] = volumes.map((v) => v.data);
    // The reference is the uploaded mricron-data volume itself (32³, no resampling), to float32 rounding.
    const uploaded = (await fixtureVolume()).data;
    const top = Math.max(...uploaded);
    let worst = 0;
    for (let i = 0; i < uploaded.length; i++) worst = Math.max(worst, Math.abs(reference[i] - uploaded[i]));
    expect(worst).toBeLessThan(1e-6 * top);
    // Zero-filled method: the zero-filled volume is the reconstruction; the error map |recon − ref|.
    expect(zeroFilled).toEqual(reconstruction);
    worst = 0;
    for (let i = 0; i < errorMap.length; i++)
      worst = Math.max(worst, Math.abs(errorMap[i] - Math.abs(reconstruction[i] - reference[i])));
    expect(worst).toBeLessThan(1e-6 * top);
    // NRMSE = ‖x̂ − x‖₂ / ‖x‖₂ (docs/design.md §3.6) over every voxel is the response's volume NRMSE, and
    // over each x-plane (a 3D request's planes, ny × nz) the per-plane value, to float32 rounding.
    const nrmseOver = (voxels: (i: number) => number, count: number) => {
      let error = 0;
      let norm = 0;
      for (let n = 0; n < count; n++) {
        const i = voxels(n);
        error += (reconstruction[i] - reference[i]) ** 2;
        norm += reference[i] ** 2;
      }
      return Math.sqrt(error / norm);
    };
    expect(nrmseOver((i) => i, 32 ** 3)).toBeCloseTo(res.body.metrics.nrmse, 5);
    const planes = res.body.volume.slices.nrmse as (number | null)[];
    planes.forEach((value, x) => {
      // Voxel (x, y, z) sits at (z·ny + y)·nx + x; n runs over the plane's ny·nz voxels.
      if (value !== null) expect(nrmseOver((n) => n * 32 + x, 32 * 32)).toBeCloseTo(value, 5);
    });
    // The 16-bit PNG shows the central z-slice, with the white of its 8-bit PNG (the slice's maximum).
    const png = await t.http().get(`/v1/results/${res.body.id}/reference.png?depth=16`);
    expect(png.status).toBe(200);
    const centre = reference.subarray(16 * 32 * 32, 17 * 32 * 32);
    expect(Number(png.headers['x-grey-white'])).toBeCloseTo(Math.max(...centre), 3);
  });

  // The bundle read outside the service: nibabel + numpy (tests/reference/volume_acquisition_check.py)
  // rebuild the zero-filled volume from acquisition.nii and acquisition.json.
  const checkScript = new URL('../reference/volume_acquisition_check.py', import.meta.url).pathname;
  for (const acquisition of ['3d', 'multi-slice'] as const) {
    it(`acquisition export of a ${acquisition} volume: numpy's zero-filled volume is the service's`, async () => {
      const id = await uploadVolume();
      const res = await t
        .http()
        .post('/v1/reconstructions')
        .send(volumeRequest(id, { acquisition, noise: { snr: 30 } }));
      expect(res.status).toBe(201);
      const urls = res.body.acquisition as { nifti: string; json: string };
      expect(urls.nifti).toBe(`/v1/results/${res.body.id}/acquisition.nii`);
      const header = (await t.http().get(urls.json)).body;
      const plane = 32 * 32; // the mask's grid: ky × kz (3D) or ky × kx (multi-slice)
      expect(header).toMatchObject({
        matrix: { nx: 32, ny: 32, nz: 32 },
        volume: { acquisition },
        coils: 1,
        samples: { datatype: 'complex64', dims: [32, 32, 32, 1] },
        noise: { prewhitened: false },
        table: { columns: ['order', 'ky', acquisition === '3d' ? 'kz' : 'kx'], unit: 'grid index' },
      });
      // E|n|² = 2σ² per complex sample, σ from the response's note (4 significant digits, design §3.5).
      const note = (res.body.notes as string[]).find((n) => n.includes('σ ='));
      const sigma = Number(note?.match(/σ = ([\d.e+-]+)/)?.[1]);
      expect(Math.abs(header.noise.variancePerSample / (2 * sigma ** 2) - 1)).toBeLessThan(1.5e-3);
      const folder = mkdtempSync(join(tmpdir(), 'kspace-volume-acquisition-'));
      for (const name of ['acquisition.nii', 'acquisition.json', 'images.nii']) {
        const file = await t.http().get(`/v1/results/${res.body.id}/${name}`).buffer(true).parse(binary);
        expect(file.status).toBe(200);
        writeFileSync(join(folder, name), file.body as Buffer);
      }
      const facts = JSON.parse(execFileSync('/usr/bin/python3', [checkScript, folder], { encoding: 'utf8' }));
      expect(facts).toMatchObject({ dtype: 'complex64', shape: [32, 32, 32, 1], datatype: 32 });
      expect(facts.tableCount).toBe(Math.round(header.sampling.fraction * plane));
      expect(facts.heldOutsideTable).toBe(0);
      expect(facts.tableWithoutData).toBe(0);
      // float32 storage of samples and volumes: agreement to about 1e-6 of the maximum.
      expect(facts.maxRelativeDifference).toBeLessThan(1e-5);
    });
  }

  it('a 2D upload cannot be a volume source: 422 naming source.imageId', async () => {
    const flat = await uploadFile(t, readFileSync(VOLUME_FIXTURE), 'brain.nii.gz');
    const res = await t.http().post('/v1/reconstructions').send(volumeRequest(flat.body.id));
    expectProblem(res, 422, 'source.imageId');
  });

  it('refuses a receive array with a volume: 422 naming the field', async () => {
    const id = await uploadVolume();
    const loops = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25, correlation: 0.1 };
    const res = await t
      .http()
      .post('/v1/reconstructions')
      .send(volumeRequest(id, { coils: loops }));
    expectProblem(res, 422, 'coils');
  });

  it('plans 3D and multi-slice in one table', async () => {
    const id = await uploadVolume();
    const res = await t.http().post('/v1/plans').send(volumePlanBody(id));
    expect(res.status).toBe(202);
    const body = await finishedPlanBody(t, res.body.id);
    expect(body.status).toBe('done');
    expect(body.table.rows.map((r: { acquisition: string }) => r.acquisition)).toEqual([
      '3d',
      '3d',
      'multi-slice',
    ]);
  });
});
