import { mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildApp } from '../../src/app.ts';
import { smallPlanBody } from '../plan/small-plan.ts';
import type { BenchRow } from './timing.ts';

/** A small sweep: 48² modified Shepp–Logan, 2 patterns × 3 R × 2 methods × seeds (+ reference): 13 cells per seed. */
function smallPlan(iterations: number) {
  return smallPlanBody({
    matrix: { nx: 48, ny: 48 },
    patterns: [
      { pattern: 'cartesian-random', acs: 8 },
      { pattern: 'poisson-disc', acs: 8 },
    ],
    methods: [{ name: 'zero-filled' }, { name: 'cs-tv', iterations }],
  });
}

async function withServer<T>(workers: number, fn: (base: string) => Promise<T>): Promise<T> {
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-bench-'));
  const app = await buildApp({ dataDir, workers });
  try {
    await app.listen({ port: 0, host: '127.0.0.1' });
    const address = app.server.address();
    const port = typeof address === 'object' && address ? address.port : 0;
    return await fn(`http://127.0.0.1:${port}`);
  } finally {
    await app.close();
    rmSync(dataDir, { recursive: true, force: true });
  }
}

async function submit(base: string, body: unknown): Promise<string> {
  const res = await fetch(`${base}/v1/plans`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
  if (res.status !== 202) throw new Error(`plan refused: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { id: string }).id;
}

async function status(
  base: string,
  id: string,
): Promise<{ status: string; progress: { done: number; total: number } }> {
  return (await (await fetch(`${base}/v1/plans/${id}`)).json()) as never;
}

async function waitDone(base: string, id: string): Promise<number> {
  for (;;) {
    const s = await status(base, id);
    if (s.status === 'done') return s.progress.total;
    if (s.status === 'failed' || s.status === 'cancelled') throw new Error(`plan ${s.status}`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
}

/** /health latency while a plan runs, and plan throughput on 1 and 2 worker threads. */
export async function benchService(): Promise<BenchRow[]> {
  const rows: BenchRow[] = [];

  // On a machine with as many workers as cores the main thread shares the CPU with them; one
  // worker fewer shows how much of the tail is that contention.
  for (const workers of [2, 1]) {
    rows.push(
      await withServer(workers, async (base) => {
        const id = await submit(base, smallPlan(150));
        const samples: number[] = [];
        while ((await status(base, id)).status !== 'done') {
          const t0 = performance.now();
          const res = await fetch(`${base}/health`);
          await res.arrayBuffer();
          samples.push(performance.now() - t0);
          await new Promise((resolve) => setTimeout(resolve, 10));
        }
        samples.sort((a, b) => a - b);
        return {
          name: `GET /health while a plan runs (${workers} worker${workers > 1 ? 's' : ''}, ${availableParallelism()} cores)`,
          medianMs: percentile(samples, 0.5),
          note: `p95 ${percentile(samples, 0.95).toFixed(2)} ms, max ${samples.at(-1)!.toFixed(2)} ms, n ${samples.length}`,
        };
      }),
    );
  }

  for (const workers of [1, 2]) {
    rows.push(
      await withServer(workers, async (base) => {
        // One untimed plan first: worker start-up and JIT warm-up are not the throughput.
        await waitDone(base, await submit(base, { ...smallPlan(30), seeds: 1 }));
        const t0 = performance.now();
        const cells = await waitDone(base, await submit(base, { ...smallPlan(60), seeds: 4 }));
        const ms = performance.now() - t0;
        return {
          name: `small plan, ${workers} worker${workers > 1 ? 's' : ''} (48², ${cells} cells, cs-tv 60 it.)`,
          medianMs: ms / cells,
          note: `${((cells * 1000) / ms).toFixed(1)} cells/s (per-cell ms shown; one timed run)`,
        };
      }),
    );
  }
  return rows;
}
