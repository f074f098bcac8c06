import { parse as parseCsv } from 'csv-parse/sync';
import { createParser, type EventSourceMessage } from 'eventsource-parser';
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../src/io/decode-image.ts';
import { runPlan } from '../../src/plan/run-plan.ts';
import { debianFile } from '../io/debian-files.ts';
import { slowPlanBody, smallPlanBody } from '../plan/small-plan.ts';
import {
  expectDocumented,
  expectProblem,
  postJson,
  postProblem,
  sharedTestApp,
  type TestApp,
  testApp,
  uploadFile,
} from './helpers.ts';

// Source for the checks below: the v1 HTTP contract of docs/design.md §4 (routes, status codes, 202 jobs,
// persistence under DATA_DIR), problem bodies per RFC 9457 (docs/references.md §10.4) and every documented
// response validated against openapi.yaml (OpenAPI 3.1, docs/references.md §10.6) by expectDocumented.

/** A small sweep: 32² phantom, 1 pattern × 2 R × 2 methods × 2 seeds + reference = 10 cells. */
const smallPlan = smallPlanBody({
  patterns: [{ pattern: 'cartesian-random', acs: 4 }],
  accelerations: [2, 3],
  methods: [{ name: 'zero-filled' }, { name: 'cs-tv', iterations: 15 }],
});

/** Slower cells so a test can act while the plan runs (1 pattern × 3 R × 3 seeds + reference = 12 cells). */
const slowPlan = slowPlanBody();

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function waitFor(
  t: TestApp,
  id: string,
  until: (body: { status: string; progress: { done: number } }) => boolean,
) {
  for (let i = 0; i < 2400; i++) {
    const res = await t.http().get(`/v1/plans/${id}`);
    if (until(res.body)) return res;
    await sleep(25);
  }
  throw new Error(`plan ${id} did not reach the state in time`);
}

const finished = (b: { status: string }) => ['done', 'failed', 'cancelled'].includes(b.status);

/**
 * Drops what differs between runs: reconstruction wall time, and the stored seed-1 result each row
 * links to (a new id per run; the in-process runPlan stores none).
 */
function withoutTiming(table: { rows: Array<Record<string, unknown>> }) {
  return {
    ...table,
    rows: table.rows.map(({ reconMs: _ignored, resultId: _id, images: _images, ...row }) => row),
  };
}

