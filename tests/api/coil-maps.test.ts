import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { NotFoundError } from '../../src/core/errors.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { parseOrThrow } from '../../src/core/zod-problems.ts';
import { DataLifecycle } from '../../src/jobs/lifecycle.ts';
import { planSchema } from '../../src/plan/index.ts';
import { checkPlanCoilMaps, coilMapRefs } from '../../src/services/coil-map-refs.ts';
import type { Caller } from '../../src/services/index.ts';
import { float32Base64 } from '../io/float32-base64.ts';
import { expectDocumented, expectProblem, oneCellPlan, sharedTestApp, type TestApp } from './helpers.ts';
import { byteRuns, foundInDataDir } from './stored-bytes.ts';

// Sources: the upload contract of POST /v1/coil-maps (docs/design.md §4.7): planes of
// ny×nx little-endian float32 in base64 (RFC 4648 §4, docs/references.md §10.8), values kept as sent; errors as RFC 9457
// problems naming the field; deletion, retention and tenant isolation as for image uploads
// (DEVELOPERS.md "Data lifecycle"). NIfTI files: tests/reference/generate_coil_map_niftis.py
// (Debian python3-nibabel; complex64 layout docs/references.md §10.2), expected maps laid out by
// numpy in the same script.

const everyone: Caller = { owner: null, scope: 'all' };
const parsedPlan = () => parseOrThrow(planSchema, oneCellPlan, '');
const niftiFixture = (name: string) =>
  readFileSync(new URL(`../fixtures/coil-maps/${name}`, import.meta.url));
const expectedNifti = JSON.parse(
  readFileSync(new URL('../reference/fixtures/coil-map-niftis.json', import.meta.url), 'utf8'),
) as { cases: Record<string, { nx: number; ny: number; coils: number; data: number[] }> };

/** Seeded float32 maps of an invented 8-coil array: planes to send and the interleaved values expected. */
function seededMaps(coils: number, nx: number, ny: number, seed: number) {
  const random = new SeededRandom(seed);
  const expected = new Float64Array(2 * coils * nx * ny);
  const planes: Array<{ re: string; im: string }> = [];
  for (let c = 0; c < coils; c++) {
    const re = new Float32Array(nx * ny);
    const im = new Float32Array(nx * ny);
    for (let p = 0; p < nx * ny; p++) {
      // Arbitrary float32 numbers (not dyadic): the round trip must keep every bit.
      re[p] = 2 * random.uniform() - 1;
      im[p] = 2 * random.uniform() - 1;
      expected[2 * (c * nx * ny + p)] = re[p];
      expected[2 * (c * nx * ny + p) + 1] = im[p];
    }
    planes.push({ re: float32Base64(re), im: float32Base64(im) });
  }
  return { body: { nx, ny, coils: planes }, expected };
}

async function postMaps(t: TestApp, body: object, key?: string) {
  const req = t.http().post('/v1/coil-maps');
  if (key) req.set('x-api-key', key);
  return req.send(body);
}

