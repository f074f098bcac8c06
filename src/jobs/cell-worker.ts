import { hostname } from 'node:os';
import { UnrecoverableError, Worker } from 'bullmq';
import { Redis } from 'ioredis';
import { toWorkerFailure } from '../core/error-transport.ts';
import { CancelledError, KnownError } from '../core/errors.ts';
import { parseOrThrow } from '../core/zod-problems.ts';
import { planSchemaFor } from '../plan/index.ts';
import type { CellJobData, CellJobSpec } from './cell-job.ts';
import { InputFetcher, type InputSource } from './input-fetcher.ts';
import type { JobLog } from './job-log.ts';
import type { CellReply } from './queue-cell-runner.ts';
import {
  CANCEL_CHANNEL,
  CELL_QUEUE_NAME,
  cancelledKey,
  type QueueSettings,
  redisConnection,
} from './queue-connection.ts';
import type { TaskInput } from './tasks.ts';
import { fromWireJson, toWireJson } from './wire-json.ts';
import { WorkerPool } from './worker-pool.ts';

export interface CellWorkerOptions {
  queue: QueueSettings;
  /** Worker threads of this process (WORKERS); also the cells it takes at once. */
  threads: number;
  /** Where uploads are fetched from; undefined when no SERVICE_URL was given. */
  inputs?: InputSource;
  /**
   * How long a cell stays locked to this process without a renewal (the lock is renewed on the
   * event loop, which cells never block). After it a killed worker's cell goes back to the queue.
   */
  lockSeconds: number;
  log?: JobLog;
}

/**
 * A worker process (`npm run worker`): pulls plan cells from the Redis queue, computes them on its
 * own piscina pool with the same engine code as the service, and returns their results through
 * the queue. It never writes the service's database.
 */
export class CellWorker {
  private readonly running = new Map<string, Set<AbortController>>();

  private constructor(
    private readonly worker: Worker<CellJobData, string>,
    private readonly subscriber: Redis,
    private readonly redis: Redis,
    private readonly pool: WorkerPool,
    private readonly log: JobLog | undefined,
  ) {}

  static async start(options: CellWorkerOptions): Promise<CellWorker> {
    const connection = redisConnection(options.queue);
    const { url, ...redisOptions } = connection as { url: string };
    const subscriber = new Redis(url, redisOptions);
    const redis = new Redis(url, redisOptions);
    const pool = new WorkerPool(options.threads, 0);
    const fetcher = new InputFetcher(options.inputs);
    let self: CellWorker | undefined;
    const worker = new Worker<CellJobData, string>(
      CELL_QUEUE_NAME,
      (job) => {
        if (!self) throw new Error('the worker is still starting');
        return self.process(job.data, fetcher);
      },
      {
        connection,
        concurrency: options.threads,
        lockDuration: options.lockSeconds * 1000,
        stalledInterval: options.lockSeconds * 1000,
        maxStalledCount: 1,
        name: `kspace-worker-${hostname()}-${process.pid}`.replace(/[^\w.-]/g, '_'),
        autorun: false,
      },
    );
    self = new CellWorker(worker, subscriber, redis, pool, options.log);
    worker.on('error', (error) => options.log?.error({ err: error }, 'cell queue error'));
    await subscriber.subscribe(CANCEL_CHANNEL);
    subscriber.on('message', (_channel: string, planId: string) => self.cancelPlan(planId));
    await worker.waitUntilReady();
    void worker.run();
    return self;
  }

  /** Stops taking cells, lets the running ones finish, then stops the threads. */
  async close(): Promise<void> {
    await this.worker.close();
    await Promise.allSettled([this.subscriber.quit(), this.redis.quit()]);
    await this.pool.destroy();
  }

  private cancelPlan(planId: string): void {
    for (const controller of this.running.get(planId) ?? []) controller.abort();
  }

  private async process(data: CellJobData, fetcher: InputFetcher): Promise<string> {
    const { planId } = data;
    if (await this.redis.exists(cancelledKey(planId))) throw new UnrecoverableError('the plan was cancelled');
    const controller = new AbortController();
    const controllers = this.running.get(planId) ?? new Set<AbortController>();
    controllers.add(controller);
    this.running.set(planId, controllers);
    try {
      let reply: CellReply;
      try {
        const input = await this.cellInput(fromWireJson<CellJobSpec>(data.spec), fetcher);
        reply = { ok: true, value: await this.pool.run('cell', input, controller.signal) };
        this.log?.info({ planId, cell: input.cell.index }, 'cell computed');
      } catch (error) {
        if (controller.signal.aborted) throw new UnrecoverableError('the plan was cancelled');
        // Engine errors (a bad value for this matrix…) are the plan's answer; anything else
        // (a crashed thread, an unreachable service, a pool closing under it) is retried.
        if (!(error instanceof KnownError) || error instanceof CancelledError) throw error;
        reply = { ok: false, error: toWorkerFailure(error) };
      }
      return toWireJson(reply);
    } finally {
      controllers.delete(controller);
      if (controllers.size === 0) this.running.delete(planId);
    }
  }

  /** The cell's spec parsed with the service's own plan schema, and its uploads fetched. */
  private async cellInput(spec: CellJobSpec, fetcher: InputFetcher): Promise<TaskInput<'cell'>> {
    const plan = parseOrThrow(planSchemaFor(spec.limits), spec.plan, '');
    const image =
      spec.imageId === undefined ? undefined : { id: spec.imageId, image: await fetcher.image(spec.imageId) };
    const coilMaps =
      spec.coilMapIds === undefined
        ? undefined
        : await Promise.all(spec.coilMapIds.map(async (id) => ({ id, maps: await fetcher.coilMaps(id) })));
    return {
      plan,
      cell: spec.cell,
      limits: spec.limits,
      ...(image ? { image } : {}),
      ...(coilMaps ? { coilMaps } : {}),
      ...(spec.keepOutcome ? { keepOutcome: true } : {}),
    };
  }
}
