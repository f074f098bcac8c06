import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { getPhantom } from '../../src/phantoms/index.ts';
import { binary, expectDocumented, expectProblem, postJson, postProblem, sharedTestApp } from './helpers.ts';

// Source for the checks below: the v1 HTTP contract of docs/design.md §4 (routes, status codes, 202 jobs,
// persistence under DATA_DIR), problem bodies per RFC 9457 (docs/references.md §10.4) and every documented
// response validated against openapi.yaml (OpenAPI 3.1, docs/references.md §10.6) by expectDocumented.

describe('phantoms, masks and result images', () => {
  const t = sharedTestApp({ limits: { maxMatrixSide: 128 } });

  it('GET /v1/phantoms lists the four analytic phantoms', async () => {
    const res = await t.http().get('/v1/phantoms');
    expect(res.status).toBe(200);
    await expectDocumented('GET', '/v1/phantoms', res);
    expect(res.body.phantoms.map((p: { name: string }) => p.name)).toEqual([
      'shepp-logan',
      'shepp-logan-modified',
      'resolution-contrast',
      'contrast-detail',
    ]);
  });

  it('GET /v1/phantoms/{name} as JSON equals the engine raster; as PNG is a 16-bit grey ny×nx image', async () => {
    const json = await t
      .http()
      .get('/v1/phantoms/shepp-logan-modified?nx=32&ny=24')
      .set('accept', 'application/json');
    expect(json.status).toBe(200);
    await expectDocumented('GET', '/v1/phantoms/shepp-logan-modified', json);
    const raster = getPhantom('shepp-logan-modified').rasterize(32, 24);
    expect(json.body.data).toEqual(Array.from(raster.data));
    const png = await t
      .http()
      .get('/v1/phantoms/shepp-logan-modified?nx=32&ny=24')
      .buffer(true)
      .parse(binary);
    expect(png.status).toBe(200);
    expect(png.headers['content-type']).toBe('image/png');
    // PNG signature (ISO/IEC 15948 §5.2) and header read back by sharp.
    expect([...png.body.subarray(0, 8)]).toEqual([137, 80, 78, 71, 13, 10, 26, 10]);
    const meta = await sharp(png.body).metadata();
    expect([meta.width, meta.height, meta.depth, meta.channels]).toEqual([32, 24, 'ushort', 1]);
  });

  it('phantom errors: unknown name 404, too large 422 limit, bad query 422', async () => {
    expectProblem(await t.http().get('/v1/phantoms/brain'), 404, 'name');
    const big = await t.http().get('/v1/phantoms/shepp-logan?nx=512&ny=512');
    expect(expectProblem(big, 422, 'matrix.nx').type).toBe('/problems/limit-exceeded');
    expectProblem(await t.http().get('/v1/phantoms/shepp-logan?nx=1'), 422, 'nx');
    expectProblem(await t.http().get('/v1/phantoms/shepp-logan?nx=abc'), 400, 'nx');
  });

  it('POST /v1/phantoms/{name}/kspace returns the exact transform at the given points', async () => {
    const points: Array<[number, number]> = [
      [0, 0],
      [0.5, -0.25],
      [3.2, 1.7],
      [0.5, 0],
    ];
    const res = await postJson(t, '/v1/phantoms/shepp-logan/kspace', { points });
    expect(res.status).toBe(200);
    await expectDocumented('POST', '/v1/phantoms/shepp-logan/kspace', res);
    const expected = getPhantom('shepp-logan').kspaceAt(
      points.map((p) => p[0]),
      points.map((p) => p[1]),
    );
    expect(res.body.values.flat()).toEqual(Array.from(expected));
    // The transform of a real object at k = 0 is real (common practice: F(0) = ∫ f).
    expect(res.body.values[0][1]).toBe(0);
    // docs/references.md §1.2 [C], 1974 intensities: K(0) = 2.2017566919, K(0.5, 0) = 1.0825061340 − 0.0011681427i.
    expect(Math.abs(res.body.values[0][0] - 2.2017566919)).toBeLessThan(1e-9);
    expect(
      Math.hypot(res.body.values[3][0] - 1.082506134, res.body.values[3][1] + 0.0011681427),
    ).toBeLessThan(1e-9);
    await postProblem(t, '/v1/phantoms/shepp-logan/kspace', { points: [['a', 1]] }, 400, 'points[0][0]');
    await postProblem(t, '/v1/phantoms/shepp-logan/kspace', { points: [] }, 422, 'points');
  });

  it('POST /v1/masks: R = total / acquired (docs/design.md §3.4), PSF summary, PNGs under /v1/results/{id}', async () => {
    const res = await postJson(t, '/v1/masks', {
      matrix: { nx: 64, ny: 64 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 4, acs: 8 },
    });
    expect(res.status).toBe(200);
    await expectDocumented('POST', '/v1/masks', res);
    const { acceleration, acquired, total, fraction } = res.body;
    expect(acquired.unit).toBe('lines');
    expect(total).toBe(64);
    expect(acceleration.requested).toBe(4);
    expect(acceleration.actual).toBeCloseTo(total / acquired.count, 12);
    expect(fraction).toBeCloseTo(acquired.count / 64, 12);
    // cartesian-uniform rule (DEVELOPERS.md): rows 32 ± 4j (16 rows) plus the ACS rows 28–35 → 22 lines.
    const rowSet = new Set<number>();
    for (let r = 0; r < 64; r += 4) rowSet.add(r);
    for (let r = 28; r < 36; r++) rowSet.add(r);
    expect(acquired.count).toBe(rowSet.size);
    // PSF of a line mask by the direct DFT (docs/references.md §3.6): |Σ_r e^(i2π r·y/64)| / count along the
    // phase-encode axis (zero off it); side lobes are the pixels beyond the √2 main lobe (DEVELOPERS.md).
    let sidelobe = 0;
    for (let y = 2; y <= 62; y++) {
      let re = 0;
      let im = 0;
      for (const r of rowSet) {
        re += Math.cos((2 * Math.PI * r * y) / 64);
        im += Math.sin((2 * Math.PI * r * y) / 64);
      }
      sidelobe = Math.max(sidelobe, Math.hypot(re, im) / rowSet.size);
    }
    expect(res.body.psf.peakSidelobe).toBeCloseTo(sidelobe, 10);
    for (const url of [res.body.images.mask, res.body.images.psf]) {
      const png = await t.http().get(url).buffer(true).parse(binary);
      expect(png.status).toBe(200);
      await expectDocumented('GET', url, png);
      const meta = await sharp(png.body).metadata();
      expect([meta.width, meta.height]).toEqual([64, 64]);
    }
    // The mask PNG has one white row per acquired line: count rows with any 255.
    const mask = await t.http().get(res.body.images.mask).buffer(true).parse(binary);
    const { data, info } = await sharp(mask.body).raw().toBuffer({ resolveWithObject: true });
    let rows = 0;
    for (let row = 0; row < 64; row++) {
      let any = false;
      for (let col = 0; col < 64; col++) any ||= data[(row * 64 + col) * info.channels] === 255;
      if (any) rows++;
    }
    expect(rows).toBe(acquired.count);
  });

  it('POST /v1/masks: the same request gives the same bytes, a different seed another mask (docs/design.md §3.7)', async () => {
    const request = (seed: number, keyOrder: 'a' | 'b') =>
      postJson(
        t,
        '/v1/masks',
        keyOrder === 'a'
          ? {
              matrix: { nx: 64, ny: 64 },
              sampling: { pattern: 'poisson-disc', acceleration: 3, acs: 8, seed },
            }
          : {
              sampling: { seed, acs: 8, acceleration: 3, pattern: 'poisson-disc' },
              matrix: { ny: 64, nx: 64 },
            },
      );
    const first = await request(5, 'a');
    const again = await request(5, 'b');
    const other = await request(6, 'a');
    expect(first.status).toBe(200);
    expect(again.text).toBe(first.text);
    expect(other.body.id).not.toBe(first.body.id);
    const [maskA, maskB] = await Promise.all(
      [first, other].map((r) => t.http().get(r.body.images.mask).buffer(true).parse(binary)),
    );
    expect(Buffer.compare(maskA.body, maskB.body)).not.toBe(0);
  });

  it('POST /v1/masks with Accept: image/png returns the mask itself', async () => {
    const res = await t
      .http()
      .post('/v1/masks')
      .set('accept', 'image/png')
      .send({
        matrix: { nx: 48, ny: 40 },
        sampling: { pattern: 'radial', acceleration: 2, angles: 'golden' },
      })
      .buffer(true)
      .parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/png');
    const meta = await sharp(res.body).metadata();
    expect([meta.width, meta.height]).toEqual([48, 40]);
  });

  it('mask errors: R too high 422 naming sampling.acceleration; unknown result 404; unknown image name 404', async () => {
    const res = await postJson(t, '/v1/masks', {
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 64 },
    });
    expectProblem(res, 422, 'sampling.acceleration');
    await expectDocumented('POST', '/v1/masks', res);
    expectProblem(await t.http().get('/v1/results/nope/mask.png'), 404, 'id');
    const ok = await postJson(t, '/v1/masks', {
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
    });
    expectProblem(await t.http().get(`/v1/results/${ok.body.id}/reconstruction.png`), 404, 'image');
    expectProblem(await t.http().get(`/v1/results/${ok.body.id}/secrets.png`), 404, 'image');
  });

  it('custom mask (base64 PNG, decoded on a worker): fraction = sampled points / (nx·ny), requested R null', async () => {
    const samples = new Uint8Array(32 * 32);
    for (let row = 0; row < 32; row += 4) samples.fill(255, row * 32, row * 32 + 32); // 8 full lines
    const png = await sharp(samples, { raw: { width: 32, height: 32, channels: 1 } })
      .png()
      .toBuffer();
    const res = await postJson(t, '/v1/masks', {
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'custom', maskPng: png.toString('base64') },
    });
    expect(res.status).toBe(200);
    expect(res.body.fraction).toBe(0.25); // 8·32 / 32² (INTERFACES.md: fraction definition)
    expect(res.body.acceleration.requested).toBeNull();
    // A 32×32 picture for a 64×32 matrix is a value out of range: 422 naming the field (sampling/custom.ts).
    await postProblem(
      t,
      '/v1/masks',
      { matrix: { nx: 64, ny: 32 }, sampling: { pattern: 'custom', maskPng: png.toString('base64') } },
      422,
      'sampling.maskPng',
    );
  });
});
