import { Job, Queue, QueueEvents } from 'bullmq';
import { Redis } from 'ioredis';
import { fromWorkerFailure, type WorkerFailure } from '../core/error-transport.ts';
import { CancelledError, ValidationError } from '../core/errors.ts';
import type { CellJobData, CellJobSpec } from './cell-job.ts';
import { CellFailedError, type CellQueueStatus, type CellRunner } from './cell-runner.ts';
import type { JobLog } from './job-log.ts';
import {
  CANCEL_CHANNEL,
  CELL_QUEUE_NAME,
  cancelledKey,
  cellJobId,
  type QueueSettings,
  redactedQueueUrl,
  redisConnection,
} from './queue-connection.ts';
import type { TaskInput, TaskOutput } from './tasks.ts';
import { fromWireJson, toWireJson } from './wire-json.ts';

/** A worker's answer for one cell, as wire JSON in the job's return value. */
export type CellReply = { ok: true; value: TaskOutput<'cell'> } | { ok: false; error: WorkerFailure };

/** Attempts per cell: a crashed worker's cell runs once more elsewhere; a second failure fails the plan. */
const CELL_ATTEMPTS = 2;
/** Finished jobs stay a day, so a service restarted meanwhile still collects their results. */
const KEEP_FINISHED = { age: 24 * 3600 };

/** Cells on a BullMQ queue in Redis, computed by `npm run worker` processes on any machine. */
export class QueueCellRunner implements CellRunner {
  /** Job ids in flight per plan, for cancel. */
  private readonly inFlight = new Map<string, Set<string>>();

  private constructor(
    private readonly queue: Queue,
    private readonly events: QueueEvents,
    private readonly redis: Redis,
    readonly concurrency: number,
    private readonly log: JobLog | undefined,
  ) {}

  static async open(settings: QueueSettings, concurrency: number, log?: JobLog): Promise<QueueCellRunner> {
    const connection = redisConnection(settings);
    const queue = new Queue(CELL_QUEUE_NAME, { connection });
    const events = new QueueEvents(CELL_QUEUE_NAME, { connection });
    const { url, ...options } = connection as { url: string };
    const redis = new Redis(url, options);
    // Connection errors are retried by the clients; logged here instead of as unhandled events.
    const logError = (error: Error) => log?.warn({ err: error }, 'job queue connection');
    queue.on('error', logError);
    events.on('error', logError);
    redis.on('error', logError);
    let timer: NodeJS.Timeout | undefined;
    try {
      // Redis clients reconnect forever; a service that cannot reach its queue says so instead of hanging.
      const unreachable = new Promise<never>((_resolve, reject) => {
        timer = setTimeout(
          () =>
            reject(
              new Error(`the job queue at ${redactedQueueUrl(settings.url)} did not answer within 15 s`),
            ),
          15_000,
        );
      });
      await Promise.race([Promise.all([queue.waitUntilReady(), events.waitUntilReady()]), unreachable]);
    } catch (error) {
      // Neither close() nor disconnect() returns while the connection never came: not awaited.
      void Promise.allSettled([queue.disconnect(), events.disconnect()]);
      redis.disconnect();
      throw error;
    } finally {
      clearTimeout(timer);
    }
    return new QueueCellRunner(queue, events, redis, concurrency, log);
  }

  /** The queue does not know how many worker threads stand behind it: one per cell in flight. */
  get parallelism(): number {
    return this.concurrency;
  }

  async run(planId: string, input: TaskInput<'cell'>, signal: AbortSignal): Promise<TaskOutput<'cell'>> {
    if (signal.aborted) throw new CancelledError();
    if (input.raw) {
      // Workers fetch images and coil maps from the service; raw k-space has no fetch route yet.
      throw new ValidationError({
        field: 'source.rawId',
        message:
          'plans on raw data run on the embedded workers only: the job queue does not carry raw k-space yet',
        allowed: 'an image or phantom source with QUEUE_URL set, or a service without QUEUE_URL',
      });
    }
    if (input.image?.volume) {
      // Workers fetch an upload's 2D pixels only; volumes have no fetch route yet.
      throw new ValidationError({
        field: 'matrix.nz',
        message: 'volume plans run on the embedded workers only: the job queue does not carry volumes yet',
        allowed: 'no matrix.nz with QUEUE_URL set, or a service without QUEUE_URL',
      });
    }
    const spec: CellJobSpec = {
      plan: input.plan,
      cell: input.cell,
      limits: input.limits,
      ...(input.keepOutcome ? { keepOutcome: true } : {}),
      ...(input.image ? { imageId: input.image.id } : {}),
      ...(input.coilMaps ? { coilMapIds: input.coilMaps.map((maps) => maps.id) } : {}),
    };
    const jobId = cellJobId(planId, input.cell.index);
    const data: CellJobData = { planId, spec: toWireJson(spec) };
    // Same id, same job: after a restart this finds the cell queued, running or finished.
    const job = await this.queue.add('cell', data, {
      jobId,
      attempts: CELL_ATTEMPTS,
      removeOnComplete: KEEP_FINISHED,
      removeOnFail: KEEP_FINISHED,
    });
    const jobs = this.inFlight.get(planId) ?? new Set<string>();
    jobs.add(jobId);
    this.inFlight.set(planId, jobs);
    try {
      const returned = await untilAborted(job.waitUntilFinished(this.events), signal);
      const reply = fromWireJson<CellReply>(returned as string);
      if (reply.ok) return reply.value;
      throw fromWorkerFailure(reply.error);
    } catch (error) {
      if (signal.aborted) throw new CancelledError();
      if (error instanceof Error && error.constructor === Error) {
        throw new CellFailedError(input.cell.index, error.message);
      }
      throw error;
    } finally {
      jobs.delete(jobId);
      if (jobs.size === 0) this.inFlight.delete(planId);
    }
  }

  async cancelPlan(planId: string): Promise<void> {
    await this.redis.set(cancelledKey(planId), '1', 'EX', 24 * 3600);
    await this.redis.publish(CANCEL_CHANNEL, planId);
    for (const jobId of this.inFlight.get(planId) ?? []) {
      const job = await Job.fromId(this.queue, jobId);
      // A waiting cell is removed; a running one is locked and stopped by its worker (the message above).
      await job?.remove().catch(() => undefined);
    }
  }

  async status(): Promise<CellQueueStatus> {
    const counts = await this.queue.getJobCounts('waiting', 'prioritized', 'delayed', 'active');
    return {
      kind: 'redis',
      waitingCells: (counts.waiting ?? 0) + (counts.prioritized ?? 0) + (counts.delayed ?? 0),
      runningCells: counts.active ?? 0,
      workerProcesses: await this.queue.getWorkersCount(),
    };
  }

  async close(): Promise<void> {
    const closing = await Promise.allSettled([this.events.close(), this.queue.close(), this.redis.quit()]);
    for (const result of closing) {
      if (result.status === 'rejected') this.log?.error({ err: result.reason }, 'closing the cell queue');
    }
  }
}

/** Rejects as soon as `signal` aborts (the service stops waiting; the cell itself goes on). */
function untilAborted<T>(promise: Promise<T>, signal: AbortSignal): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const onAbort = () => reject(new CancelledError());
    signal.addEventListener('abort', onAbort, { once: true });
    promise.then(
      (value) => {
        signal.removeEventListener('abort', onAbort);
        resolve(value);
      },
      (error: unknown) => {
        signal.removeEventListener('abort', onAbort);
        reject(error);
      },
    );
  });
}
