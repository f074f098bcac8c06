import { parse as parseCsv } from 'csv-parse/sync';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { csvColumns } from '../../src/plan/index.ts';
import { slowPlanBody, smallPlanBody } from '../plan/small-plan.ts';
import {
  binary,
  expectDocumented,
  expectProblem,
  oneCellPlan,
  oneReconstruction,
  postJson,
  sharedTestApp,
  type TestApp,
} from './helpers.ts';

// Source for the checks below: the v1 HTTP contract (docs/design.md §4: GET /v1/plans and GET
// /v1/images answer { items, next }, newest first, cursor paging), RFC 9457 problem bodies naming the
// query field (docs/references.md §10.4), and every answer validated against openapi.yaml by
// expectDocumented (OpenAPI 3.1, docs/references.md §10.6).

type ListPage = { items: Array<Record<string, unknown> & { id: string }>; next: string | null };

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

function as(t: TestApp, key?: string) {
  const withKey = <R extends { set: (name: string, value: string) => R }>(req: R) =>
    key ? req.set('x-api-key', key) : req;
  return {
    get: (url: string) => withKey(t.http().get(url)),
    post: (url: string, body: object) => withKey(t.http().post(url)).send(body),
    delete: (url: string) => withKey(t.http().delete(url)),
    upload: (png: Buffer) => withKey(t.http().post('/v1/images')).attach('file', png, 'grey.png'),
  };
}

async function planUntil(t: TestApp, id: string, statuses: string[], key?: string) {
  for (let i = 0; i < 2400; i++) {
    const res = await as(t, key).get(`/v1/plans/${id}`);
    if (statuses.includes(res.body.status)) return res;
    await sleep(25);
  }
  throw new Error(`plan ${id} did not reach ${statuses.join('/')}`);
}

/** Submits a plan and waits until it is done; returns its id. */
async function donePlan(t: TestApp, body: object = oneCellPlan, key?: string): Promise<string> {
  const res = await as(t, key).post('/v1/plans', body);
  expect(res.status).toBe(202);
  await planUntil(t, res.body.id, ['done'], key);
  return res.body.id;
}

/** Every page of a list, following `next`; also checks each answer against the contract. */
async function allPages(t: TestApp, path: string, limit: number, key?: string): Promise<ListPage[]> {
  const pages: ListPage[] = [];
  let cursor: string | null = null;
  do {
    const url = `${path}${path.includes('?') ? '&' : '?'}limit=${limit}${cursor ? `&cursor=${cursor}` : ''}`;
    const res = await as(t, key).get(url);
    expect(res.status).toBe(200);
    await expectDocumented('GET', url, res);
    pages.push(res.body);
    cursor = res.body.next;
  } while (cursor !== null && pages.length < 50);
  return pages;
}

const ids = (pages: ListPage[]) => pages.flatMap((p) => p.items.map((i) => i.id));

/** A small grey PNG whose pixels depend on `seed` (no patient data). */
async function greyPng(seed: number, width = 24, height = 16): Promise<Buffer> {
  const pixels = Buffer.alloc(width * height);
  for (let i = 0; i < pixels.length; i++) pixels[i] = (i * 13 + seed * 31) % 256;
  return sharp(pixels, { raw: { width, height, channels: 1 } })
    .toColourspace('b-w')
    .png()
    .toBuffer();
}