describe('plans as jobs', () => {
  const t = sharedTestApp({ workers: 2, limits: { maxPlanCells: 200, maxIterations: 500 } });

  it('POST answers 202 at once with Location; polling reaches done with the table and recommendation', async () => {
    const res = await postJson(t, '/v1/plans', smallPlan);
    expect(res.status).toBe(202);
    await expectDocumented('POST', '/v1/plans', res);
    expect(res.headers.location).toBe(`/v1/plans/${res.body.id}`);
    expect(['queued', 'running']).toContain(res.body.status);
    expect(res.body.progress.total).toBe(10); // (1 + 1·2·2) × 2
    const done = await waitFor(t, res.body.id, finished);
    expect(done.body.status).toBe('done');
    await expectDocumented('GET', res.headers.location, done);
    expect(done.body.progress).toMatchObject({ done: 10, total: 10 });
    expect(done.body.table.rows).toHaveLength(5); // reference + 2 R × 2 methods
    expect(done.body.table.rows[0].requestedR).toBe(1);
    expect(typeof done.body.recommendation.statement).toBe('string');
  });

  it('GET /health keeps answering while a plan runs (cells run in worker threads)', async () => {
    const res = await postJson(t, '/v1/plans', slowPlan);
    await waitFor(t, res.body.id, (b) => b.status === 'running');
    let answered = 0;
    while ((await t.http().get(`/v1/plans/${res.body.id}`)).body.status === 'running' && answered < 20) {
      const health = await t.http().get('/health');
      expect(health.status).toBe(200);
      expect(health.body.status).toBe('ok');
      answered++;
    }
    expect(answered).toBeGreaterThan(0);
    await t.http().delete(`/v1/plans/${res.body.id}`);
  });

  it('table.csv is RFC 4180: header row, CRLF records, one record per table row, parsed back by csv-parse', async () => {
    const res = await postJson(t, '/v1/plans', smallPlan);
    const done = await waitFor(t, res.body.id, finished);
    const csv = await t.http().get(`/v1/plans/${res.body.id}/table.csv`);
    expect(csv.status).toBe(200);
    await expectDocumented('GET', `/v1/plans/${res.body.id}/table.csv`, csv);
    expect(csv.headers['content-type']).toMatch(/^text\/csv; charset=utf-8; header=present/);
    expect(csv.text).toMatch(/\r\n/);
    expect(csv.text.replace(/\r\n/g, '')).not.toMatch(/\n/);
    const records = parseCsv(csv.text, { columns: true }) as Array<Record<string, string>>;
    expect(records).toHaveLength(done.body.table.rows.length);
    // Bad requests never touch a stored result: cancel a finished plan (409), resubmit garbage (400).
    expectProblem(await t.http().delete(`/v1/plans/${res.body.id}`), 409, 'id');
    await postProblem(t, '/v1/plans', { ...smallPlan, matrix: 'big' }, 400, 'matrix');
    const again = await t.http().get(`/v1/plans/${res.body.id}`);
    expect(again.body.table).toEqual(done.body.table);
    expect((await t.http().get(`/v1/plans/${res.body.id}/table.csv`)).text).toBe(csv.text);
  });

  it('events: text/event-stream read with eventsource-parser (WHATWG SSE, docs/references.md §10.7): progress then done', async () => {
    await t.app.listen({ port: 0, host: '127.0.0.1' });
    const address = t.app.server.address();
    const port = typeof address === 'object' && address ? address.port : 0;
    const res = await postJson(t, '/v1/plans', smallPlan);
    const stream = await fetch(`http://127.0.0.1:${port}/v1/plans/${res.body.id}/events`);
    expect(stream.status).toBe(200);
    expect(stream.headers.get('content-type')).toMatch(/^text\/event-stream/);
    const events: EventSourceMessage[] = [];
    let retry: number | null = null;
    const parser = createParser({
      onEvent: (event) => events.push(event),
      onRetry: (ms) => {
        retry = ms;
      },
    });
    const decoder = new TextDecoder();
    for await (const chunk of stream.body as unknown as AsyncIterable<Uint8Array>)
      parser.feed(decoder.decode(chunk, { stream: true }));
    expect(retry).toBe(2000);
    const last = events.at(-1)!;
    expect(last.event).toBe('done');
    expect(JSON.parse(last.data).status).toBe('done');
    const progress = events.filter((e) => e.event === 'progress').map((e) => JSON.parse(e.data));
    expect(progress.length).toBeGreaterThan(0);
    const ids = events.map((e) => Number(e.id));
    for (let i = 1; i < ids.length; i++) expect(ids[i]).toBeGreaterThanOrEqual(ids[i - 1]);
    expect(ids.at(-1)).toBe(10);
    for (const p of progress) expect(p.total).toBe(10);
  });

  it('DELETE cancels a running plan; afterwards DELETE and table.csv answer 409, unknown ids 404', async () => {
    const res = await postJson(t, '/v1/plans', slowPlan);
    await waitFor(t, res.body.id, (b) => b.status === 'running');
    const del = await t.http().delete(`/v1/plans/${res.body.id}`);
    expect(del.status).toBe(200);
    await expectDocumented('DELETE', `/v1/plans/${res.body.id}`, del);
    expect(del.body.status).toBe('cancelled');
    expect((await t.http().get(`/v1/plans/${res.body.id}`)).body.status).toBe('cancelled');
    expectProblem(await t.http().delete(`/v1/plans/${res.body.id}`), 409, 'id');
    expectProblem(await t.http().get(`/v1/plans/${res.body.id}/table.csv`), 409, 'id');
    for (const url of ['/v1/plans/nope', '/v1/plans/nope/table.csv', '/v1/plans/nope/events']) {
      expectProblem(await t.http().get(url), 404, 'id');
    }
    expectProblem(await t.http().delete('/v1/plans/nope'), 404, 'id');
    // The service keeps working after a cancel (the worker thread was replaced).
    const next = await postJson(t, '/v1/plans', smallPlan);
    expect((await waitFor(t, next.body.id, finished)).body.status).toBe('done');
  });

  it('an uploaded DICOM as the plan source (pixels sent to the workers with each cell)', async () => {
    const upload = await uploadFile(t, debianFile('pydicom', 'MR_small.dcm'), 'm.dcm');
    const plan = {
      ...smallPlan,
      source: { imageId: upload.body.id },
      matrix: { nx: 64, ny: 64 },
      accelerations: [2],
      methods: [{ name: 'zero-filled' }],
      seeds: 1,
    };
    const res = await postJson(t, '/v1/plans', plan);
    expect(res.status).toBe(202);
    const done = await waitFor(t, res.body.id, finished);
    expect(done.body.status).toBe('done');
    expect(done.body.table.rows).toHaveLength(2);
    // The worker cells score what the engine scores on the decoded pixels, run in this process.
    const pixels = (await decodeImage(debianFile('pydicom', 'MR_small.dcm'))).image;
    const direct = await runPlan(plan, { ctx: { loadImage: async () => pixels } });
    expect(withoutTiming(done.body.table)).toEqual(withoutTiming(JSON.parse(JSON.stringify(direct))));
    expect(done.body.table.rows[1].metrics.nrmse.mean).toBeGreaterThan(0.001); // R = 2: not the reference
  });

  it('bad plans: wrong types 400, out of range 422, too many cells 422 (limit), unknown image 404', async () => {
    const refused = (body: object, status: number, field?: string) =>
      postProblem(t, '/v1/plans', body, status, field);
    await refused({ ...smallPlan, seeds: 'three' }, 400, 'seeds');
    await refused({ ...smallPlan, accelerations: [0.5] }, 422, 'accelerations[0]');
    const many = await refused({ ...smallPlan, seeds: 100 }, 422);
    expect(many.type).toBe('/problems/limit-exceeded');
    await refused({ ...smallPlan, source: { imageId: 'missing' } }, 404, 'source.imageId');
    await refused({ ...smallPlan, patterns: [{ pattern: 'cartesian-uniform' }], accelerations: [40] }, 422);
  });
});

