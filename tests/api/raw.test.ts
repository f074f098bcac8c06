import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import {
  expectDocumented,
  expectProblem,
  expectStoredCopy,
  oneCellPlan,
  postJson,
  sharedTestApp,
} from './helpers.ts';

/** Files made by Debian's ismrmrd-tools generator and derived by tests/reference/generate_ismrmrd_fixture.py. */
const fixture = (name: string) => readFileSync(new URL(`../fixtures/ismrmrd/${name}`, import.meta.url));
const reference = JSON.parse(
  readFileSync(new URL('../reference/fixtures/ismrmrd-rss.json', import.meta.url), 'utf8'),
) as { nx: number; ny: number; coils: number; readoutSamples: number; rssWhitened: number[] };

/** The invented identifiers generate_ismrmrd_fixture.py writes into subject.h5's XML header. */
const planted = ['Quillfeather', 'Odalys', 'INV-4471', 'Tarnwick', 'ISMRM Synthetic Imaging Lab'];

function relativeMaxError(actual: ArrayLike<number>, expected: ArrayLike<number>): number {
  let peak = 0;
  let worst = 0;
  for (let i = 0; i < expected.length; i++) {
    peak = Math.max(peak, Math.abs(expected[i]));
    worst = Math.max(worst, Math.abs(actual[i] - expected[i]));
  }
  return worst / peak;
}

const rawRequest = (rawId: string, acceleration: number) => ({
  source: { rawId },
  matrix: { nx: 64, ny: 64 },
  sampling: { pattern: 'cartesian-uniform', acceleration },
  method: { name: 'zero-filled' },
});

describe('POST /v1/raw (ISMRMRD)', () => {
  const t = sharedTestApp();
  const post = (name: string) => t.http().post('/v1/raw').attach('file', fixture(name), name);

  it('imports the generator’s file with the coils, matrix and samples of its header', async () => {
    const res = await post('shepp-logan-4coil.h5');
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/raw', res);
    // ismrmrd_generate_cartesian_shepp_logan --matrix 64 --coils 4 --oversampling 2 (read by h5py).
    expect(res.body).toMatchObject({
      nx: reference.nx,
      ny: reference.ny,
      nz: 1,
      coils: reference.coils,
      readoutOversampling: 2,
      readoutSamples: reference.readoutSamples,
      noiseScans: 1,
      noiseSamples: 128,
    });
    expect(res.headers.location).toBe(`/v1/raw/${res.body.id}`);
    await expectStoredCopy(t, res);
  });

  it('its fully sampled reconstruction is the prewhitened root-sum-of-squares numpy computes (1e-6)', async () => {
    const id = (await post('shepp-logan-4coil.h5')).body.id as string;
    const raw = t.app.services.store.getRawKspace(id);
    expect(raw).toBeDefined();
    const outcome = await runReconstruction(
      {
        source: { rawId: id },
        matrix: { nx: 64, ny: 64 },
        sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
        method: { name: 'zero-filled' },
      },
      undefined,
      { loadRaw: async () => raw! },
    );
    // numpy: L⁻¹ of cholesky(numpy.cov(noise)) across coils, then sqrt(Σ|x_c|²). Measured 6.8e-9 of
    // the maximum with the stored float32 k-space (4.8e-16 before rounding); asserted 1e-6.
    expect(relativeMaxError(outcome.images.reference.data, reference.rssWhitened)).toBeLessThan(1e-6);
    expect(relativeMaxError(outcome.images.reconstruction.data, reference.rssWhitened)).toBeLessThan(1e-6);
    expect(outcome.metrics.nrmse).toBeLessThan(1e-12);
  });

  it('a partially sampled file is a 422 naming the missing lines; a radial header a 422 naming the trajectory', async () => {
    const partial = expectProblem(await post('partial.h5'), 422, 'file.data.head.idx.kspace_encode_step_1');
    expect(partial.errors[0].message).toMatch(/8 of 64 phase-encode lines/);
    const radial = await post('radial-header.h5');
    expect(radial.status).toBe(422);
    expect(JSON.stringify(radial.body)).toMatch(/trajectory/);
    await expectDocumented('POST', '/v1/raw', radial);
    expectProblem(await t.http().post('/v1/raw').attach('raw', fixture('partial.h5'), 'p.h5'), 400, 'file');
    const png = readFileSync(new URL('../fixtures/io/camera64.png', import.meta.url));
    const notHdf5 = await t.http().post('/v1/raw').attach('file', png, 'camera.png');
    expectProblem(notHdf5, 422, 'file');
    await expectDocumented('POST', '/v1/raw', notHdf5);
  });

  it('subject and study never reach the answer, the data folder or the logs', async () => {
    const bytes = fixture('subject.h5');
    expect(planted.every((word) => bytes.includes(word))).toBe(true);
    const res = await post('subject.h5');
    expect(res.status).toBe(201);
    const recon = await postJson(t, '/v1/reconstructions', rawRequest(res.body.id, 2));
    expect(recon.status).toBe(201);
    const answers = JSON.stringify([res.body, recon.body]);
    const files = readdirSync(t.dataDir).map((name) => readFileSync(join(t.dataDir, name)));
    const logs = t.logs.join('\n');
    expect(logs.length).toBeGreaterThan(0);
    for (const word of planted) {
      expect(answers).not.toContain(word);
      expect(files.some((file) => file.includes(word))).toBe(false);
      expect(logs).not.toContain(word);
    }
  });

  it('zero-filled at R = 2 over HTTP: scored against the RSS reference, images served', async () => {
    const id = (await post('shepp-logan-4coil.h5')).body.id as string;
    const res = await postJson(t, '/v1/reconstructions', rawRequest(id, 2));
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.acceleration.actual).toBeCloseTo(2, 10);
    expect(res.body.metrics.nrmse).toBeGreaterThan(0.05);
    expect(res.body.metrics.ssim).toBeLessThan(1);
    expect(res.body.info.combination).toBe('root-sum-of-squares');
    expect(res.body.notes.join(' ')).toMatch(/raw data, 4 coils, prewhitened/);
    const png = await t.http().get(res.body.images.reconstruction);
    expect(png.status).toBe(200);
    // The data's own noise only: the same request gives the same scores.
    const again = await postJson(t, '/v1/reconstructions', rawRequest(id, 2));
    expect(again.body.metrics).toEqual(res.body.metrics);
    // Added noise is seeded and makes the scores worse.
    const noisy = await postJson(t, '/v1/reconstructions', { ...rawRequest(id, 2), noise: { snr: 5 } });
    expect(noisy.status).toBe(201);
    expect(noisy.body.metrics.nrmse).toBeGreaterThan(res.body.metrics.nrmse);
  });

  it('a wrong matrix, a coil array or an unknown id is refused naming the field', async () => {
    const id = (await post('shepp-logan-4coil.h5')).body.id as string;
    const send = (body: object) => postJson(t, '/v1/reconstructions', body);
    expectProblem(await send({ ...rawRequest(id, 2), matrix: { nx: 32, ny: 32 } }), 422, 'matrix');
    expectProblem(
      await send({ ...rawRequest(id, 2), coils: { array: 'gaussian', count: 4, width: 0.5, ringRadius: 1 } }),
      422,
      'coils',
    );
    expectProblem(await send(rawRequest('no-such-raw', 2)), 404, 'source.rawId');
    // cs-tv on coil data needs maps, and raw data carry none: refused naming the method.
    expectProblem(await send({ ...rawRequest(id, 2), method: { name: 'cs-tv' } }), 422, 'method.name');
  });
});

