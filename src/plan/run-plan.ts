import { CancelledError, throwIfAborted } from '../core/errors.ts';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { buildTable } from './build-table.ts';
import type { CellResult } from './cell-result.ts';
import { type PlanCell, planCells } from './plan-cells.ts';
import type { PlanTable } from './plan-table.ts';
import { runCell } from './run-cell.ts';
import type { Plan } from './schema.ts';
import type { PipelineContext } from './upstream.ts';
import { validatePlan } from './validate-plan.ts';

export type RunCellFn = (plan: Plan, cell: PlanCell, ctx?: PipelineContext) => Promise<CellResult>;

export interface PlanProgress {
  done: number;
  total: number;
  /** Remaining seconds extrapolated from the mean wall time per finished cell; null before the first. */
  etaSeconds: number | null;
}

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
 * Validates and runs a plan: every cell (reference seeds first, then patterns × R × methods × seeds),
 * progress with an ETA, cancellation between cells, then the tradeoff table. Results are
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
  const concurrency = Math.max(1, Math.min(cells.length, Math.floor(options.concurrency ?? 1)));

  const total = cells.length;
  const results: CellResult[] = [];
  const started = performance.now();
  let next = 0;
  let failure: unknown;
  options.onProgress?.(0, total, null);

  const worker = async (): Promise<void> => {
    while (failure === undefined && next < total) {
      throwIfAborted(options.signal);
      const cell = cells[next++];
      const result = await run(plan, cell, ctx);
      throwIfAborted(options.signal);
      results.push(result);
      const done = results.length;
      const elapsedSeconds = (performance.now() - started) / 1000;
      const progress = { done, total, etaSeconds: (elapsedSeconds / done) * (total - done) };
      options.onCell?.(result, progress);
      options.onProgress?.(done, total, progress.etaSeconds);
    }
  };
  const workers = Array.from({ length: concurrency }, () =>
    worker().catch((error: unknown) => {
      failure ??= error;
    }),
  );
  await Promise.all(workers);
  if (failure !== undefined) {
    throw options.signal?.aborted && !(failure instanceof CancelledError) ? new CancelledError() : failure;
  }
  return buildTable(plan, results);
}
