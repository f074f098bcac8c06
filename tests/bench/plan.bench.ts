import { defaultLimits } from '../../src/core/limits.ts';
import { WorkerPool } from '../../src/jobs/worker-pool.ts';
import { planCells } from '../../src/plan/plan-cells.ts';
import { runPlan } from '../../src/plan/run-plan.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import { smallPlanBody } from '../plan/small-plan.ts';
import { type BenchRow, median, medianMs } from './timing.ts';

/**
 * The benchmark plan: 3 patterns × 5 accelerations × 3 methods × 3 seeds on 256×256, plus the
 * 3 fully sampled reference cells: in-process on one worker, then on a pool of two worker threads
 * (the service's WorkerPool, runPlan's injectable cell runner), its threads started and warmed by
 * one reference cell each before the clock (timed as their own row). One run each (a plan is itself 138
 * repeats); the median column is that run's wall time. Iterations are kept moderate and stated in the note:
 * cs-tv 30, lowrank-hankel 10 (default window and weighting).
 */
export const benchPlanBody = smallPlanBody({
  matrix: { nx: 256, ny: 256 },
  patterns: [
    { pattern: 'cartesian-uniform', acs: 24 },
    { pattern: 'cartesian-random', acs: 24 },
    { pattern: 'poisson-disc', acs: 24 },
  ],
  accelerations: [2, 3, 4, 6, 8],
  methods: [
    { name: 'zero-filled' },
    { name: 'cs-tv', iterations: 30 },
    { name: 'lowrank-hankel', iterations: 10 },
  ],
  seeds: 3,
  noise: { snr: 40 },
  target: { metric: 'ssim', atLeast: 0.9 },
});

export async function benchPlan(): Promise<BenchRow[]> {
  const validation = await medianMs(() => validatePlan(benchPlanBody), 3, 1);
  const perMethodMs = new Map<number, number[]>();
  const t0 = performance.now();
  const table = await runPlan(benchPlanBody, {
    onCell: (cell) => {
      const key = cell.methodIndex ?? -1;
      perMethodMs.set(key, [...(perMethodMs.get(key) ?? []), cell.reconMs]);
    },
  });
  const totalMs = performance.now() - t0;
  const cells = table.cells.done;
  const names = ['reference (zero-filled, R = 1)', ...benchPlanBody.methods.map((m) => JSON.stringify(m))];
  const rows: BenchRow[] = [
    {
      name: 'plan 3 patterns × 5 R × 3 methods × 3 seeds, 256×256, one worker',
      medianMs: totalMs,
      note: `${cells} cells, ${((cells * 1000) / totalMs).toFixed(2)} cells/s; ${table.recommendation.statement}`,
    },
  ];
  const pool = new WorkerPool(2);
  try {
    // The service starts its pool once at boot; here the threads' start (module loading in each
    // thread) and first cell (phantom k-space, JIT) are timed apart, one reference cell per thread,
    // so the plan below is compared with the in-process run on warm threads.
    const plan = validatePlan(benchPlanBody);
    const warmCell = planCells(plan).find((cell) => cell.reference);
    if (warmCell === undefined) throw new Error('the bench plan has no reference cell');
    const warm = performance.now();
    await Promise.all(
      Array.from({ length: pool.size }, () =>
        pool.run('cell', { plan, cell: warmCell, limits: defaultLimits }),
      ),
    );
    const warmMs = performance.now() - warm;
    rows.push({
      name: 'two worker threads: start and one reference cell each (before the plan)',
      medianMs: warmMs,
      note: 'paid once per pool; the service pays it at boot',
    });
    const t1 = performance.now();
    const pooled = await runPlan(benchPlanBody, {
      concurrency: pool.size,
      runCellFn: async (plan, cell) => (await pool.run('cell', { plan, cell, limits: defaultLimits })).result,
    });
    const pooledMs = performance.now() - t1;
    rows.push({
      name: 'same plan, two worker threads',
      medianMs: pooledMs,
      note: `${pooled.cells.done} cells, ${((pooled.cells.done * 1000) / pooledMs).toFixed(2)} cells/s, ${(totalMs / pooledMs).toFixed(2)}× one worker`,
    });
  } finally {
    await pool.destroy();
  }
  rows.push({
    name: 'validatePlan: schema, limits, 15 masks drawn and timed once',
    medianMs: validation,
    note: 'what POST /v1/plans pays before queueing',
  });
  for (const [index, times] of [...perMethodMs.entries()].sort((a, b) => a[0] - b[0])) {
    rows.push({
      name: `  reconstruction per cell: ${names[index + 1]}`,
      medianMs: median(times),
      note: `median of ${times.length} cells`,
    });
  }
  return rows;
}