describe('GET /v1/plans and GET /v1/images: paged lists', () => {
  const t = sharedTestApp({ workers: 2 });
  const created: string[] = [];

  it('lists plans newest first in pages of `limit`, with labels and progress; next is null on the last page', async () => {
    for (let seeds = 1; seeds <= 5; seeds++) created.push(await donePlan(t, { ...oneCellPlan, seeds }));
    const pages = await allPages(t, '/v1/plans', 2);
    expect(pages.map((p) => p.items.length)).toEqual([2, 2, 1]);
    expect(pages.map((p) => p.next === null)).toEqual([false, false, true]);
    expect(ids(pages)).toEqual([...created].reverse());
    const first = pages[0].items[0];
    // The newest plan has 5 seeds: (1 reference + 1 row) × 5 = 10 cells, all done.
    expect(first).toMatchObject({
      id: created[4],
      status: 'done',
      progress: { done: 10, total: 10 },
      label: 'shepp-logan 32×32 · cartesian-uniform × R 2 × zero-filled · 5 seeds',
      links: { self: `/v1/plans/${created[4]}` },
    });
    expect(Date.parse(String(first.createdAt))).not.toBeNaN();
    // Without limit: the default page of 20 holds all five.
    const whole = await t.http().get('/v1/plans');
    expect(whole.body.items.map((i: { id: string }) => i.id)).toEqual([...created].reverse());
    expect(whole.body.next).toBeNull();
  });

  it('a cursor stays valid while plans are added: later pages neither repeat nor skip an item', async () => {
    const page1 = (await t.http().get('/v1/plans?limit=2')).body as ListPage;
    const added = await donePlan(t);
    const page2 = (await t.http().get(`/v1/plans?limit=2&cursor=${page1.next}`)).body as ListPage;
    expect(page2.items.map((i) => i.id)).toEqual([created[2], created[1]]);
    // The new plan leads a fresh first page.
    const fresh = (await t.http().get('/v1/plans?limit=1')).body as ListPage;
    expect(fresh.items[0].id).toBe(added);
    created.push(added);
  });

  it('filters by status: a cancelled plan is listed under cancelled only', async () => {
    const submitted = await postJson(t, '/v1/plans', slowPlanBody());
    expect((await t.http().delete(`/v1/plans/${submitted.body.id}`)).status).toBe(200);
    const cancelled = await allPages(t, '/v1/plans?status=cancelled', 5);
    expect(ids(cancelled)).toEqual([submitted.body.id]);
    expect(cancelled[0].items[0].status).toBe('cancelled');
    const done = await allPages(t, '/v1/plans?status=done', 4);
    expect(ids(done)).toEqual([...created].reverse());
    expect((await t.http().get('/v1/plans?status=failed')).body).toEqual({ items: [], next: null });
  });

  it('bad query values are 422 problems naming the query field', async () => {
    const cases: Array<[string, string]> = [
      ['limit=0', 'limit'],
      ['limit=101', 'limit'],
      ['limit=abc', 'limit'],
      ['limit=1.5', 'limit'],
      ['limit=-3', 'limit'],
      ['cursor=not*base64', 'cursor'],
      [`cursor=${Buffer.from('0').toString('base64url')}`, 'cursor'],
      [`cursor=${Buffer.from('seq 4').toString('base64url')}`, 'cursor'],
      ['status=finished', 'status'],
    ];
    for (const [query, field] of cases) {
      const res = await t.http().get(`/v1/plans?${query}`);
      const problem = expectProblem(res, 422, field);
      expect(problem.errors, query).toHaveLength(1);
      await expectDocumented('GET', `/v1/plans?${query}`, res);
    }
    expectProblem(await t.http().get('/v1/images?limit=500'), 422, 'limit');
    expectProblem(await t.http().get('/v1/images?cursor=%3D%3D'), 422, 'cursor');
    // The bounds themselves are accepted.
    expect((await t.http().get('/v1/plans?limit=1')).status).toBe(200);
    expect((await t.http().get('/v1/plans?limit=100')).status).toBe(200);
  });

  it('lists uploads newest first, metadata only (what GET /v1/images/{id} answers), paged', async () => {
    const uploaded: string[] = [];
    for (let seed = 1; seed <= 3; seed++) {
      const res = await t
        .http()
        .post('/v1/images')
        .attach('file', await greyPng(seed), 'grey.png');
      expect(res.status).toBe(201);
      uploaded.push(res.body.id);
    }
    const pages = await allPages(t, '/v1/images', 2);
    expect(ids(pages)).toEqual([...uploaded].reverse());
    for (const item of pages.flatMap((p) => p.items)) {
      const single = await t.http().get(`/v1/images/${item.id}`);
      expect(item).toEqual(single.body);
      expect(Object.keys(item).sort()).toEqual(
        ['createdAt', 'details', 'format', 'id', 'notes', 'nx', 'ny', 'stats', 'url'].sort(),
      );
    }
    expect(pages[0].items[0]).toMatchObject({ nx: 24, ny: 16, format: 'png' });
  });
});

