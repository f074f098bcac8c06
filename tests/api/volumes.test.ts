import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { fixtureVolume, VOLUME_FIXTURE, volumePlanBody } from '../volume/fixture.ts';
import { expectDocumented, expectProblem, sharedTestApp, uploadFile } from './helpers.ts';

// The volume: 32³ of Debian mricron-data's inia19-t1-brain.nii.gz (tests/volume/fixture.ts).
// Two worker threads, so a volume's planes are split over the pool (src/services/volume-runs.ts).
const t = sharedTestApp({ workers: 2 });

async function uploadVolume(): Promise<string> {
  const res = await uploadFile(t, readFileSync(VOLUME_FIXTURE), 'brain.nii.gz', '/v1/images?slices=all');
  expect(res.status).toBe(201);
  expect(res.body.nz).toBe(32);
  return res.body.id;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

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
    let body = res.body;
    for (let i = 0; i < 2400 && !['done', 'failed', 'cancelled'].includes(body.status); i++) {
      await sleep(25);
      body = (await t.http().get(`/v1/plans/${res.body.id}`)).body;
    }
    expect(body.status).toBe('done');
    expect(body.table.rows.map((r: { acquisition: string }) => r.acquisition)).toEqual([
      '3d',
      '3d',
      'multi-slice',
    ]);
  });
});
