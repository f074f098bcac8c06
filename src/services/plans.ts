import { z } from 'zod';
import type { Limits } from '../core/limits.ts';
import type { PlanQueue } from '../jobs/plan-queue.ts';
import type { Store, StoredPlan } from '../jobs/store.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { type Plan, type PlanRow, type PlanTable, planRowSchema, planTableSchema } from '../plan/index.ts';
import type { Caller, MissingImage } from './caller.ts';
import { checkPlanCoilMaps } from './coil-map-refs.ts';
import { planLabel } from './plan-label.ts';
import { checkRawMatrix, rawIdOf } from './raw-data.ts';
import { reconstructionSchema } from './reconstructions.ts';
import { type ResultImageKey, resultImageNames, resultImageUrl } from './result-images.ts';
import { uploadedVolume } from './uploaded-volume.ts';

export const planStatusNames = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;

export const planProgressSchema = z.object({
  done: z.int().describe('finished cells'),
  total: z
    .int()
    .describe('cells of the plan: (1 reference + patterns × accelerations × methods × coil arrays) × seeds'),
  etaSeconds: z.number().nullable().describe('estimate from this run’s cell rate; null when unknown'),
});

/** A table row as answered: the engine's row plus the image URLs of its representative result. */
export const planRowViewSchema = planRowSchema.extend({
  images: reconstructionSchema.shape.images
    .optional()
    .describe(
      "PNG URLs of the row's seed-1 reconstruction (with resultId; GET /v1/reconstructions/{resultId})",
    ),
});

export const planTableViewSchema = planTableSchema.extend({
  rows: z.array(planRowViewSchema).describe(planTableSchema.shape.rows.description ?? ''),
});

/** A plan as GET /v1/plans/{id} shows it: stored state, live progress, and the table once done. */
export const planStatusSchema = z.object({
  id: z.string(),
  status: z.enum(planStatusNames),
  progress: planProgressSchema,
  table: planTableViewSchema.optional().describe('when status is done'),
  recommendation: planTableSchema.shape.recommendation.optional(),
  error: z
    .object({ status: z.int(), kind: z.string(), detail: z.string(), errors: z.array(z.unknown()) })
    .optional()
    .describe('when status is failed'),
  createdAt: z.string(),
  updatedAt: z.string(),
  links: z.object({ self: z.string(), events: z.string(), csv: z.string() }),
});

export type PlanStatusView = z.infer<typeof planStatusSchema>;

/** One plan as GET /v1/plans lists it. */
export const planListItemSchema = z.object({
  id: z.string(),
  status: z.enum(planStatusNames),
  createdAt: z.string(),
  progress: planProgressSchema.pick({ done: true, total: true }),
  label: z
    .string()
    .describe('source, matrix, patterns × R × methods, seeds (an upload is not named by its id)'),
  links: z.object({ self: z.string() }),
});

export type PlanListItem = z.infer<typeof planListItemSchema>;

function rowView(row: PlanRow): z.infer<typeof planRowViewSchema> {
  if (row.resultId === undefined) return row;
  const id = row.resultId;
  const images = Object.fromEntries(
    (Object.keys(resultImageNames) as ResultImageKey[]).map((key) => [key, resultImageUrl(id, key)]),
  ) as z.infer<typeof reconstructionSchema>['images'];
  return { ...row, images };
}

export function isTerminal(status: string): boolean {
  return status === 'done' || status === 'failed' || status === 'cancelled';
}

function links(id: string): PlanStatusView['links'] {
  return { self: `/v1/plans/${id}`, events: `/v1/plans/${id}/events`, csv: `/v1/plans/${id}/table.csv` };
}

/** Plans as jobs: validated on a worker, linked to their upload, queued, and shown with live progress. */
export class PlanService {
  constructor(private readonly deps: { pool: WorkerPool; store: Store; plans: PlanQueue; limits: Limits }) {}

  /**
   * Limits (matrix, iterations, cells) and one draw of every mask, before anything is queued
   * (src/plan validatePlan, on a worker thread); `signal` (the client leaving) ends that thread.
   */
  async submit(body: Plan, caller: Caller, signal?: AbortSignal): Promise<StoredPlan | MissingImage> {
    const { pool, store, plans, limits } = this.deps;
    plans.checkCapacity();
    const plan = await pool.runForRequest('validate-plan', { plan: body, limits }, signal);
    const source = plan.source as { imageId?: string };
    if (source.imageId !== undefined && !store.getImageInfo(source.imageId, caller.scope)) {
      return { missingImage: source.imageId };
    }
    if (source.imageId !== undefined && (plan.matrix.nz ?? 1) > 1)
      uploadedVolume(store, source.imageId, caller);
    const mapInputs = checkPlanCoilMaps(store, plan, caller);
    const rawId = rawIdOf(plan);
    if (rawId !== undefined) checkRawMatrix(store.getRawKspaceInfo(rawId, caller.scope), rawId, plan.matrix);
    // The link to the upload lets deleting the upload delete this plan too.
    const inputs = [
      ...(source.imageId === undefined ? [] : [{ kind: 'image' as const, id: source.imageId }]),
      ...(rawId === undefined ? [] : [{ kind: 'raw' as const, id: rawId }]),
    ];
    return plans.submit(plan, { owner: caller.owner, inputs: [...inputs, ...mapInputs] });
  }

  /** A plan the caller may see. */
  get(id: string, caller: Caller): StoredPlan | undefined {
    return this.deps.store.getPlan(id, caller.scope);
  }

  /**
   * The caller's plans, newest first, `limit` per page after position `after`; a status filter
   * matches the stored status (a plan counts as running once its first cell started).
   */
  list(
    caller: Caller,
    options: { limit: number; after?: number; status?: PlanStatusView['status'] },
  ): { items: PlanListItem[]; after: number | null } {
    const page = this.deps.store.listPlans(caller.scope, options);
    const items = page.items.map((entry) => {
      const live = isTerminal(entry.status) ? undefined : this.deps.plans.progress(entry.id);
      return {
        id: entry.id,
        status: entry.status,
        createdAt: entry.createdAt,
        progress: { done: live?.done ?? entry.done, total: entry.total },
        label: planLabel(entry.body),
        links: { self: links(entry.id).self },
      };
    });
    return { items, after: page.after };
  }

  /** The stored plan with its live progress while it is queued or running. */
  status(stored: StoredPlan): PlanStatusView {
    const live = isTerminal(stored.status) ? undefined : this.deps.plans.progress(stored.id);
    const table = stored.status === 'done' ? (stored.table as PlanTable | null) : null;
    return {
      id: stored.id,
      status: live?.status ?? stored.status,
      progress: {
        done: live?.done ?? stored.done,
        total: stored.total,
        etaSeconds: live?.etaSeconds ?? null,
      },
      ...(table
        ? { table: { ...table, rows: table.rows.map(rowView) }, recommendation: table.recommendation }
        : {}),
      ...(stored.status === 'failed' && stored.error
        ? { error: stored.error as PlanStatusView['error'] }
        : {}),
      createdAt: stored.createdAt,
      updatedAt: stored.updatedAt,
      links: links(stored.id),
    };
  }
}
