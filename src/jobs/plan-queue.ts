import { randomUUID } from 'node:crypto';
import { EventEmitter } from 'node:events';
import { boundEcho, boundFieldProblems, MAX_DETAIL_CHARS } from '../core/echo-bound.ts';
import { CancelledError, QueueFullError, ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import {
  type CellResult,
  type Plan,
  type PlanCell,
  type PlanProgress,
  type PlanTable,
  ProgressClock,
  runPlanCells,
} from '../plan/index.ts';
import { CellFailedError, type CellRunner } from './cell-runner.ts';
import type { JobLog } from './job-log.ts';
import type { InputRef, PlanFailure, PlanStatus, Store, StoredPlan } from './store.ts';
import type { ScoredOutcome, UploadedCoilMaps, UploadedPixels, UploadedRawKspace } from './tasks.ts';

/** The plan engine as the queue needs it (src/plan: planCells, buildTable; runCell runs in the workers). */
export interface PlanEngine {
  cells(plan: Plan, limits: Limits): PlanCell[];
  buildTable(plan: Plan, results: CellResult[]): PlanTable;
}

/**
 * Stores a row's representative outcome (its seed-1 cell) as a result belonging to the plan and
 * returns its id; undefined when it could not be stored (the plan or its input went meanwhile).
 */
export type RowResultKeeper = (planId: string, scored: ScoredOutcome) => Promise<string | undefined>;

/** What the queue emits as 'progress': a plan's progress with its id and status. */
export interface PlanEvent extends PlanProgress {
  id: string;
  status: PlanStatus;
}

interface ActivePlan {
  id: string;
  plan: Plan;
  total: number;
  done: number;
  controller: AbortController;
  /** Set when the plan starts running. */
  clock: ProgressClock | null;
}

/**
 * A bounded FIFO of plans. One plan runs at a time, its cells spread by src/plan's runPlanCells over
 * a CellRunner (the worker threads, or worker processes behind QUEUE_URL); each finished cell is written to the store before it counts, so a restart
 * resumes after the last finished cell. Emits 'progress' (PlanEvent) after every cell and on every
 * status change.
 */
export class PlanQueue extends EventEmitter {
  private readonly active: ActivePlan[] = [];
  private running: Promise<void> | null = null;
  private closed = false;
  private secondsPerCell: number | null = null;

  constructor(
    private readonly store: Store,
    private readonly cells: CellRunner,
    private readonly engine: PlanEngine,
    private readonly limits: Limits,
    private readonly capacity: number,
    private readonly log: JobLog | undefined,
    private readonly keepRowResult?: RowResultKeeper,
  ) {
    super();
    this.setMaxListeners(0);
  }

  /** Re-queues the plans that were queued or running when the service last stopped. */
  resume(): void {
    for (const stored of this.store.unfinishedPlans()) {
      this.active.push(this.activePlan(stored.id, stored.plan, stored.total, stored.done));
    }
    this.pump();
  }

  /** Throws QueueFullError when no plan can be queued now (checked before and at submission). */
  checkCapacity(): void {
    if (this.active.length >= this.capacity) throw new QueueFullError(this.retryAfterSeconds());
  }

  /** Queues a validated plan; throws LimitError for oversized plans, QueueFullError when full. */
  submit(plan: Plan, provenance: { owner?: string | null; inputs?: InputRef[] } = {}): StoredPlan {
    if (this.closed) throw new CancelledError();
    const total = this.engine.cells(plan, this.limits).length;
    this.checkCapacity();
    const id = randomUUID();
    const stored = this.store.createPlan(id, plan, total, provenance);
    this.active.push(this.activePlan(id, plan, total, 0));
    this.pump();
    return stored;
  }

  /** Cancels a queued or running plan; returns false if it had already finished. */
  cancel(id: string): boolean {
    const index = this.active.findIndex((plan) => plan.id === id);
    if (index < 0) return false;
    const [plan] = this.active.splice(index, 1);
    plan.controller.abort();
    this.cells
      .cancelPlan(id)
      .catch((error) => this.log?.error({ err: error, planId: id }, 'cancelling queued cells failed'));
    this.store.setPlanStatus(id, 'cancelled');
    this.emitProgress(plan, 'cancelled');
    return true;
  }

  /** Live progress of a queued or running plan (undefined once it has left the queue). */
  progress(id: string): PlanEvent | undefined {
    const plan = this.active.find((p) => p.id === id);
    if (!plan) return undefined;
    return this.event(plan, plan.clock === null ? 'queued' : 'running');
  }

  get length(): number {
    return this.active.length;
  }

  /** Seconds a client should wait before retrying a refused submission (RFC 9110 Retry-After). */
  retryAfterSeconds(): number {
    const perCell = this.secondsPerCell ?? 1;
    const remaining = this.active.length > 0 ? this.active[0].total - this.active[0].done : 1;
    return Math.min(3600, Math.max(1, Math.ceil((remaining * perCell) / this.cells.parallelism)));
  }

  /** Stops work without marking plans cancelled: they stay queued/running in the store and resume. */
  async close(): Promise<void> {
    this.closed = true;
    for (const plan of this.active) plan.controller.abort();
    await this.running?.catch(() => undefined);
  }

  private activePlan(id: string, plan: Plan, total: number, done: number): ActivePlan {
    return { id, plan, total, done, controller: new AbortController(), clock: null };
  }

  private event(plan: ActivePlan, status: PlanStatus): PlanEvent {
    const etaSeconds = status === 'running' && plan.clock ? plan.clock.at(plan.done).etaSeconds : null;
    return { id: plan.id, status, done: plan.done, total: plan.total, etaSeconds };
  }

  private emitProgress(plan: ActivePlan, status: PlanStatus): void {
    this.emit('progress', this.event(plan, status));
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

  private async runPlan(active: ActivePlan): Promise<void> {
    const { signal } = active.controller;
    const { plan } = active;
    this.store.setPlanStatus(active.id, 'running');
    try {
      const cells = this.engine.cells(plan, this.limits);
      const finished = this.store.planCells(active.id);
      active.done = finished.size;
      active.clock = new ProgressClock(active.total, finished.size);
      this.emitProgress(active, 'running');
      const image = this.uploadedImage(plan);
      const coilMaps = this.uploadedCoilMaps(active.id);
      const raw = this.uploadedRaw(plan);
      const results = await runPlanCells(cells, {
        runCell: async (cell) => {
          const started = Date.now();
          const keepOutcome = this.keepRowResult !== undefined && cell.seed === 1;
          const input = {
            plan,
            cell,
            image,
            ...(coilMaps.length > 0 ? { coilMaps } : {}),
            ...(raw ? { raw } : {}),
            limits: this.limits,
            ...(keepOutcome ? { keepOutcome } : {}),
          };
          const { result, outcome } = await this.cells.run(active.id, input, signal);
          if (outcome && this.keepRowResult && !signal.aborted) {
            const resultId = await this.keepRowResult(active.id, outcome);
            if (resultId !== undefined) result.resultId = resultId;
          }
          const seconds = (Date.now() - started) / 1000;
          this.secondsPerCell =
            this.secondsPerCell === null ? seconds : 0.8 * this.secondsPerCell + 0.2 * seconds;
          return result;
        },
        concurrency: this.cells.concurrency,
        signal,
        finished,
        clock: active.clock,
        onCell: (result) => {
          active.done = this.store.putPlanCell(active.id, result.index, result);
          this.emitProgress(active, 'running');
        },
      });
      const table = this.engine.buildTable(plan, results);
      this.store.setPlanStatus(active.id, 'done', { table });
      this.emitProgress(active, 'done');
    } catch (error) {
      if (signal.aborted || this.closed || error instanceof CancelledError) return;
      const failure = planFailure(error);
      if (failure.status === 500) this.log?.error({ err: error, planId: active.id }, 'plan cell failed');
      this.store.setPlanStatus(active.id, 'failed', { error: failure });
      this.emitProgress(active, 'failed');
    }
  }

  /** The coil maps the plan was linked to at submit (checked then for its owner). */
  private uploadedCoilMaps(planId: string): UploadedCoilMaps[] {
    return this.store
      .inputsOf('plan', planId)
      .filter((input) => input.kind === 'coilMaps')
      .map((input) => {
        const maps = this.store.getCoilMaps(input.id);
        if (!maps) {
          throw new ValidationError({
            field: 'coilArrays',
            message: `the coil maps ${input.id} no longer exist`,
          });
        }
        return { id: input.id, maps };
      });
  }

  /** The raw k-space the plan names (checked at submit for its owner). */
  private uploadedRaw(plan: Plan): UploadedRawKspace | undefined {
    if (!('rawId' in plan.source)) return undefined;
    const id = plan.source.rawId;
    const raw = this.store.getRawKspace(id);
    if (!raw) throw new ValidationError({ field: 'source.rawId', message: 'the raw data no longer exist' });
    return { id, raw };
  }

  private uploadedImage(plan: Plan): UploadedPixels | undefined {
    if (!('imageId' in plan.source)) return undefined;
    const id = plan.source.imageId;
    const image = this.store.getImagePixels(id);
    if (!image) {
      throw new ValidationError({ field: 'source.imageId', message: 'the uploaded image no longer exists' });
    }
    const volume = (plan.matrix.nz ?? 1) > 1 ? this.store.getImageVolume(id) : undefined;
    return { id, image, ...(volume ? { volume } : {}) };
  }
}

/** What a failed plan stores: bad values name their fields (422); anything else is the service's fault. */
function planFailure(error: unknown): PlanFailure {
  if (error instanceof CellFailedError) {
    const detail = boundEcho(error.message, MAX_DETAIL_CHARS);
    return {
      status: 500,
      kind: 'internal',
      detail,
      errors: [{ field: `cells[${error.cellIndex}]`, message: detail }],
    };
  }
  if (error instanceof ValidationError) {
    // Stored with the plan: bounded like every problem the HTTP layer sends.
    return {
      status: error.status,
      kind: error.kind,
      detail: boundEcho(error.message, MAX_DETAIL_CHARS),
      errors: boundFieldProblems(error.problems),
    };
  }
  return {
    status: 500,
    kind: 'internal',
    detail: 'a cell failed unexpectedly; see the service log',
    errors: [],
  };
}
