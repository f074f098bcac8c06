import { randomUUID } from 'node:crypto';
import { EventEmitter } from 'node:events';
import type { Logger } from 'pino';
import { boundEcho, boundFieldProblems, MAX_DETAIL_CHARS } from '../core/echo-bound.ts';
import { CancelledError, QueueFullError, ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import type { Plan, PlanCell } from '../plan/index.ts';
import type { InputRef, PlanStatus, Store, StoredPlan } from './store.ts';
import type { WorkerPool } from './worker-pool.ts';

/** The plan engine as the queue needs it (src/plan: planCells, buildTable; runCell runs in the workers). */
export interface PlanEngine {
  cells(plan: unknown, limits: Limits): Array<{ index: number }>;
  buildTable(plan: unknown, results: unknown[]): unknown;
}

export interface PlanProgress {
  id: string;
  status: PlanStatus;
  done: number;
  total: number;
  /** Estimated seconds to completion from this run's cell rate; null until a cell has finished. */
  etaSeconds: number | null;
}

interface ActivePlan {
  id: string;
  body: unknown;
  total: number;
  done: number;
  controller: AbortController;
  startedAt: number | null;
  doneAtStart: number;
}

/**
 * A bounded FIFO of plans. One plan runs at a time, its cells spread over every worker thread;
 * each finished cell is written to the store before it counts, so a restart resumes after the last
 * finished cell. Emits 'progress' (PlanProgress) after every cell and on every status change.
 */
export class PlanQueue extends EventEmitter {
  private readonly active: ActivePlan[] = [];
  private running: Promise<void> | null = null;
  private closed = false;
  private secondsPerCell: number | null = null;

  constructor(
    private readonly store: Store,
    private readonly pool: WorkerPool,
    private readonly engine: PlanEngine,
    private readonly limits: Limits,
    private readonly capacity: number,
    private readonly log: Logger | undefined,
  ) {
    super();
    this.setMaxListeners(0);
  }

  /** Re-queues the plans that were queued or running when the service last stopped. */
  resume(): void {
    for (const plan of this.store.unfinishedPlans()) {
      this.active.push(this.activePlan(plan.id, plan.body, plan.total, plan.done));
    }
    this.pump();
  }

  /** Throws QueueFullError when no plan can be queued now (checked before and at submission). */
  checkCapacity(): void {
    if (this.active.length >= this.capacity) throw new QueueFullError(this.retryAfterSeconds());
  }

  /** Queues a validated plan; throws LimitError for oversized plans, QueueFullError when full. */
  submit(body: unknown, provenance: { owner?: string | null; inputs?: InputRef[] } = {}): StoredPlan {
    if (this.closed) throw new CancelledError();
    const total = this.engine.cells(body, this.limits).length;
    this.checkCapacity();
    const id = randomUUID();
    const stored = this.store.createPlan(id, body, total, provenance);
    this.active.push(this.activePlan(id, body, total, 0));
    this.pump();
    return stored;
  }

  /** Cancels a queued or running plan; returns false if it had already finished. */
  cancel(id: string): boolean {
    const index = this.active.findIndex((plan) => plan.id === id);
    if (index < 0) return false;
    const [plan] = this.active.splice(index, 1);
    plan.controller.abort();
    this.store.setPlanStatus(id, 'cancelled');
    this.emitProgress(plan, 'cancelled');
    return true;
  }

  /** Live progress of a queued or running plan (undefined once it has left the queue). */
  progress(id: string): PlanProgress | undefined {
    const plan = this.active.find((p) => p.id === id);
    if (!plan) return undefined;
    const status: PlanStatus = plan.startedAt === null ? 'queued' : 'running';
    return { id, status, done: plan.done, total: plan.total, etaSeconds: this.eta(plan) };
  }

  get length(): number {
    return this.active.length;
  }

  /** Seconds a client should wait before retrying a refused submission (RFC 9110 Retry-After). */
  retryAfterSeconds(): number {
    const perCell = this.secondsPerCell ?? 1;
    const remaining = this.active.length > 0 ? this.active[0].total - this.active[0].done : 1;
    return Math.min(3600, Math.max(1, Math.ceil((remaining * perCell) / this.pool.size)));
  }

  /** Stops work without marking plans cancelled: they stay queued/running in the store and resume. */
  async close(): Promise<void> {
    this.closed = true;
    for (const plan of this.active) plan.controller.abort();
    await this.running?.catch(() => undefined);
  }

  private activePlan(id: string, body: unknown, total: number, done: number): ActivePlan {
    return { id, body, total, done, controller: new AbortController(), startedAt: null, doneAtStart: done };
  }

  private eta(plan: ActivePlan): number | null {
    if (plan.startedAt === null || plan.done <= plan.doneAtStart) return null;
    const perCell = (Date.now() - plan.startedAt) / 1000 / (plan.done - plan.doneAtStart);
    return Math.round(perCell * (plan.total - plan.done) * 10) / 10;
  }

  private emitProgress(plan: ActivePlan, status: PlanStatus): void {
    const progress: PlanProgress = {
      id: plan.id,
      status,
      done: plan.done,
      total: plan.total,
      etaSeconds: status === 'running' ? this.eta(plan) : null,
    };
    this.emit('progress', progress);
  }

  private pump(): void {
    if (this.running || this.closed) return;
    const next = this.active[0];
    if (!next) return;
    this.running = this.runPlan(next)
      .catch((error) => this.log?.error({ err: error, planId: next.id }, 'plan runner failed'))
      .finally(() => {
        this.running = null;
        const index = this.active.indexOf(next);
        if (index >= 0 && !this.closed) this.active.splice(index, 1);
        this.pump();
      });
  }

  private async runPlan(plan: ActivePlan): Promise<void> {
    const { signal } = plan.controller;
    plan.startedAt = Date.now();
    this.store.setPlanStatus(plan.id, 'running');
    this.emitProgress(plan, 'running');
    try {
      const cells = this.engine.cells(plan.body, this.limits);
      const finished = this.store.planCells(plan.id);
      plan.done = finished.size;
      plan.doneAtStart = finished.size;
      const image = this.uploadedImage(plan.body);
      const pending = cells.filter((cell) => !finished.has(cell.index));
      let next = 0;
      const lane = async (): Promise<void> => {
        while (next < pending.length && !signal.aborted) {
          const cell = pending[next++];
          const started = Date.now();
          const result = await this.pool.run(
            'cell',
            { plan: plan.body as Plan, cell: cell as PlanCell, image, limits: this.limits },
            signal,
          );
          if (signal.aborted || this.closed) return;
          plan.done = this.store.putPlanCell(plan.id, cell.index, result);
          finished.set(cell.index, result);
          const seconds = (Date.now() - started) / 1000;
          this.secondsPerCell =
            this.secondsPerCell === null ? seconds : 0.8 * this.secondsPerCell + 0.2 * seconds;
          this.emitProgress(plan, 'running');
        }
      };
      await Promise.all(Array.from({ length: Math.min(this.pool.size, Math.max(1, pending.length)) }, lane));
      if (signal.aborted || this.closed) return;
      const results = cells.map((cell) => finished.get(cell.index));
      const table = this.engine.buildTable(plan.body, results);
      this.store.setPlanStatus(plan.id, 'done', { table });
      this.emitProgress(plan, 'done');
    } catch (error) {
      if (signal.aborted || this.closed || error instanceof CancelledError) return;
      const failure =
        error instanceof ValidationError
          ? {
              status: 422,
              kind: error.kind,
              // Stored with the plan: bounded like every problem the HTTP layer sends.
              detail: boundEcho(error.message, MAX_DETAIL_CHARS),
              errors: boundFieldProblems(error.problems),
            }
          : {
              status: 500,
              kind: 'internal',
              detail: 'a cell failed unexpectedly; see the service log',
              errors: [],
            };
      if (failure.status === 500) this.log?.error({ err: error, planId: plan.id }, 'plan cell failed');
      this.store.setPlanStatus(plan.id, 'failed', { error: failure });
      this.emitProgress(plan, 'failed');
    }
  }

  private uploadedImage(body: unknown): { id: string; image: RealImage } | undefined {
    const source = (body as { source?: { imageId?: unknown } }).source;
    if (!source || typeof source.imageId !== 'string') return undefined;
    const image = this.store.getImagePixels(source.imageId);
    if (!image) {
      throw new ValidationError({ field: 'source.imageId', message: 'the uploaded image no longer exists' });
    }
    return { id: source.imageId, image };
  }
}
