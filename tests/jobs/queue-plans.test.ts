import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type TestApp, testApp } from '../api/helpers.ts';
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

  async function worker(env: Record<string, string> = {}): Promise<Child> {
    const child = await startWorker({ QUEUE_URL: redis.url, ...env });
    started.push(child);
    return child;
  }

  it('two worker processes give the same table as the embedded threads; /health shows them', async () => {
    const [a, b] = await Promise.all([worker(), worker()]);
    const t = await service();
    try {
      const health = await t.http().get('/health');
      expect(health.body.cellQueue).toMatchObject({ kind: 'redis', reachable: true, workerProcesses: 2 });
      const res = await t.http().post('/v1/plans').send(plan);
      expect(res.status).toBe(202);
      const done = await waitFor(t, res.body.id, finished);
      expect(done.status).toBe('done');
      expect(done.progress).toMatchObject({ done: totalCells, total: totalCells });
      expect(withoutTiming(done.table)).toEqual(embeddedTable);
      const cells = [...computedBy(a, res.body.id), ...computedBy(b, res.body.id)];
      // Every cell computed exactly once, and both processes took part.
      expect(cells.sort((x, y) => x - y)).toEqual(Array.from({ length: totalCells }, (_, i) => i));
      expect(computedBy(a, res.body.id).length).toBeGreaterThan(0);
      expect(computedBy(b, res.body.id).length).toBeGreaterThan(0);
      // The rows link their stored seed-1 results as in the embedded run.
      expect(done.table?.rows.every((row) => typeof row.resultId === 'string')).toBe(true);
    } finally {
      await t.close();
      await a.stop();
      await b.stop();
    }
  }, 180_000);
});
