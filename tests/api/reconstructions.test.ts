import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../src/io/decode-image.ts';
import { runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { debianFile } from '../io/debian-files.ts';
import {
  binary,
  expectDocumented,
  expectProblem,
  expectStoredCopy,
  postJson,
  postProblem,
  sharedTestApp,
  testApp,
  uploadFile,
} from './helpers.ts';

// Source for the checks below: the v1 HTTP contract of docs/design.md §4 (routes, status codes, 202 jobs,
// persistence under DATA_DIR), problem bodies per RFC 9457 (docs/references.md §10.4) and every documented
// response validated against openapi.yaml (OpenAPI 3.1, docs/references.md §10.6) by expectDocumented.

const request = {
  source: { phantom: 'shepp-logan-modified' },
  matrix: { nx: 32, ny: 32 },
  sampling: { pattern: 'cartesian-random', acceleration: 2, acs: 6, seed: 3 },
  method: { name: 'cs-tv', iterations: 20 },
};

describe('POST /v1/reconstructions (runs on the worker pool)', () => {
  const t = sharedTestApp({ limits: { maxIterations: 100, maxMatrixSide: 128 } });

  it('201 with metrics, R, timing and six image URLs; the numbers are the engine’s for the same request', async () => {
    const res = await postJson(t, '/v1/reconstructions', request);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.headers.location).toBe(`/v1/reconstructions/${res.body.id}`);
    const direct = await runReconstruction(request as never, undefined);
    expect(res.body.metrics).toEqual(direct.metrics);
    expect(res.body.acceleration).toEqual(direct.acceleration);
    expect(Object.keys(res.body.images).sort()).toEqual([
      'errorMap',
      'mask',
      'psf',
      'reconstruction',
      'reference',
      'zeroFilled',
    ]);
    for (const url of Object.values(res.body.images) as string[]) {
      const png = await t.http().get(url).buffer(true).parse(binary);
      expect(png.status, url).toBe(200);
      const meta = await sharp(png.body).metadata();
      expect([meta.format, meta.width, meta.height]).toEqual(['png', 32, 32]);
    }
    await expectStoredCopy(t, res);
  });

  it('fully sampled zero-filled equals the reference: NRMSE 0, SSIM 1, PSNR not finite (null) — by definition (docs/design.md §3.6)', async () => {
    const res = await postJson(t, '/v1/reconstructions', {
      ...request,
      sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
      method: { name: 'zero-filled' },
    });
    expect(res.status).toBe(201);
    expect(res.body.metrics.nrmse).toBeCloseTo(0, 12);
    expect(res.body.metrics.ssim).toBeCloseTo(1, 12);
    expect(res.body.metrics.psnr).toBeNull();
    expect(res.body.acceleration.actual).toBe(1);
  });

  it('an uploaded DICOM (MR_small.dcm, 64×64) as source', async () => {
    const upload = await uploadFile(t, debianFile('pydicom', 'MR_small.dcm'), 'm.dcm');
    const res = await postJson(t, '/v1/reconstructions', {
      ...request,
      source: { imageId: upload.body.id },
      matrix: { nx: 64, ny: 64 },
    });
    expect(res.status).toBe(201);
    // The service's numbers are the engine's on the decoded pixels (the same request run directly).
    const pixels = (await decodeImage(debianFile('pydicom', 'MR_small.dcm'))).image;
    const direct = await runReconstruction(
      { ...request, source: { imageId: upload.body.id }, matrix: { nx: 64, ny: 64 } } as never,
      undefined,
      { loadImage: async () => pixels },
    );
    expect(res.body.metrics).toEqual(direct.metrics);
    expect(res.body.metrics.nrmse).toBeGreaterThan(0.001); // undersampled R = 2: not the reference
    expect(res.body.notes.join(' ')).toMatch(/crime/i);
  });

  it('errors: unknown imageId 404, iterations above the limit 422 (limit), unknown method 422, wrong type 400', async () => {
    const refused = (body: object, status: number, field?: string) =>
      postProblem(t, '/v1/reconstructions', body, status, field);
    await refused({ ...request, source: { imageId: 'missing' } }, 404, 'source.imageId');
    const limit = await refused(
      { ...request, method: { name: 'cs-tv', iterations: 500 } },
      422,
      'method.iterations',
    );
    expect(limit.type).toBe('/problems/limit-exceeded');
    await refused({ ...request, method: { name: 'magic' } }, 422, 'method.name');
    await refused({ ...request, matrix: { nx: '32', ny: 32 } }, 400, 'matrix.nx');
    expectProblem(await t.http().get('/v1/reconstructions/nope'), 404, 'id');
  });
});

describe('result images survive a restart (SQLite under DATA_DIR)', () => {
  it('GET /v1/results/{id}/reconstruction.png from a new app on the same DATA_DIR returns the same bytes', async () => {
    const first = await testApp();
    const res = await postJson(first, '/v1/reconstructions', { ...request, method: { name: 'zero-filled' } });
    const before = await first.http().get(res.body.images.reconstruction).buffer(true).parse(binary);
    await first.close();
    const second = await testApp({ dataDir: first.dataDir });
    try {
      const after = await second.http().get(res.body.images.reconstruction).buffer(true).parse(binary);
      expect(after.status).toBe(200);
      expect(Buffer.compare(after.body, before.body)).toBe(0);
      expect((await second.http().get(`/v1/reconstructions/${res.body.id}`)).body).toEqual(res.body);
    } finally {
      await second.close();
    }
  });
});
