import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../src/app.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { DataLifecycle } from '../../src/jobs/lifecycle.ts';
import { Store } from '../../src/jobs/store.ts';
import { slowPlanBody } from '../plan/small-plan.ts';
import {
  binary,
  expectDocumented,
  expectProblem,
  postJson,
  sharedTestApp,
  type TestApp,
  testApp,
} from './helpers.ts';
import { byteRuns, foundInDataDir } from './stored-bytes.ts';

// Source for the checks below: the project's data-lifecycle rules (DEVELOPERS.md "Data lifecycle"):
// what a user deletes is gone, from the API and from every file under DATA_DIR; SQLite's documented
// behaviour of PRAGMA secure_delete (deleted content overwritten with zeros) and
// wal_checkpoint(TRUNCATE) (WAL copied back and truncated to zero bytes), sqlite.org/pragma.html.

const side = 48;

/** An 8-bit grey PNG of seeded random values (a pixel pattern found nowhere else). */
async function distinctivePng(seed: number): Promise<{ png: Buffer; values: Uint8Array }> {
  const random = new SeededRandom(seed);
  const values = new Uint8Array(side * side);
  for (let i = 0; i < values.length; i++) values[i] = 1 + random.integer(254);
  // b-w: a one-channel grey PNG (sharp would otherwise write sRGB from one raw channel).
  const png = await sharp(Buffer.from(values), { raw: { width: side, height: side, channels: 1 } })
    .toColourspace('b-w')
    .png()
    .toBuffer();
  return { png, values };
}