describe('raw data follow uploads: deletion cascades, tenant isolation, plans', () => {
  const alpha = 'alpha-key-5d21e';
  const beta = 'beta-key-70c3a';
  const t = sharedTestApp({ apiKeys: [alpha, beta], tenantIsolation: true, retention: { intervalMs: 0 } });
  const post = (key: string) =>
    t.http().post('/v1/raw').set('x-api-key', key).attach('file', fixture('shepp-logan-4coil.h5'), 'a.h5');

  it('another key gets 404; deleting the data deletes the results and plans made from it', async () => {
    const id = (await post(alpha)).body.id as string;
    const url = `/v1/raw/${id}`;
    expectProblem(await t.http().get(url).set('x-api-key', beta), 404, 'id');
    expectProblem(await t.http().delete(url).set('x-api-key', beta), 404, 'id');
    const foreign = await t.http().post('/v1/reconstructions').set('x-api-key', beta).send(rawRequest(id, 2));
    expectProblem(foreign, 404, 'source.rawId');

    const recon = await t.http().post('/v1/reconstructions').set('x-api-key', alpha).send(rawRequest(id, 2));
    expect(recon.status).toBe(201);
    expect(t.app.services.store.inputsOf('result', recon.body.id)).toEqual([{ kind: 'raw', id }]);

    // Uniform R = 2, zero-filled, one seed, on the data's own matrix.
    const plan = { ...oneCellPlan, source: { rawId: id }, matrix: { nx: 64, ny: 64 } };
    const wrong = await t
      .http()
      .post('/v1/plans')
      .set('x-api-key', alpha)
      .send({ ...plan, matrix: { nx: 32, ny: 32 } });
    expectProblem(wrong, 422, 'matrix');
    expectProblem(await t.http().post('/v1/plans').set('x-api-key', beta).send(plan), 404, 'source.rawId');
    const submitted = await t.http().post('/v1/plans').set('x-api-key', alpha).send(plan);
    expect(submitted.status).toBe(202);
    const planId = submitted.body.id as string;
    let status = '';
    for (let i = 0; i < 200 && status !== 'done' && status !== 'failed'; i++) {
      await new Promise((resolve) => setTimeout(resolve, 50));
      status = (await t.http().get(`/v1/plans/${planId}`).set('x-api-key', alpha)).body.status;
    }
    expect(status).toBe('done');
    const table = (await t.http().get(`/v1/plans/${planId}`).set('x-api-key', alpha)).body.table;
    // The plan's one cell is the same acquisition as the single reconstruction above.
    const cell = table.rows.find((row: { reference: boolean }) => !row.reference);
    expect(cell.metrics.nrmse.mean).toBeCloseTo(recon.body.metrics.nrmse, 12);

    const samples = Buffer.from(Float32Array.from(t.app.services.store.getRawKspace(id)!.kspace.data).buffer);
    const needle = samples.subarray(4096, 4096 + 32);
    const inFolder = () =>
      readdirSync(t.dataDir).some((name) => readFileSync(join(t.dataDir, name)).includes(needle));
    expect(inFolder()).toBe(true);
    expect((await t.http().delete(url).set('x-api-key', alpha)).status).toBe(204);
    expect(t.app.services.store.getResult(recon.body.id)).toBeUndefined();
    expect(t.app.services.store.getPlan(planId)).toBeUndefined();
    expectProblem(await t.http().get(url).set('x-api-key', alpha), 404, 'id');
    expect(inFolder()).toBe(false);
  });
});
