import type { PipelineContext } from '../../src/pipeline/run-reconstruction.ts';
import { type Plan, type PlanCell, runCell } from '../../src/plan/index.ts';

/**
 * A plan cell run `runs` times in this process (the volume cell probes run one process per
 * measurement): each run's wall time, the last NRMSE and the process's peak RSS afterwards.
 */
export async function timedCellRuns(
  plan: Plan,
  cell: PlanCell,
  ctx: PipelineContext,
  runs: number,
): Promise<{ wallMs: number[]; nrmse: number; peakRssMiB: number }> {
  const wallMs: number[] = [];
  let nrmse = 0;
  for (let i = 0; i < runs; i++) {
    const started = performance.now();
    const result = await runCell(plan, cell, ctx);
    wallMs.push(performance.now() - started);
    nrmse = result.metrics.nrmse ?? Number.NaN;
  }
  // maxRSS is in KiB (Node's process.resourceUsage).
  return { wallMs, nrmse, peakRssMiB: process.resourceUsage().maxRSS / 1024 };
}