/** Runs of 4 consecutive stored pixels (32 bytes of float64) to look for in the data files. */
function needles(pixels: Float64Array): Buffer[] {
  return byteRuns(Buffer.from(pixels.buffer, pixels.byteOffset, pixels.byteLength), 32);
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function upload(t: TestApp, png: Buffer, key?: string) {
  const req = t.http().post('/v1/images');
  if (key) req.set('x-api-key', key);
  const res = await req.attach('file', png, 'pattern.png');
  expect(res.status).toBe(201);
  return res.body.id as string;
}

function reconstructionFrom(source: object) {
  return {
    source,
    matrix: { nx: side, ny: side },
    sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
    method: { name: 'zero-filled' },
  };
}

/** Slow cells on the upload, so a test can act while the plan runs. */
function slowPlanFrom(imageId: string) {
  return slowPlanBody({
    source: { imageId },
    matrix: { nx: side, ny: side },
    methods: [{ name: 'cs-tv', iterations: 400 }],
  });
}

async function waitForStatus(t: TestApp, id: string, wanted: string[], key?: string) {
  for (let i = 0; i < 2400; i++) {
    const req = t.http().get(`/v1/plans/${id}`);
    if (key) req.set('x-api-key', key);
    const res = await req;
    if (wanted.includes(res.body.status)) return res;
    await sleep(25);
  }
  throw new Error(`plan ${id} did not reach ${wanted.join('/')}`);
}

describe('deleting an upload deletes everything made from it, and its pixels leave the data folder', () => {
  const t = sharedTestApp({ workers: 2, limits: { maxIterations: 500 } });

  it('results and plans from the upload go (a running plan is cancelled first); pixels are scrubbed', async () => {
    const { png, values } = await distinctivePng(20261202);
    const imageId = await upload(t, png);
    const stored = t.app.services.store.getImagePixels(imageId)!;
    // The store keeps the decoded values as float64: a grey 8-bit PNG's values as stored (DEVELOPERS.md).
    expect(Array.from(stored.data)).toEqual(Array.from(values));
    const patterns = needles(stored.data);

    const recon = await postJson(t, '/v1/reconstructions', reconstructionFrom({ imageId }));
    expect(recon.status).toBe(201);
    const referenceUrl = `/v1/results/${recon.body.id}/reference.png`;
    expect((await t.http().get(referenceUrl)).status).toBe(200);
    // A reconstruction from a phantom must survive: the cascade follows links, not everything.
    const unrelated = await postJson(
      t,
      '/v1/reconstructions',
      reconstructionFrom({ phantom: 'shepp-logan-modified' }),
    );
    expect(unrelated.status).toBe(201);
    const plan = await postJson(t, '/v1/plans', slowPlanFrom(imageId));
    expect(plan.status).toBe(202);
    await waitForStatus(t, plan.body.id, ['running']);

    // The check can fail: before deletion the pixel runs are in the files (WAL or database).
    const before = foundInDataDir(t.dataDir, patterns);
    expect(before).toBeGreaterThan(0.9 * patterns.length);

    const del = await t.http().delete(`/v1/images/${imageId}`);
    expect(del.status).toBe(204);
    await expectDocumented('DELETE', `/v1/images/${imageId}`, del);

    expectProblem(await t.http().get(referenceUrl), 404, 'id');
    expectProblem(await t.http().get(`/v1/reconstructions/${recon.body.id}`), 404, 'id');
    expectProblem(await t.http().get(`/v1/plans/${plan.body.id}`), 404, 'id');
    expectProblem(await t.http().get(`/v1/images/${imageId}`), 404, 'id');
    expect(t.app.services.plans.progress(plan.body.id)).toBeUndefined();
    expect((await t.http().get(`/v1/reconstructions/${unrelated.body.id}`)).status).toBe(200);

    expect(foundInDataDir(t.dataDir, patterns)).toBe(0);
    // The queue goes on: the worker lanes of the cancelled plan were released.
    const next = await postJson(t, '/v1/plans', {
      ...slowPlanFrom('x'),
      source: { phantom: 'shepp-logan' },
      accelerations: [2],
      seeds: 1,
    });
    expect((await waitForStatus(t, next.body.id, ['done', 'failed'])).body.status).toBe('done');
  });

  it('the rows of a finished plan (cells included) leave the database when its upload is deleted', async () => {
    const { png } = await distinctivePng(7);
    const imageId = await upload(t, png);
    const plan = await postJson(t, '/v1/plans', {
      ...slowPlanFrom(imageId),
      accelerations: [2],
      methods: [{ name: 'zero-filled' }],
      seeds: 1,
    });
    expect((await waitForStatus(t, plan.body.id, ['done'])).status).toBe(200);
    expect(t.app.services.store.planCells(plan.body.id).size).toBe(2);
    expect((await t.http().delete(`/v1/images/${imageId}`)).status).toBe(204);
    expect(t.app.services.store.planCells(plan.body.id).size).toBe(0);
    expect(t.app.services.store.getPlan(plan.body.id)).toBeUndefined();
  });
});

describe('DELETE /v1/results/{id} and DELETE /v1/plans/{id}?purge=true', () => {
  const t = sharedTestApp({ workers: 2, limits: { maxIterations: 500 } });

  it('a reconstruction and a mask: 204, then their images and the result are 404; again 404', async () => {
    const recon = await postJson(
      t,
      '/v1/reconstructions',
      reconstructionFrom({ phantom: 'shepp-logan-modified' }),
    );
    const mask = await postJson(t, '/v1/masks', {
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
    });
    expect(mask.status).toBe(200);
    for (const [id, image] of [
      [recon.body.id, 'reconstruction'],
      [mask.body.id, 'psf'],
    ]) {
      const png = await t.http().get(`/v1/results/${id}/${image}.png`).buffer(true).parse(binary);
      expect(png.status).toBe(200);
      const del = await t.http().delete(`/v1/results/${id}`);
      expect(del.status).toBe(204);
      await expectDocumented('DELETE', `/v1/results/${id}`, del);
      expectProblem(await t.http().get(`/v1/results/${id}/${image}.png`), 404, 'id');
      const again = await t.http().delete(`/v1/results/${id}`);
      expectProblem(again, 404, 'id');
      await expectDocumented('DELETE', `/v1/results/${id}`, again);
    }
    expectProblem(await t.http().get(`/v1/reconstructions/${recon.body.id}`), 404, 'id');
  });

  it('purge removes a running plan (cancelled first) and a finished one; plain DELETE still cancels', async () => {
    const { png } = await distinctivePng(3);
    const imageId = await upload(t, png);
    const running = await postJson(t, '/v1/plans', slowPlanFrom(imageId));
    await waitForStatus(t, running.body.id, ['running']);
    const purge = await t.http().delete(`/v1/plans/${running.body.id}?purge=true`);
    expect(purge.status).toBe(204);
    await expectDocumented('DELETE', `/v1/plans/${running.body.id}?purge=true`, purge);
    expectProblem(await t.http().get(`/v1/plans/${running.body.id}`), 404, 'id');
    expect(t.app.services.plans.progress(running.body.id)).toBeUndefined();
    expect(t.app.services.store.planCells(running.body.id).size).toBe(0);
    // The upload stays: purging a plan removes what it made, not what it read.
    expect((await t.http().get(`/v1/images/${imageId}`)).status).toBe(200);

    const cancelled = await postJson(t, '/v1/plans', slowPlanFrom(imageId));
    await waitForStatus(t, cancelled.body.id, ['running']);
    const cancel = await t.http().delete(`/v1/plans/${cancelled.body.id}?purge=false`);
    expect(cancel.status).toBe(200);
    expect(cancel.body.status).toBe('cancelled');
    expect((await t.http().get(`/v1/plans/${cancelled.body.id}`)).body.status).toBe('cancelled');
    expect((await t.http().delete(`/v1/plans/${cancelled.body.id}?purge=true`)).status).toBe(204);
    expectProblem(await t.http().delete(`/v1/plans/${cancelled.body.id}?purge=true`), 404, 'id');
    expectProblem(await t.http().delete(`/v1/plans/${cancelled.body.id}?purge=yes`), 422, 'purge');
  });
});

describe('retention: oldest first, never what a queued or running plan needs', () => {
  let t: TestApp;
  beforeAll(async () => {
    // intervalMs 0: no timer; the checks call runRetention themselves with an explicit clock.
    t = await testApp({ workers: 2, limits: { maxIterations: 500 }, retention: { intervalMs: 0 } });
  });
  afterAll(async () => t.close());

  const policyOf = (maxAgeHours: number, maxBytes: number) =>
    new DataLifecycle(
      t.app.services.store,
      t.app.services.plans,
      { maxAgeHours, maxBytes, intervalMs: 0 },
      undefined,
    );

  it('age limit: nothing goes at the present time; everything 2 h later under a 1 h limit', async () => {
    const imageId = await upload(t, (await distinctivePng(11)).png);
    const recon = await postJson(t, '/v1/reconstructions', reconstructionFrom({ imageId }));
    const phantomRecon = await postJson(
      t,
      '/v1/reconstructions',
      reconstructionFrom({ phantom: 'shepp-logan' }),
    );
    const lifecycle = policyOf(1, 0);
    expect(lifecycle.runRetention(new Date()).removed).toEqual([]);
    const later = lifecycle.runRetention(new Date(Date.now() + 2 * 3600_000));
    expect(later.removed).toEqual(
      expect.arrayContaining([
        { kind: 'image', id: imageId },
        { kind: 'result', id: recon.body.id },
        { kind: 'result', id: phantomRecon.body.id },
      ]),
    );
    expect(later.bytesAfter).toBe(0);
    expect(t.app.services.store.inventory()).toEqual([]);
    expectProblem(await t.http().get(`/v1/images/${imageId}`), 404, 'id');
  });

  it('size limit: the oldest uploads go until the total fits', async () => {
    const ids: string[] = [];
    for (const seed of [21, 22, 23]) {
      ids.push(await upload(t, (await distinctivePng(seed)).png));
      await sleep(5); // distinct creation times (milliseconds)
    }
    const entries = t.app.services.store.inventory();
    expect(entries.map((e) => e.id)).toEqual(ids);
    // Each upload keeps 48·48·8 bytes of pixels plus its metadata JSON.
    for (const entry of entries) expect(entry.bytes).toBeGreaterThan(side * side * 8);
    const limit = entries[1].bytes + entries[2].bytes;
    const report = policyOf(0, limit).runRetention();
    expect(report.removed).toEqual([{ kind: 'image', id: ids[0] }]);
    expect(report.bytesAfter).toBe(limit);
    expect(t.app.services.store.inventory().map((e) => e.id)).toEqual(ids.slice(1));
    policyOf(0, 1).runRetention();
    expect(t.app.services.store.inventory()).toEqual([]);
  });

  it('a running plan and its upload are spared; once cancelled they age out like the rest', async () => {
    const imageId = await upload(t, (await distinctivePng(31)).png);
    const plan = await postJson(t, '/v1/plans', slowPlanFrom(imageId));
    await waitForStatus(t, plan.body.id, ['running']);
    const old = await postJson(t, '/v1/reconstructions', reconstructionFrom({ imageId }));
    const future = new Date(Date.now() + 1000 * 3600_000);
    const report = policyOf(1, 1).runRetention(future);
    expect(report.removed).toEqual([{ kind: 'result', id: old.body.id }]);
    expect((await t.http().get(`/v1/plans/${plan.body.id}`)).body.status).toBe('running');
    expect((await t.http().get(`/v1/images/${imageId}`)).status).toBe(200);
    expect((await t.http().delete(`/v1/plans/${plan.body.id}`)).status).toBe(200);
    const after = policyOf(1, 1).runRetention(future);
    expect(after.removed).toEqual(
      expect.arrayContaining([
        { kind: 'image', id: imageId },
        { kind: 'plan', id: plan.body.id },
      ]),
    );
    expect(t.app.services.store.inventory()).toEqual([]);
  });

  it('the periodic cleanup runs on its own (tiny size limit, 50 ms interval)', async () => {
    const quick = await testApp({ retention: { maxAgeHours: 0, maxBytes: 1, intervalMs: 50 } });
    try {
      const imageId = await upload(quick, (await distinctivePng(41)).png);
      let status = 200;
      for (let i = 0; i < 400 && status === 200; i++) {
        await sleep(25);
        status = (await quick.http().get(`/v1/images/${imageId}`)).status;
      }
      expect(status).toBe(404);
    } finally {
      await quick.close();
    }
  });
});

describe('tenant isolation: each API key sees and deletes only what it created', () => {
  const alpha = 'alpha-key-5d1e9';
  const beta = 'beta-key-82c0a';
  const t = sharedTestApp({ apiKeys: [alpha, beta], tenantIsolation: true });

  it('another key gets 404 for uploads, results, reconstructions and plans; the owner is a digest', async () => {
    const imageId = await upload(t, (await distinctivePng(51)).png, alpha);
    const as = (key: string) => ({
      get: (url: string) => t.http().get(url).set('x-api-key', key),
      delete: (url: string) => t.http().delete(url).set('x-api-key', key),
      post: (url: string, body: object) => t.http().post(url).set('x-api-key', key).send(body),
    });
    const recon = await as(alpha).post('/v1/reconstructions', reconstructionFrom({ imageId }));
    expect(recon.status).toBe(201);
    const plan = await as(alpha).post('/v1/plans', {
      ...slowPlanFrom(imageId),
      accelerations: [2],
      methods: [{ name: 'zero-filled' }],
      seeds: 1,
    });
    expect(plan.status).toBe(202);
    await waitForStatus(t, plan.body.id, ['done'], alpha);

    const urls = [
      `/v1/images/${imageId}`,
      `/v1/reconstructions/${recon.body.id}`,
      `/v1/results/${recon.body.id}/reference.png`,
      `/v1/plans/${plan.body.id}`,
      `/v1/plans/${plan.body.id}/table.csv`,
    ];
    for (const url of urls) {
      expect((await as(alpha).get(url)).status, url).toBe(200);
      expectProblem(await as(beta).get(url), 404, 'id');
    }
    expectProblem(
      await as(beta).post('/v1/reconstructions', reconstructionFrom({ imageId })),
      404,
      'source.imageId',
    );
    expectProblem(await as(beta).delete(`/v1/images/${imageId}`), 404, 'id');
    expectProblem(await as(beta).delete(`/v1/results/${recon.body.id}`), 404, 'id');
    expectProblem(await as(beta).delete(`/v1/plans/${plan.body.id}?purge=true`), 404, 'id');
    for (const url of urls) expect((await as(alpha).get(url)).status, url).toBe(200);

    // A mask is a pure function of the request, yet each tenant gets its own copy.
    const maskBody = {
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 3 },
    };
    const maskA = await as(alpha).post('/v1/masks', maskBody);
    const maskB = await as(beta).post('/v1/masks', maskBody);
    expect(maskA.body.id).not.toBe(maskB.body.id);
    expect((await as(alpha).delete(`/v1/results/${maskA.body.id}`)).status).toBe(204);
    expect((await as(beta).get(`/v1/results/${maskB.body.id}/mask.png`)).status).toBe(200);

    // The owner column holds SHA-256(key) in hex; the key itself is in no file.
    const db = new Database(join(t.dataDir, 'service.sqlite'), { readonly: true });
    try {
      const owner = (db.prepare('SELECT owner FROM images WHERE id = ?').get(imageId) as { owner: string })
        .owner;
      expect(owner).toBe(createHash('sha256').update(alpha).digest('hex'));
    } finally {
      db.close();
    }
    for (const name of readdirSync(t.dataDir)) {
      const bytes = readFileSync(join(t.dataDir, name));
      for (const key of [alpha, beta]) expect(bytes.includes(Buffer.from(key))).toBe(false);
    }

    expect((await as(alpha).delete(`/v1/images/${imageId}`)).status).toBe(204);
    for (const url of urls) expectProblem(await as(alpha).get(url), 404, 'id');
  });

  it('isolation without keys is refused at start', async () => {
    await expect(
      buildApp({ dataDir: mkdtempSync(join(tmpdir(), 'kspace-tenant-')), tenantIsolation: true, workers: 1 }),
    ).rejects.toThrow(/API keys/);
  });
});

