import { defaultLimits, type Limits } from '../core/limits.ts';
import { buildTable } from './build-table.ts';
import type { CellResult } from './cell-result.ts';
import { type PlanCell, planCells } from './plan-cells.ts';
import type { PlanProgress } from './plan-progress.ts';
import type { PlanTable } from './plan-table.ts';
import { runCell } from './run-cell.ts';
import { runPlanCells } from './run-plan-cells.ts';
import type { Plan } from './schema.ts';
import type { PipelineContext } from './upstream.ts';
import { validatePlan } from './validate-plan.ts';

export type RunCellFn = (plan: Plan, cell: PlanCell, ctx?: PipelineContext) => Promise<CellResult>;

export interface RunPlanOptions {
  /** Pipeline context for in-process cells (image loader, limits); `signal` below is added to it. */
  ctx?: PipelineContext;
  limits?: Limits;
  /** Called once with done = 0 and after every finished cell. */
  onProgress?: (done: number, total: number, etaSeconds: number | null) => void;
  /** Every finished cell as it arrives (finish order; the table itself is in plan order). */
  onCell?: (result: CellResult, progress: PlanProgress) => void;
  /** Cancels between cells (and inside a cell where the method checks it): CancelledError. */
  signal?: AbortSignal;
  /** Runs one cell; defaults to runCell in-process. The service passes a worker-pool dispatcher. */
  runCellFn?: RunCellFn;
  /** Cells in flight at once (default 1); more only helps with a runCellFn that runs elsewhere. */
  concurrency?: number;
  /** Skip the one-draw mask check of validatePlan (the caller already did it). */
  skipMaskCheck?: boolean;
}

/**
 * Validates and runs a plan in this process: every cell (reference seeds first, then
 * patterns × R × methods × seeds) through runPlanCells, then the tradeoff table. Results are
 * deterministic for the same plan except the reconstruction wall times.
 */
export async function runPlan(input: unknown, options: RunPlanOptions = {}): Promise<PlanTable> {
  const limits = options.limits ?? options.ctx?.limits ?? defaultLimits;
  const plan = validatePlan(input, { limits, checkMasks: !options.skipMaskCheck });
  const cells = planCells(plan, limits);
  const run = options.runCellFn ?? runCell;
  const ctx: PipelineContext = {
    ...options.ctx,
    limits,
    ...(options.signal ? { signal: options.signal } : {}),
  };
  options.onProgress?.(0, cells.length, null);
  const results = await runPlanCells(cells, {
    runCell: (cell) => run(plan, cell, ctx),
    concurrency: options.concurrency,
    signal: options.signal,
    onCell: (result, progress) => {
      options.onCell?.(result, progress);
      options.onProgress?.(progress.done, progress.total, progress.etaSeconds);
    },
  });
  return buildTable(plan, results);
}
