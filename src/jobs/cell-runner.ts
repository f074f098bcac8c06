import type { TaskInput, TaskOutput } from './tasks.ts';
import type { WorkerPool } from './worker-pool.ts';

/** What the job queue shows of itself on /health: cells waiting and running, worker processes alive. */
export interface CellQueueStatus {
  kind: 'embedded' | 'redis';
  waitingCells: number;
  runningCells: number;
  /** Worker processes connected to the queue (the embedded pool counts as none). */
  workerProcesses: number;
}

/**
 * Where a plan's cells run: the embedded worker-thread pool (default) or a job queue that worker
 * processes on other machines pull from (QUEUE_URL). The plan queue stays the only one that writes
 * results to the store; a runner only computes a cell and hands its answer back.
 */
export interface CellRunner {
  /** Cells of one plan in flight at once (the per-plan cap). */
  readonly concurrency: number;
  /** Threads or processes computing; for the Retry-After estimate. */
  readonly parallelism: number;
  /** Runs one cell of plan `planId`; `signal` stops waiting for it (a service shutting down). */
  run(planId: string, input: TaskInput<'cell'>, signal: AbortSignal): Promise<TaskOutput<'cell'>>;
  /** The plan was cancelled: drop its waiting cells and stop its running ones. */
  cancelPlan(planId: string): Promise<void>;
  status(): Promise<CellQueueStatus>;
  close(): Promise<void>;
}

/** A cell the queue gave up on: it failed on two attempts (a crash, or an error no engine class names). */
export class CellFailedError extends Error {
  override readonly name = 'CellFailedError';
  constructor(
    readonly cellIndex: number,
    reason: string,
  ) {
    super(`cell ${cellIndex} failed twice on the worker processes: ${reason}`);
  }
}

/** Today's path: cells on the in-process piscina pool; aborting the signal stops the thread. */
export class LocalCellRunner implements CellRunner {
  constructor(private readonly pool: WorkerPool) {}

  get concurrency(): number {
    return this.pool.size;
  }

  get parallelism(): number {
    return this.pool.size;
  }

  run(_planId: string, input: TaskInput<'cell'>, signal: AbortSignal): Promise<TaskOutput<'cell'>> {
    return this.pool.run('cell', input, signal);
  }

  async cancelPlan(): Promise<void> {
    // The plan's AbortController already stopped its threads.
  }

  async status(): Promise<CellQueueStatus> {
    return {
      kind: 'embedded',
      waitingCells: this.pool.queued,
      runningCells: this.pool.inFlight,
      workerProcesses: 0,
    };
  }

  async close(): Promise<void> {
    // The pool belongs to the app, which destroys it.
  }
}