describe('POST /v1/coil-maps (JSON planes), GET and DELETE /v1/coil-maps/{id}', () => {
  const t = sharedTestApp({ limits: { maxMatrixSide: 256 } });

  it('8 coils of 24×32: 201 with Location; the loader gives every float32 value back bit for bit', async () => {
    const { body, expected } = seededMaps(8, 32, 24, 5);
    const res = await postMaps(t, body);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/coil-maps', res);
    expect(res.body).toMatchObject({ nx: 32, ny: 24, coils: 8, format: 'planes' });
    expect(res.headers.location).toBe(`/v1/coil-maps/${res.body.id}`);
    const got = await t.http().get(res.headers.location);
    expect(got.status).toBe(200);
    await expectDocumented('GET', res.headers.location, got);
    expect(got.body).toEqual(res.body);
    const maps = await t.app.services.coilMaps.loadCoilMaps(res.body.id, everyone);
    expect([maps.coils, maps.nx, maps.ny]).toEqual([8, 32, 24]);
    expect(Buffer.from(maps.data.buffer).equals(Buffer.from(expected.buffer))).toBe(true);
  });

  it('bad base64, a wrong length, NaN, a zero coil, mismatched nx: 422 naming the plane', async () => {
    const { body } = seededMaps(3, 8, 6, 9);
    const swap = (c: number, part: 're' | 'im', text: string) => ({
      ...body,
      coils: body.coils.map((coil, i) => (i === c ? { ...coil, [part]: text } : coil)),
    });
    const nan = new Float32Array(48).fill(0.5);
    nan[13] = Number.NaN;
    const cases: Array<[object, string, RegExp]> = [
      [swap(1, 're', `${body.coils[1].re.slice(0, -8)}%%%%%%%%`), 'coils[1].re', /base64/],
      [swap(2, 'im', float32Base64(new Float32Array(47).fill(1))), 'coils[2].im', /188 bytes/],
      [swap(0, 're', float32Base64(nan)), 'coils[0].re', /coil 0, row 1, column 5 is NaN/],
      [
        swap(2, 'im', float32Base64(new Float32Array(48).fill(Number.NEGATIVE_INFINITY))),
        'coils[2].im',
        /coil 2, row 0, column 0 is -Infinity/,
      ],
      [{ ...body, nx: 9 }, 'coils[0].re', /decodes to 192 bytes/],
    ];
    for (const [bad, field, message] of cases) {
      const res = await postMaps(t, bad);
      const problem = expectProblem(res, 422, field);
      expect(problem.errors[0].message).toMatch(message);
      await expectDocumented('POST', '/v1/coil-maps', res);
    }
  });

  it('an all-zero coil is refused naming the coil; 33 coils, no coils and nx beyond the limit are 422', async () => {
    const { body } = seededMaps(2, 4, 4, 3);
    const zero = float32Base64(new Float32Array(16));
    expectProblem(
      await postMaps(t, { ...body, coils: [body.coils[0], { re: zero, im: zero }] }),
      422,
      'coils[1]',
    );
    const many = { ...body, coils: Array.from({ length: 33 }, () => body.coils[0]) };
    const tooMany = expectProblem(await postMaps(t, many), 422, 'coils');
    expect(tooMany.errors[0].allowed).toBe('at most 32 item(s)');
    expectProblem(await postMaps(t, { ...body, coils: [] }), 422, 'coils');
    const wide = expectProblem(await postMaps(t, { ...body, nx: 257 }), 422, 'nx');
    expect(wide.type).toBe('/problems/limit-exceeded');
  });

  it('wrong shapes are 400 naming the field; text/plain is 415; unknown ids are 404', async () => {
    const { body } = seededMaps(1, 4, 4, 4);
    expectProblem(await postMaps(t, { ...body, coils: [{ re: body.coils[0].re }] }), 400, 'coils[0].im');
    expectProblem(await postMaps(t, { ...body, scale: 2 }), 400, 'scale');
    expectProblem(await postMaps(t, { ...body, nx: 4.5 }), 400, 'nx');
    const text = await t.http().post('/v1/coil-maps').set('content-type', 'text/plain').send('maps');
    expect(text.status).toBe(415);
    expectProblem(await t.http().get('/v1/coil-maps/nope'), 404, 'id');
    const del = await t.http().delete('/v1/coil-maps/nope');
    expectProblem(del, 404, 'id');
    await expectDocumented('DELETE', '/v1/coil-maps/nope', del);
    const unknown = await t.app.services.coilMaps.loadCoilMaps('nope', everyone).catch((e: unknown) => e);
    expect(unknown).toBeInstanceOf(NotFoundError);
    expect((unknown as NotFoundError).problems[0].field).toBe('coils.mapsId');
  });
});

