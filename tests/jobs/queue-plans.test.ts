import { readFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { createParser, type EventSourceMessage } from 'eventsource-parser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type TestApp, testApp, uploadFile } from '../api/helpers.ts';
import { type Child, type RedisServer, startRedis, startWorker } from './redis-process.ts';

// Plans on the Redis job queue (QUEUE_URL) computed by `npm run worker` processes: the same table as
// the embedded worker threads, and nothing lost or doubled when a worker or the service goes away.
// Each test starts Debian's redis-server on a free loopback port (tests/jobs/redis-process.ts).

/** 40² phantom, 1 pattern × 3 R × CS-TV × 2 seeds + 2 reference seeds = 8 cells, a fraction of a second each. */
const plan = {
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 40, ny: 40 },
  protocol: { trMs: 500 },
  patterns: [{ pattern: 'cartesian-random', acs: 4 }],
  accelerations: [2, 3, 4],
  methods: [{ name: 'cs-tv', iterations: 150 }],
  seeds: 2,
};
const totalCells = (1 + 3) * 2;
const limits = { maxIterations: 500 };

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

type PlanBody = { status: string; progress: { done: number; total: number }; table?: Table; error?: unknown };
type Table = { rows: Array<Record<string, unknown>> };

async function waitFor(t: TestApp, id: string, until: (body: PlanBody) => boolean, seconds = 120) {
  for (let i = 0; i < seconds * 20; i++) {
    const res = await t.http().get(`/v1/plans/${id}`);
    if (until(res.body)) return res.body as PlanBody;
    await sleep(50);
  }
  throw new Error(`plan ${id} did not reach the state in time`);
}

const finished = (b: PlanBody) => ['done', 'failed', 'cancelled'].includes(b.status);

/** Drops what differs between runs: wall time and the per-run ids of the stored row results. */
function withoutTiming(table: Table | undefined) {
  return table?.rows.map(({ reconMs: _ms, resultId: _id, images: _images, ...row }) => row);
}

/** The cells a worker said it computed for the plan. */
function computedBy(worker: Child, planId: string): number[] {
  return worker.lines
    .filter((line) => line.includes('cell computed') && line.includes(planId))
    .map((line) => (JSON.parse(line) as { cell: number }).cell);
}