describe('bounded queue', () => {
  it('answers 429 problem+json with an integer Retry-After when full (RFC 6585 §4, RFC 9110 10.2.3)', async () => {
    const t = await testApp({ workers: 1, maxQueuedPlans: 1, limits: { maxIterations: 500 } });
    try {
      const first = await postJson(t, '/v1/plans', slowPlan);
      expect(first.status).toBe(202);
      const second = await postJson(t, '/v1/plans', smallPlan);
      expectProblem(second, 429);
      await expectDocumented('POST', '/v1/plans', second);
      expect(second.headers['retry-after']).toMatch(/^[1-9]\d*$/);
      await t.http().delete(`/v1/plans/${first.body.id}`);
      expect((await postJson(t, '/v1/plans', smallPlan)).status).toBe(202);
    } finally {
      await t.close();
    }
  });
});

describe('persistence: a restart resumes queued/running plans from their last finished cell', () => {
  it('close mid-plan, rebuild on the same DATA_DIR: the complete table equals an uninterrupted run', async () => {
    const plan = { ...slowPlan, matrix: { nx: 40, ny: 40 }, methods: [{ name: 'cs-tv', iterations: 60 }] };
    const total = (1 + 3) * 3;
    const first = await testApp({ workers: 1, limits: { maxIterations: 500 } });
    const res = await postJson(first, '/v1/plans', plan);
    await waitFor(first, res.body.id, (b) => b.progress.done >= 3);
    await first.close();
    const doneAtClose = (await import('../../src/jobs/store.ts')).Store;
    const store = new doneAtClose(first.dataDir);
    const kept = store.getPlan(res.body.id)!;
    store.close();
    expect(kept.status).toBe('running');
    expect(kept.done).toBeGreaterThanOrEqual(3);
    expect(kept.done).toBeLessThan(total);

    const second = await testApp({ workers: 1, dataDir: first.dataDir, limits: { maxIterations: 500 } });
    const reference = await testApp({ workers: 1, limits: { maxIterations: 500 } });
    try {
      const resumed = await second.http().get(`/v1/plans/${res.body.id}`);
      expect(resumed.body.progress.done).toBeGreaterThanOrEqual(kept.done);
      const resumedDone = await waitFor(second, res.body.id, finished);
      expect(resumedDone.body.status).toBe('done');
      const fresh = await postJson(reference, '/v1/plans', plan);
      const freshDone = await waitFor(reference, fresh.body.id, finished);
      expect(withoutTiming(resumedDone.body.table)).toEqual(withoutTiming(freshDone.body.table));
      // A finished plan stays readable after yet another restart.
      await second.close();
      const third = await testApp({ workers: 1, dataDir: first.dataDir });
      const reread = await third.http().get(`/v1/plans/${res.body.id}`);
      expect(reread.body.status).toBe('done');
      expect(reread.body.table).toEqual(resumedDone.body.table);
      const csvResumed = (await third.http().get(`/v1/plans/${res.body.id}/table.csv`)).text;
      await third.close();
      expect(csvResumed.split('\r\n')[0]).toBe(
        (await reference.http().get(`/v1/plans/${fresh.body.id}/table.csv`)).text.split('\r\n')[0],
      );
    } finally {
      await second.close();
      await reference.close();
    }
  });
});
