import { Piscina } from 'piscina';
import { fromWorkerFailure } from '../core/error-transport.ts';
import { CancelledError, WorkerError, WorkersBusyError } from '../core/errors.ts';
import type { TaskInput, TaskKind, TaskOutput, WorkerReply, WorkerTask } from './tasks.ts';

/**
 * Workers run the TypeScript sources directly. worker-entry.mjs registers tsx's ESM hooks in the
 * thread (tsx/esm/api) and then imports worker.ts; the same works under `npm start` (tsx) and under
 * vitest, from any working directory. (`execArgv: ['--import', 'tsx']` alone is not enough on
 * Node 20: the loader is not applied to the worker's ESM imports.)
 */
const workerFile = new URL('./worker-entry.mjs', import.meta.url).href;

/** A fixed-size pool of worker threads for plan cells and long single computations. */
export class WorkerPool {
  readonly size: number;
  private readonly piscina: Piscina;
  private destroyed = false;
  private requestTasks = 0;
  private tasksInFlight = 0;
  /** Request-driven tasks (not plan cells) allowed at once, running or waiting. */
  readonly maxRequestTasks: number;

  constructor(size: number, maxRequestTasks = 8 * size) {
    this.size = size;
    this.maxRequestTasks = maxRequestTasks;
    this.piscina = new Piscina({
      filename: workerFile,
      minThreads: size,
      maxThreads: size,
      // One task per thread at a time: cells are CPU-bound.
      concurrentTasksPerWorker: 1,
      idleTimeout: Number.POSITIVE_INFINITY,
    });
  }

  /** Tasks waiting for a free thread. */
  get queued(): number {
    return this.piscina.queueSize;
  }

  /**
   * Tasks handed to piscina and not yet settled (waiting or running). An aborted task leaves at once:
   * piscina terminates the thread running it and starts a fresh one.
   */
  get inFlight(): number {
    return this.tasksInFlight;
  }

  /** Runs a task on a worker; typed engine errors thrown there are rethrown here as the same classes. */
  async run<K extends TaskKind>(kind: K, input: TaskInput<K>, signal?: AbortSignal): Promise<TaskOutput<K>> {
    if (this.destroyed || signal?.aborted) throw new CancelledError();
    let reply: WorkerReply<K>;
    this.tasksInFlight++;
    try {
      // piscina's run is untyped: the reply is what worker.ts's handler for this kind returned.
      const task = { kind, input } as WorkerTask;
      reply = await this.piscina.run(task, signal ? { signal } : {});
    } catch (error) {
      // piscina rejects with an AbortError when the signal fires: the worker thread was stopped.
      if (signal?.aborted || this.destroyed) throw new CancelledError();
      throw new WorkerError(error instanceof Error ? error.message : String(error));
    } finally {
      this.tasksInFlight--;
    }
    if (reply.ok) return reply.value;
    throw fromWorkerFailure(reply.error);
  }

  /**
   * For route handlers: like run, but refused with WorkersBusyError when too many are in flight.
   * `signal` (from disconnectSignal) stops the task when the client goes away.
   */
  async runForRequest<K extends TaskKind>(
    kind: K,
    input: TaskInput<K>,
    signal?: AbortSignal,
  ): Promise<TaskOutput<K>> {
    if (this.requestTasks >= this.maxRequestTasks) throw new WorkersBusyError();
    this.requestTasks++;
    try {
      return await this.run(kind, input, signal);
    } finally {
      this.requestTasks--;
    }
  }

  async destroy(): Promise<void> {
    if (this.destroyed) return;
    this.destroyed = true;
    await this.piscina.destroy();
  }
}