describe('plans on the Redis job queue with worker processes', () => {
  let redis: RedisServer;
  let embeddedTable: ReturnType<typeof withoutTiming>;
  const started: Array<{ stop(): Promise<void> }> = [];

  beforeAll(async () => {
    redis = await startRedis();
    const embedded = await testApp({ workers: 2, limits });
    try {
      const res = await embedded.http().post('/v1/plans').send(plan);
      const done = await waitFor(embedded, res.body.id, finished);
      expect(done.status).toBe('done');
      embeddedTable = withoutTiming(done.table);
    } finally {
      await embedded.close();
    }
  }, 180_000);

  afterAll(async () => {
    for (const child of started.reverse()) await child.stop();
    await redis?.stop();
  });

  async function service(dataDir?: string): Promise<TestApp> {
    const t = await testApp({ workers: 1, limits, queue: { url: redis.url, planConcurrency: 4 }, dataDir });
    return t;
  }

  /** The plan finished as the embedded run did: done, every cell counted, the same table. */
  function expectEmbeddedTable(done: PlanBody) {
    expect(done.status).toBe('done');
    expect(done.progress).toMatchObject({ done: totalCells, total: totalCells });
    expect(withoutTiming(done.table)).toEqual(embeddedTable);
  }

  /** Every cell of the plan computed exactly once, over all the workers. */
  function expectEachCellOnce(workers: Child[], planId: string) {
    const cells = workers.flatMap((w) => computedBy(w, planId)).sort((x, y) => x - y);
    expect(cells).toEqual(Array.from({ length: totalCells }, (_, i) => i));
  }

  async function worker(env: Record<string, string> = {}): Promise<Child> {
    const child = await startWorker({ QUEUE_URL: redis.url, ...env });
    started.push(child);
    return child;
  }

  /**
   * `body` on the service `open` makes and two fresh worker processes; then the service is closed and
   * both workers stopped (one the test killed is already stopped).
   */
  async function onTwoWorkers(
    open: () => Promise<TestApp>,
    body: (t: TestApp, a: Child, b: Child) => Promise<void>,
  ): Promise<void> {
    const [a, b] = await Promise.all([worker(), worker()]);
    const t = await open();
    try {
      await body(t, a, b);
    } finally {
      await t.close();
      await a.stop();
      await b.stop();
    }
  }

  it(
    'two worker processes give the same table as the embedded threads; /health shows them',
    async () =>
      onTwoWorkers(service, async (t, a, b) => {
        const health = await t.http().get('/health');
        expect(health.body.cellQueue).toMatchObject({ kind: 'redis', reachable: true, workerProcesses: 2 });
        await t.app.listen({ port: 0, host: '127.0.0.1' });
        const port = (t.app.server.address() as AddressInfo).port;
        const res = await t.http().post('/v1/plans').send(plan);
        expect(res.status).toBe(202);
        // Progress reaches the event stream (WHATWG SSE, read with eventsource-parser) as cells come back.
        const stream = await fetch(`http://127.0.0.1:${port}/v1/plans/${res.body.id}/events`);
        const events: EventSourceMessage[] = [];
        const parser = createParser({ onEvent: (event) => events.push(event) });
        const decoder = new TextDecoder();
        for await (const chunk of stream.body as unknown as AsyncIterable<Uint8Array>) {
          parser.feed(decoder.decode(chunk, { stream: true }));
        }
        expect(events.at(-1)?.event).toBe('done');
        const progress = events.filter((e) => e.event === 'progress').map((e) => JSON.parse(e.data).done);
        expect(progress.at(-1)).toBe(totalCells);
        const done = await waitFor(t, res.body.id, finished);
        expectEmbeddedTable(done);
        // Every cell computed exactly once, and both processes took part.
        expectEachCellOnce([a, b], res.body.id);
        expect(computedBy(a, res.body.id).length).toBeGreaterThan(0);
        expect(computedBy(b, res.body.id).length).toBeGreaterThan(0);
        // The rows link their stored seed-1 results as in the embedded run.
        expect(done.table?.rows.every((row) => typeof row.resultId === 'string')).toBe(true);
      }),
    180_000,
  );

  it(
    'a worker killed mid-plan: its cell goes back to the queue, the plan completes, no cell lost or doubled',
    async () =>
      onTwoWorkers(service, async (t, a, b) => {
        const res = await t.http().post('/v1/plans').send(plan);
        const id = res.body.id as string;
        // Kill `a` right after its first cell: it has already taken its next one (one thread, one cell).
        await a.line(new RegExp(`cell computed.*${id}|${id}.*cell computed`));
        await a.stop('SIGKILL');
        expectEmbeddedTable(await waitFor(t, id, finished));
        // Every cell reached the table: those `a` finished before it died, the rest (its lost one too) by `b`.
        const byA = computedBy(a, id);
        const byB = computedBy(b, id);
        expect(new Set([...byA, ...byB]).size).toBe(totalCells);
        expect(byB.length).toBeGreaterThan(0);
      }),
    180_000,
  );

  it('the service restarted mid-plan resumes: finished cells are collected, none computed twice', async () => {
    const [a, b] = await Promise.all([worker(), worker()]);
    const first = await service();
    const res = await first.http().post('/v1/plans').send(plan);
    const id = res.body.id as string;
    await waitFor(first, id, (body) => body.progress.done >= 2);
    await first.close();
    // The workers go on with the cells already queued while no service listens.
    await sleep(1000);
    const second = await service(first.dataDir);
    try {
      expectEmbeddedTable(await waitFor(second, id, finished));
      expectEachCellOnce([a, b], id);
    } finally {
      await second.close();
      await a.stop();
      await b.stop();
    }
  }, 180_000);

  it(
    'cancel drops the waiting cells and stops the running ones within seconds',
    async () =>
      onTwoWorkers(
        () =>
          testApp({
            workers: 1,
            limits: { maxIterations: 20_000 },
            queue: { url: redis.url, planConcurrency: 4 },
          }),
        async (t, a, b) => {
          // Cells of many seconds each, so cancel meets them running.
          const slow = {
            ...plan,
            matrix: { nx: 64, ny: 64 },
            methods: [{ name: 'cs-tv', iterations: 20_000 }],
          };
          const res = await t.http().post('/v1/plans').send(slow);
          const id = res.body.id as string;
          let health = await t.http().get('/health');
          for (let i = 0; i < 200 && health.body.cellQueue.runningCells < 2; i++) {
            await sleep(50);
            health = await t.http().get('/health');
          }
          expect(health.body.cellQueue.runningCells).toBe(2);
          expect(health.body.cellQueue.waitingCells).toBe(2);
          const cancelled = await t.http().delete(`/v1/plans/${id}`);
          expect(cancelled.status).toBe(200);
          expect(cancelled.body.status).toBe('cancelled');
          let emptied = false;
          for (let i = 0; i < 100 && !emptied; i++) {
            await sleep(50);
            health = await t.http().get('/health');
            emptied = health.body.cellQueue.runningCells === 0 && health.body.cellQueue.waitingCells === 0;
          }
          expect(health.body.cellQueue).toMatchObject({
            runningCells: 0,
            waitingCells: 0,
            workerProcesses: 2,
          });
          expect([...computedBy(a, id), ...computedBy(b, id)]).toEqual([]);
          expect((await t.http().get(`/v1/plans/${id}`)).body.status).toBe('cancelled');
        },
      ),
    180_000,
  );

  describe('uploads reach the workers from the service, with the worker key', () => {
    const apiKey = 'portal-key-1';
    const workerKey = 'worker-key-1';
    const camera = readFileSync(new URL('../fixtures/io/camera64.png', import.meta.url));
    const onUpload = (imageId: string) => ({
      ...plan,
      source: { imageId },
      matrix: { nx: 64, ny: 64 },
      accelerations: [2],
      methods: [{ name: 'zero-filled' }],
      seeds: 1,
    });

    it('a plan on an uploaded image: same table as embedded; the worker route takes only the worker key', async () => {
      const embedded = await testApp({ workers: 1, limits });
      const t = await testApp({
        workers: 1,
        limits,
        apiKeys: [apiKey],
        workerKey,
        queue: { url: redis.url },
      });
      try {
        await t.app.listen({ port: 0, host: '127.0.0.1' });
        const serviceUrl = `http://127.0.0.1:${(t.app.server.address() as AddressInfo).port}`;
        const a = await worker({ SERVICE_URL: serviceUrl, WORKER_KEY: workerKey });
        const upload = await uploadFile(t, camera, 'c.png').set('x-api-key', apiKey);
        expect(upload.status).toBe(201);
        const imageId = upload.body.id as string;
        // Not named by a queued plan yet: not served, even with the worker key.
        expect(
          (await t.http().get(`/internal/worker/images/${imageId}`).set('x-api-key', workerKey)).status,
        ).toBe(404);
        const res = await t.http().post('/v1/plans').set('x-api-key', apiKey).send(onUpload(imageId));
        expect(res.status).toBe(202);
        // While queued: an API key does not open the worker route, the worker key does not open /v1.
        expect(
          (await t.http().get(`/internal/worker/images/${imageId}`).set('x-api-key', apiKey)).status,
        ).toBe(401);
        expect((await t.http().get(`/v1/plans/${res.body.id}`).set('x-api-key', workerKey)).status).toBe(401);
        const done = await (async () => {
          for (let i = 0; i < 2400; i++) {
            const got = await t.http().get(`/v1/plans/${res.body.id}`).set('x-api-key', apiKey);
            if (finished(got.body)) return got.body as PlanBody;
            await sleep(50);
          }
          throw new Error('the plan on the upload did not finish');
        })();
        expect(done.status).toBe('done');
        const reference = await uploadFile(embedded, camera, 'c.png');
        const fresh = await embedded.http().post('/v1/plans').send(onUpload(reference.body.id));
        const freshDone = await waitFor(embedded, fresh.body.id, finished);
        expect(withoutTiming(done.table)).toEqual(withoutTiming(freshDone.table));
        expect(computedBy(a, res.body.id).sort()).toEqual([0, 1]);
        await a.stop();
      } finally {
        await t.close();
        await embedded.close();
      }
    }, 180_000);

    it('a worker that cannot fetch the upload fails the cell twice: the plan fails naming the cell', async () => {
      const a = await worker();
      const t = await testApp({ workers: 1, limits, queue: { url: redis.url } });
      try {
        const upload = await uploadFile(t, camera, 'c.png');
        const res = await t.http().post('/v1/plans').send(onUpload(upload.body.id));
        const failed = await waitFor(t, res.body.id, finished);
        expect(failed.status).toBe('failed');
        expect(failed.error).toMatchObject({
          status: 500,
          errors: [{ field: expect.stringMatching(/^cells\[\d\]$/) }],
        });
        expect(JSON.stringify(failed.error)).toMatch(/failed twice.*SERVICE_URL/);
      } finally {
        await t.close();
        await a.stop();
      }
    }, 180_000);
  });
});

describe('a Redis that needs a password', () => {
  it('the password travels in QUEUE_URL to the service and the workers', async () => {
    const redis = await startRedis('queue pass/word');
    const worker = await startWorker({ QUEUE_URL: redis.url });
    const t = await testApp({ workers: 1, queue: { url: redis.url } });
    try {
      const res = await t
        .http()
        .post('/v1/plans')
        .send({ ...plan, methods: [{ name: 'zero-filled' }], seeds: 1 });
      const done = await waitFor(t, res.body.id, finished);
      expect(done.status).toBe('done');
      expect(computedBy(worker, res.body.id).sort()).toEqual([0, 1, 2, 3]);
    } finally {
      await t.close();
      await worker.stop();
      await redis.stop();
    }
  }, 120_000);
});
