import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type AppOptions, buildApp } from '../../src/app.ts';
import { type Child, startRedis, startWorker } from '../jobs/redis-process.ts';
import { smallPlanBody } from '../plan/small-plan.ts';
import type { BenchRow } from './timing.ts';

/** CPU-bound cells: 48² phantom, 2 patterns × 3 R × CS-TV 200 iterations × 2 seeds + 2 reference = 14 cells. */
const heavyPlan = smallPlanBody({
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 48, ny: 48 },
  patterns: [
    { pattern: 'cartesian-random', acs: 4 },
    { pattern: 'poisson-disc', acs: 4 },
  ],
  methods: [{ name: 'cs-tv', iterations: 200 }],
});

/** Near-free cells (16², zero-filled), so the queue's own cost per cell shows: 4 R × 10 seeds + 10 = 50 cells. */
const lightPlan = smallPlanBody({
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 16, ny: 16 },
  patterns: [{ pattern: 'cartesian-uniform' }],
  accelerations: [2, 3, 4, 5],
  seeds: 10,
});

/** Wall time of one plan from submit to done, and its cell count. */
async function planSeconds(options: AppOptions, body: unknown): Promise<{ seconds: number; cells: number }> {
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-bench-'));
  const app = await buildApp({ dataDir, workers: 1, limits: { maxIterations: 500 }, ...options });
  try {
    const started = performance.now();
    const submitted = await app.inject({ method: 'POST', url: '/v1/plans', payload: body as object });
    const id = (submitted.json() as { id: string }).id;
    for (;;) {
      const state = (await app.inject({ method: 'GET', url: `/v1/plans/${id}` })).json() as {
        status: string;
        progress: { total: number };
      };
      if (state.status === 'done')
        return { seconds: (performance.now() - started) / 1000, cells: state.progress.total };
      if (state.status !== 'queued' && state.status !== 'running')
        throw new Error(`plan ended ${state.status}`);
      await new Promise((resolve) => setTimeout(resolve, 20));
    }
  } finally {
    await app.close();
    rmSync(dataDir, { recursive: true, force: true });
  }
}

function row(name: string, run: { seconds: number; cells: number }, note = ''): BenchRow {
  const rate = run.cells / run.seconds;
  return {
    name,
    medianMs: run.seconds * 1000,
    note: `${run.cells} cells, ${rate.toFixed(2)} cells/s${note}`,
  };
}

/**
 * One plan each (not a median), after a warm-up: embedded on one thread, then on the Redis queue (Debian's
 * redis-server on loopback) with one and with two `npm run worker` processes of one thread each.
 */
export async function benchQueue(): Promise<BenchRow[]> {
  const redis = await startRedis();
  const workers: Child[] = [];
  try {
    const queue = { queue: { url: redis.url, planConcurrency: 8 } };
    const rows: BenchRow[] = [];
    // Each process's threads load the engine modules on their first cell: the light plan runs first
    // as the warm-up, so the heavy rows compare steady states.
    const embeddedLight = await planSeconds({}, lightPlan);
    rows.push(row('light plan, embedded, 1 thread', embeddedLight));
    const embeddedHeavy = await planSeconds({}, heavyPlan);
    rows.push(row('heavy plan, embedded, 1 thread', embeddedHeavy));

    workers.push(await startWorker({ QUEUE_URL: redis.url }));
    await planSeconds(queue, lightPlan);
    const oneLight = await planSeconds(queue, lightPlan);
    const overheadMs = ((oneLight.seconds - embeddedLight.seconds) * 1000) / oneLight.cells;
    rows.push(
      row(
        'light plan, queue, 1 worker process',
        oneLight,
        `; queue overhead ${overheadMs.toFixed(1)} ms/cell`,
      ),
    );
    const oneHeavy = await planSeconds(queue, heavyPlan);
    rows.push(row('heavy plan, queue, 1 worker process', oneHeavy));

    workers.push(await startWorker({ QUEUE_URL: redis.url }));
    await planSeconds(queue, lightPlan);
    const twoHeavy = await planSeconds(queue, heavyPlan);
    const ratio = oneHeavy.seconds / twoHeavy.seconds;
    rows.push(row('heavy plan, queue, 2 worker processes', twoHeavy, `; ${ratio.toFixed(2)}× one process`));
    return rows;
  } finally {
    for (const worker of workers) await worker.stop();
    await redis.stop();
  }
}