describe('POST /v1/coil-maps (multipart NIfTI, coils along the last dimension)', () => {
  const t = sharedTestApp({ limits: { maxMatrixSide: 256 } });

  for (const name of ['complex64-4d.nii.gz', 'complex64-3d-nifti2.nii', 'float32-3d.nii']) {
    it(`${name}: 201; the loaded maps are the nibabel file's values (rows flipped, coil-major)`, async () => {
      const res = await t.http().post('/v1/coil-maps').attach('file', niftiFixture(name), name);
      expect(res.status).toBe(201);
      await expectDocumented('POST', '/v1/coil-maps', res);
      const want = expectedNifti.cases[name];
      expect(res.body).toMatchObject({ nx: want.nx, ny: want.ny, coils: want.coils, format: 'nifti' });
      const maps = await t.app.services.coilMaps.loadCoilMaps(res.body.id, everyone);
      expect(Array.from(maps.data)).toEqual(want.data);
    });
  }

  it('the header description never reaches the store or the answer', async () => {
    const res = await t.http().post('/v1/coil-maps').attach('file', niftiFixture('described.nii'), 'x.nii');
    expect(res.status).toBe(201);
    expect(JSON.stringify(res.body)).not.toMatch(/Invented/);
    for (const name of readdirSync(t.dataDir)) {
      expect(readFileSync(join(t.dataDir, name)).includes('Invented Person')).toBe(false);
    }
  });

  it('two slices, 33 coils, scaling: 422 naming the header field; a PNG is 415; no file part is 400', async () => {
    const post = (name: string, bytes: Buffer) => t.http().post('/v1/coil-maps').attach('file', bytes, name);
    expectProblem(await post('s.nii', niftiFixture('slices-4d.nii')), 422, 'file.dim[3]');
    const many = await post('c.nii', niftiFixture('coils-33.nii'));
    expect(expectProblem(many, 422, 'file.dim[3]').type).toBe('/problems/limit-exceeded');
    expectProblem(await post('k.nii', niftiFixture('scaled.nii')), 422, 'file.scl_slope');
    const png = readFileSync(new URL('../fixtures/io/camera64.png', import.meta.url));
    const notNifti = await post('camera.png', png);
    expectProblem(notNifti, 415, 'file');
    await expectDocumented('POST', '/v1/coil-maps', notNifti);
    const wrongPart = await t
      .http()
      .post('/v1/coil-maps')
      .attach('maps', niftiFixture('float32-3d.nii'), 'a.nii');
    expectProblem(wrongPart, 400, 'file');
  });
});

/** Runs of 4 stored float32 values (16 bytes) to look for in the data files. */
function needles(values: Float64Array): Buffer[] {
  return byteRuns(Buffer.from(Float32Array.from(values).buffer), 16);
}