describe('a data folder from the previous version keeps working', () => {
  it('owner columns are added; a plan stored before links existed is deleted with its upload', () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'kspace-migrate-'));
    // The schema of the previous release, as it was written by src/jobs/store.ts then.
    const old = new Database(join(dataDir, 'service.sqlite'));
    old.pragma('journal_mode = WAL');
    old.exec(`
      CREATE TABLE images (id TEXT PRIMARY KEY, created_at TEXT NOT NULL, meta TEXT NOT NULL,
        nx INTEGER NOT NULL, ny INTEGER NOT NULL, pixels BLOB NOT NULL);
      CREATE TABLE results (id TEXT PRIMARY KEY, created_at TEXT NOT NULL, kind TEXT NOT NULL, body TEXT NOT NULL);
      CREATE TABLE result_images (result_id TEXT NOT NULL, name TEXT NOT NULL, png BLOB NOT NULL,
        PRIMARY KEY (result_id, name));
      CREATE TABLE plans (seq INTEGER PRIMARY KEY AUTOINCREMENT, id TEXT NOT NULL UNIQUE, created_at TEXT NOT NULL,
        updated_at TEXT NOT NULL, status TEXT NOT NULL, body TEXT NOT NULL, total INTEGER NOT NULL,
        done INTEGER NOT NULL, table_json TEXT, error TEXT);
      CREATE TABLE plan_cells (plan_id TEXT NOT NULL, idx INTEGER NOT NULL, result TEXT NOT NULL,
        PRIMARY KEY (plan_id, idx));`);
    const pixels = Buffer.from(new Float64Array([1, 2, 3, 4]).buffer);
    old
      .prepare('INSERT INTO images VALUES (?, ?, ?, 2, 2, ?)')
      .run('img-1', '2026-01-01T00:00:00.000Z', '{}', pixels);
    const insertDonePlan = old.prepare(
      `INSERT INTO plans (id, created_at, updated_at, status, body, total, done) VALUES (?, ?, ?, 'done', ?, 1, 1)`,
    );
    for (const [id, source] of [
      ['plan-1', { imageId: 'img-1' }],
      ['plan-2', { phantom: 'shepp-logan' }],
    ] as const) {
      insertDonePlan.run(
        id,
        '2026-01-01T00:00:01.000Z',
        '2026-01-01T00:00:02.000Z',
        JSON.stringify({ source }),
      );
    }
    old.prepare('INSERT INTO plan_cells VALUES (?, 0, ?)').run('plan-1', '{"ok":true}');
    old.close();

    const store = new Store(dataDir);
    try {
      expect(Array.from(store.getImagePixels('img-1')!.data)).toEqual([1, 2, 3, 4]);
      expect(store.getImageInfo('img-1', { owner: 'someone' })).toBeUndefined();
      expect(store.holdersOf({ kind: 'image', id: 'img-1' })).toEqual([{ kind: 'plan', id: 'plan-1' }]);
      expect(store.deleteCascade('image', 'img-1')).toEqual([
        { kind: 'plan', id: 'plan-1' },
        { kind: 'image', id: 'img-1' },
      ]);
      expect(store.getPlan('plan-1')).toBeUndefined();
      expect(store.planCells('plan-1').size).toBe(0);
      expect(store.getPlan('plan-2')?.status).toBe('done');
    } finally {
      store.close();
    }
    // Opening again is a no-op migration.
    new Store(dataDir).close();
  });

  it('full-precision images stored before volumes keep reading as planes; volumes keep their nz', () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'kspace-migrate-arrays-'));
    const old = new Database(join(dataDir, 'service.sqlite'));
    // result_arrays as src/jobs/store.ts wrote it before volume results (no nz column).
    old.exec(`
      CREATE TABLE results (id TEXT PRIMARY KEY, created_at TEXT NOT NULL, kind TEXT NOT NULL, body TEXT NOT NULL);
      CREATE TABLE result_arrays (result_id TEXT NOT NULL, name TEXT NOT NULL, nx INTEGER NOT NULL,
        ny INTEGER NOT NULL, white REAL NOT NULL, data BLOB NOT NULL, PRIMARY KEY (result_id, name));`);
    old
      .prepare(`INSERT INTO results VALUES ('r-old', '2026-01-01T00:00:00.000Z', 'reconstruction', '{}')`)
      .run();
    const plane = new Float32Array([1, 2, 3, 4, 5, 6]);
    old
      .prepare(`INSERT INTO result_arrays VALUES ('r-old', 'reference', 3, 2, 6, ?)`)
      .run(Buffer.from(plane.buffer));
    old.close();
    const store = new Store(dataDir);
    try {
      const read = store.getResultArrays('r-old').get('reference');
      expect(read).toEqual({ nx: 3, ny: 2, white: 6, data: plane });
      const volume = { nx: 2, ny: 2, nz: 3, white: 11, data: Float32Array.from({ length: 12 }, (_, i) => i) };
      expect(store.putResult('r-new', 'reconstruction', {}, {}, {}, { reference: volume })).toBe(true);
      expect(store.getResultArrays('r-new').get('reference')).toEqual(volume);
    } finally {
      store.close();
    }
  });

  it('a result whose upload was deleted while it was computed is refused, not stored', () => {
    const store = new Store(mkdtempSync(join(tmpdir(), 'kspace-race-')));
    try {
      store.putImage('img', { nx: 1, ny: 1, data: new Float64Array([5]) }, {});
      const inputs = [{ kind: 'image' as const, id: 'img' }];
      expect(store.putResult('r1', 'reconstruction', {}, { reference: Buffer.from([1]) }, { inputs })).toBe(
        true,
      );
      expect(store.deleteCascade('image', 'img')).toEqual([
        { kind: 'result', id: 'r1' },
        { kind: 'image', id: 'img' },
      ]);
      expect(store.putResult('r2', 'reconstruction', {}, { reference: Buffer.from([1]) }, { inputs })).toBe(
        false,
      );
      expect(store.getResult('r2')).toBeUndefined();
      expect(store.getResultImage('r2', 'reference')).toBeUndefined();
      expect(store.scrub()).toBe(true);
    } finally {
      store.close();
    }
  });
});
