import { CancelledError, throwIfAborted } from '../core/errors.ts';
import type { CellResult } from './cell-result.ts';
import type { PlanCell } from './plan-cells.ts';
import { type PlanProgress, ProgressClock } from './plan-progress.ts';

export interface RunPlanCellsOptions {
  /** Runs one cell: in-process (runCell) or on a worker thread. */
  runCell: (cell: PlanCell) => Promise<CellResult>;
  /** Cells in flight at once (default 1). */
  concurrency?: number;
  /** Cancels between cells: CancelledError. */
  signal?: AbortSignal;
  /** Results of a resumed plan's cells that finished in an earlier run: counted as done, not run again. */
  finished?: ReadonlyMap<number, CellResult>;
  /** The run's clock, when the caller also reads progress between cells; by default one started now. */
  clock?: ProgressClock;
  /** Every finished cell as it arrives (finish order), with the progress it makes. */
  onCell?: (result: CellResult, progress: PlanProgress) => void;
}

/**
 * The one loop over a plan's cells, for the in-process runPlan and the service's queue alike: the
 * pending cells in plan order over `concurrency` lanes. The first failure stops every lane from
 * taking another cell and is thrown once all lanes are idle; an aborted signal gives CancelledError.
 * Returns every cell's result in plan order.
 */
export async function runPlanCells(
  cells: readonly PlanCell[],
  options: RunPlanCellsOptions,
): Promise<CellResult[]> {
  const { signal } = options;
  const results = new Map(options.finished);
  const pending = cells.filter((cell) => !results.has(cell.index));
  const clock = options.clock ?? new ProgressClock(cells.length, results.size);
  const lanes = Math.max(1, Math.min(pending.length, Math.floor(options.concurrency ?? 1)));
  let next = 0;
  let failure: unknown;

  const lane = async (): Promise<void> => {
    while (failure === undefined && next < pending.length) {
      throwIfAborted(signal);
      const cell = pending[next++];
      const result = await options.runCell(cell);
      throwIfAborted(signal);
      results.set(cell.index, result);
      options.onCell?.(result, clock.at(results.size));
    }
  };
  await Promise.all(
    Array.from({ length: lanes }, () =>
      lane().catch((error: unknown) => {
        failure ??= error;
      }),
    ),
  );
  if (failure !== undefined) {
    throw signal?.aborted && !(failure instanceof CancelledError) ? new CancelledError() : failure;
  }
  throwIfAborted(signal);
  return cells.map((cell) => results.get(cell.index)!);
}