describe('coil maps follow uploads: deletion cascades, retention, tenant isolation', () => {
  const alpha = 'alpha-key-31c7e';
  const beta = 'beta-key-9a04f';
  const t = sharedTestApp({ apiKeys: [alpha, beta], tenantIsolation: true, retention: { intervalMs: 0 } });
  // The owner digest of src/http/tenant.ts: SHA-256 of the key, in hex.
  const callerOf = (key: string): Caller => {
    const owner = createHash('sha256').update(key).digest('hex');
    return { owner, scope: { owner } };
  };

  it('another key gets 404 for GET, DELETE and the loader; the owner keeps them', async () => {
    const { body } = seededMaps(2, 8, 8, 21);
    const res = await postMaps(t, body, alpha);
    expect(res.status).toBe(201);
    const url = `/v1/coil-maps/${res.body.id}`;
    expectProblem(await t.http().get(url).set('x-api-key', beta), 404, 'id');
    expectProblem(await t.http().delete(url).set('x-api-key', beta), 404, 'id');
    await expect(t.app.services.coilMaps.loadCoilMaps(res.body.id, callerOf(beta))).rejects.toThrow(
      NotFoundError,
    );
    expect((await t.http().get(url).set('x-api-key', alpha)).status).toBe(200);
    expect((await t.app.services.coilMaps.loadCoilMaps(res.body.id, callerOf(alpha))).coils).toBe(2);
  });

  it('a reconstruction and a plan naming the maps are deleted with them; the values leave the data folder', async () => {
    const alice = callerOf(alpha);
    const { body, expected } = seededMaps(4, 16, 16, 33);
    const id = (await postMaps(t, body, alpha)).body.id as string;
    const patterns = needles(expected);
    expect(foundInDataDir(t.dataDir, patterns)).toBeGreaterThan(0.9 * patterns.length);

    const request = {
      source: { phantom: 'shepp-logan' },
      matrix: { nx: 16, ny: 16 },
      sampling: { pattern: 'cartesian-uniform' as const, acceleration: 2 },
      method: { name: 'zero-filled' as const },
      coils: { mapsId: id },
    };
    // Named maps are read at the service (for the caller) and linked to the stored result.
    const recon = await t.app.services.reconstructions.create(request, alice);
    expect('id' in recon).toBe(true);
    const reconId = (recon as { id: string }).id;
    expect(t.app.services.store.inputsOf('result', reconId)).toEqual([{ kind: 'coilMaps', id }]);
    await expect(t.app.services.reconstructions.create(request, callerOf(beta))).rejects.toThrow(
      /coils\.mapsId: no uploaded coil maps/,
    );

    // The plan as the route hands it over (parsed), plus the coil-array sweep a plan may name.
    const planBody = { ...parsedPlan(), coilArrays: [{ array: 'uniform' as const }, { mapsId: id }] };
    const plan = await t.app.services.planning.submit(planBody, alice);
    expect('id' in plan).toBe(true);
    const planId = (plan as { id: string }).id;
    expect(t.app.services.store.inputsOf('plan', planId)).toEqual([{ kind: 'coilMaps', id }]);

    const del = await t.http().delete(`/v1/coil-maps/${id}`).set('x-api-key', alpha);
    expect(del.status).toBe(204);
    expect(t.app.services.store.getResult(reconId)).toBeUndefined();
    expect(t.app.services.store.getPlan(planId)).toBeUndefined();
    expectProblem(await t.http().get(`/v1/coil-maps/${id}`).set('x-api-key', alpha), 404, 'id');
    expect(foundInDataDir(t.dataDir, patterns)).toBe(0);
  });

  it('a plan naming unknown or foreign maps is refused at submit, naming coilArrays[i].mapsId', async () => {
    const own = (await postMaps(t, seededMaps(1, 4, 4, 41).body, beta)).body.id as string;
    const plan = { coilArrays: [{ array: 'uniform' }, { mapsId: own }, { mapsId: 'nope' }] };
    expect(coilMapRefs(plan)).toEqual([
      { id: own, field: 'coilArrays[1].mapsId' },
      { id: 'nope', field: 'coilArrays[2].mapsId' },
    ]);
    const store = t.app.services.store;
    const refused = (() => {
      try {
        checkPlanCoilMaps(store, plan, callerOf(beta));
      } catch (error) {
        return error;
      }
    })();
    expect((refused as NotFoundError).problems).toEqual([
      { field: 'coilArrays[2].mapsId', message: 'no uploaded coil maps nope' },
    ]);
    const foreign = { coilArrays: [{ mapsId: own }] };
    expect(() => checkPlanCoilMaps(store, foreign, callerOf(alpha))).toThrow(NotFoundError);
    expect(checkPlanCoilMaps(store, foreign, callerOf(beta))).toEqual([{ kind: 'coilMaps', id: own }]);
  });

  it('retention: maps age out with their kind; a queued plan that reads them keeps them', async () => {
    const store = t.app.services.store;
    const policy = (maxAgeHours: number) =>
      new DataLifecycle(store, t.app.services.plans, { maxAgeHours, maxBytes: 0, intervalMs: 0 }, undefined);
    const id = (await postMaps(t, seededMaps(2, 8, 8, 51).body, alpha)).body.id as string;
    const entry = store.inventory().find((e) => e.id === id);
    // Two coils of 8×8 complex float32: 1024 bytes of values plus the metadata JSON.
    expect(entry).toMatchObject({ kind: 'coilMaps', pinned: false });
    expect(entry!.bytes).toBeGreaterThan(1024);
    const pinned = (await postMaps(t, seededMaps(1, 8, 8, 52).body, alpha)).body.id as string;
    store.createPlan('queued-plan', parsedPlan(), 2, { inputs: [{ kind: 'coilMaps', id: pinned }] });
    const later = new Date(Date.now() + 2 * 3600_000);
    const report = policy(1).runRetention(later);
    expect(report.removed).toContainEqual({ kind: 'coilMaps', id });
    expect(report.removed).not.toContainEqual({ kind: 'coilMaps', id: pinned });
    expect(store.getCoilMapsInfo(pinned)).toBeDefined();
  });
});