describe('each plan row keeps its seed-1 reconstruction', () => {
  const t = sharedTestApp({ workers: 2 });
  const twoSeeds = smallPlanBody({
    patterns: [{ pattern: 'cartesian-random', acs: 4 }],
    accelerations: [2, 4],
    methods: [{ name: 'zero-filled' }, { name: 'cs-tv', iterations: 12 }],
    seeds: 2,
  });

  it('every row links a stored reconstruction equal to POST /v1/reconstructions of its seed-1 cell', async () => {
    const id = await donePlan(t, twoSeeds);
    const plan = await t.http().get(`/v1/plans/${id}`);
    await expectDocumented('GET', `/v1/plans/${id}`, plan);
    const rows = plan.body.table.rows as Array<{
      key: string;
      reference: boolean;
      requestedR: number;
      methodIndex: number | null;
      resultId: string;
      images: Record<string, string>;
    }>;
    expect(rows).toHaveLength(5);
    expect(new Set(rows.map((r) => r.resultId)).size).toBe(5);
    for (const row of rows) {
      expect(row.images.reconstruction).toBe(`/v1/results/${row.resultId}/reconstruction.png`);
      expect(row.images.errorMap).toBe(`/v1/results/${row.resultId}/error-map.png`);
      const png = await t.http().get(row.images.errorMap);
      expect(png.status).toBe(200);
      expect(png.headers['content-type']).toBe('image/png');
      const stored = await t.http().get(`/v1/reconstructions/${row.resultId}`);
      expect(stored.status).toBe(200);
      if (row.reference) continue;
      // The same cell run on its own: the plan's sampling at the row's R and its method, seed 1.
      const single = await postJson(t, '/v1/reconstructions', {
        source: twoSeeds.source,
        matrix: twoSeeds.matrix,
        sampling: { ...twoSeeds.patterns[0], acceleration: row.requestedR },
        method: twoSeeds.methods[row.methodIndex!],
        seed: 1,
      });
      expect(single.status).toBe(201);
      expect(stored.body.metrics, row.key).toEqual(single.body.metrics);
      expect(stored.body.zeroFilledMetrics, row.key).toEqual(single.body.zeroFilledMetrics);
      expect(stored.body.acceleration).toEqual(single.body.acceleration);
      // The acquired data kept with the row (docs/design.md §4.11) are the single run's, byte for byte.
      const nii = async (resultId: string) =>
        (await t.http().get(`/v1/results/${resultId}/acquisition.nii`).buffer(true).parse(binary))
          .body as Buffer;
      expect((await nii(row.resultId)).equals(await nii(single.body.id)), row.key).toBe(true);
    }
  });

  it('the CSV keeps its documented columns; purging the plan deletes its row results', async () => {
    const id = await donePlan(t, { ...twoSeeds, seeds: 1 });
    const csv = await t.http().get(`/v1/plans/${id}/table.csv`);
    const [header] = parseCsv(csv.text) as string[][];
    expect(header).toEqual(csvColumns.map((c) => c.name));
    const rows = (await t.http().get(`/v1/plans/${id}`)).body.table.rows as Array<{ resultId: string }>;
    // Stored with the plan: retention sees one entry, the plan, holding the row results' bytes.
    const entries = t.app.services.store.inventory().filter((e) => rows.some((r) => r.resultId === e.id));
    expect(entries).toEqual([]);
    expect((await t.http().delete(`/v1/plans/${id}?purge=true`)).status).toBe(204);
    for (const row of rows) {
      expect((await t.http().get(`/v1/reconstructions/${row.resultId}`)).status).toBe(404);
      expect((await t.http().get(`/v1/results/${row.resultId}/reconstruction.png`)).status).toBe(404);
    }
  });

  it('a zero-filled reconstruction reports its own scores as the zero-filled ones', async () => {
    const res = await postJson(t, '/v1/reconstructions', oneReconstruction);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.zeroFilledMetrics).toEqual(res.body.metrics);
  });
});

describe('lists under tenant isolation', () => {
  const alpha = 'alpha-list-key-0c7';
  const beta = 'beta-list-key-93d';
  const t = sharedTestApp({ apiKeys: [alpha, beta], tenantIsolation: true, workers: 1 });

  it('each key lists only its own plans and uploads, and cannot open the other’s row results', async () => {
    const alphaPlan = await donePlan(t, oneCellPlan, alpha);
    const betaPlan = await donePlan(t, oneCellPlan, beta);
    const alphaImage = (await as(t, alpha).upload(await greyPng(7))).body.id;
    expect(ids(await allPages(t, '/v1/plans', 1, alpha))).toEqual([alphaPlan]);
    expect(ids(await allPages(t, '/v1/plans', 1, beta))).toEqual([betaPlan]);
    expect(ids(await allPages(t, '/v1/images', 5, alpha))).toEqual([alphaImage]);
    expect((await as(t, beta).get('/v1/images')).body).toEqual({ items: [], next: null });
    // A cursor from one key's page does not reach the other's plans.
    const alphaFirst = (await as(t, alpha).get('/v1/plans?limit=1')).body as ListPage;
    expect(alphaFirst.next).toBeNull();
    const cursor = Buffer.from('999999').toString('base64url');
    expect(ids([(await as(t, beta).get(`/v1/plans?cursor=${cursor}`)).body])).toEqual([betaPlan]);
    const alphaRow = (await as(t, alpha).get(`/v1/plans/${alphaPlan}`)).body.table.rows[1];
    expect((await as(t, alpha).get(alphaRow.images.reconstruction)).status).toBe(200);
    expect((await as(t, beta).get(alphaRow.images.reconstruction)).status).toBe(404);
    expect((await as(t, beta).get(`/v1/reconstructions/${alphaRow.resultId}`)).status).toBe(404);
    expect((await t.http().get('/v1/plans')).status).toBe(401);
  });
});
