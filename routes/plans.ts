import type { FastifyInstance, FastifyReply } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { HttpProblem, jsonResponse, problemResponses } from '../src/http/problem.ts';
import { idParams } from '../src/http/schemas.ts';
import type { PlanProgress } from '../src/jobs/plan-queue.ts';
import type { StoredPlan } from '../src/jobs/store.ts';
import { type Plan, type PlanTable, planSchemaFor, tableToCsv } from '../src/plan/index.ts';

const statusSchema = z.enum(['queued', 'running', 'done', 'failed', 'cancelled']);

const progressSchema = z
  .object({
    done: z.int().describe('finished cells'),
    total: z.int().describe('cells of the plan: (1 reference + patterns × accelerations × methods) × seeds'),
    etaSeconds: z.number().nullable().describe('estimate from this run’s cell rate; null when unknown'),
  })
  .meta({ id: 'PlanProgress' });

const summarySchema = z.object({ mean: z.number().nullable(), sd: z.number().nullable() }).loose();

const rowSchema = z
  .object({
    key: z.string(),
    pattern: z.string(),
    method: z.string(),
    requestedR: z.number().nullable(),
    actualR: z.number(),
    acquired: z.number(),
    acquiredUnit: z.string(),
    scanSeconds: z.number(),
    scanFormatted: z.string(),
    timeSavedPct: z.number(),
    metrics: z.record(z.string(), summarySchema),
    reconMs: z.number(),
    seeds: z.int(),
    pareto: z.boolean(),
    meetsTarget: z.boolean().nullable(),
  })
  .loose()
  .meta({ id: 'PlanRow' });

const tableSchema = z
  .object({
    rows: z.array(rowSchema).describe('rows[0] is the fully sampled reference'),
    paretoMetric: z.string(),
    recommendation: z.object({ statement: z.string() }).loose(),
  })
  .loose()
  .meta({ id: 'PlanTable' });

const planStatusSchema = z
  .object({
    id: z.string(),
    status: statusSchema,
    progress: progressSchema,
    table: tableSchema.optional().describe('when status is done'),
    recommendation: z.object({ statement: z.string() }).loose().optional(),
    error: z
      .object({ status: z.int(), kind: z.string(), detail: z.string(), errors: z.array(z.unknown()) })
      .optional()
      .describe('when status is failed'),
    createdAt: z.string(),
    updatedAt: z.string(),
    links: z.object({ self: z.string(), events: z.string(), csv: z.string() }),
  })
  .meta({ id: 'PlanStatus' });

type PlanStatusBody = z.infer<typeof planStatusSchema>;

const purgeQuery = z.object({
  purge: z
    .enum(['true', 'false'])
    .optional()
    .describe('true: delete the plan and its results instead of cancelling it'),
});

function links(id: string) {
  return { self: `/v1/plans/${id}`, events: `/v1/plans/${id}/events`, csv: `/v1/plans/${id}/table.csv` };
}

function notFound(id: string): HttpProblem {
  return new HttpProblem(404, `no plan ${id}`, [{ field: 'id', message: 'unknown plan id' }]);
}

/**
 * Plans as jobs: POST (202 at once), GET status/table, GET table.csv, GET events (SSE), DELETE (cancel;
 * with ?purge=true, removal).
 */
export async function planRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { plans, store, limits, pool, lifecycle, tenancy } = app.services;
  // Open event streams are ended before the server closes, or close would wait for them.
  const streams = new Set<() => void>();
  app.addHook('preClose', async () => {
    for (const end of [...streams]) end();
  });

  function statusBody(stored: StoredPlan): PlanStatusBody {
    const terminal = stored.status === 'done' || stored.status === 'failed' || stored.status === 'cancelled';
    const live = terminal ? undefined : plans.progress(stored.id);
    const table = stored.status === 'done' ? (stored.table as PlanTable | null) : null;
    return {
      id: stored.id,
      status: live?.status ?? stored.status,
      progress: {
        done: live?.done ?? stored.done,
        total: stored.total,
        etaSeconds: live?.etaSeconds ?? null,
      },
      ...(table ? { table: table as never, recommendation: table.recommendation as never } : {}),
      ...(stored.status === 'failed' && stored.error
        ? { error: stored.error as PlanStatusBody['error'] }
        : {}),
      createdAt: stored.createdAt,
      updatedAt: stored.updatedAt,
      links: links(stored.id),
    };
  }

  r.post(
    '/v1/plans',
    {
      schema: {
        summary: 'Queue a sweep of patterns × accelerations × methods × seeds',
        description: 'Answers 202 at once; follow progress at Location, or as Server-Sent Events.',
        tags: ['plans'],
        body: planSchemaFor(limits),
        response: {
          202: jsonResponse('Queued (Location: the plan)', planStatusSchema),
          ...problemResponses(400, 401, 404, 413, 422, 429),
        },
      },
    },
    async (request, reply) => {
      // Limits (matrix, iterations, cells) and one draw of every mask, before anything is queued
      // (src/plan validatePlan, on a worker thread).
      plans.checkCapacity();
      const plan = await pool.runForRequest<Plan>(
        { kind: 'validate-plan', body: request.body, limits },
        disconnectSignal(request, reply),
      );
      const source = plan.source as { imageId?: string };
      const { owner, scope } = tenancy(request);
      if (source.imageId !== undefined && !store.getImageInfo(source.imageId, scope)) {
        throw new HttpProblem(404, `no uploaded image ${source.imageId}`, [
          { field: 'source.imageId', message: 'unknown image id' },
        ]);
      }
      // The link to the upload lets deleting the upload delete this plan too.
      const inputs = source.imageId === undefined ? [] : [{ kind: 'image' as const, id: source.imageId }];
      const stored = plans.submit(plan, { owner, inputs });
      return reply.code(202).header('location', `/v1/plans/${stored.id}`).send(statusBody(stored));
    },
  );

  r.get(
    '/v1/plans/:id',
    {
      schema: {
        summary: 'Status, progress and, when done, the tradeoff table and recommendation',
        tags: ['plans'],
        params: idParams,
        response: { 200: jsonResponse('The plan status', planStatusSchema), ...problemResponses(401, 404) },
      },
    },
    async (request) => {
      const stored = store.getPlan(request.params.id, tenancy(request).scope);
      if (!stored) throw notFound(request.params.id);
      return statusBody(stored);
    },
  );

  r.get(
    '/v1/plans/:id/table.csv',
    {
      schema: {
        summary: 'The tradeoff table as CSV (RFC 4180)',
        tags: ['plans'],
        params: idParams,
        response: {
          200: { description: 'CSV with a header row', content: { 'text/csv': { schema: z.string() } } },
          ...problemResponses(401, 404, 409),
        },
      },
    },
    async (request, reply) => {
      const stored = store.getPlan(request.params.id, tenancy(request).scope);
      if (!stored) throw notFound(request.params.id);
      if (stored.status !== 'done' || !stored.table) {
        throw new HttpProblem(
          409,
          `plan ${stored.id} is ${stored.status}; the table exists once it is done`,
          [{ field: 'id', message: `status ${stored.status}`, allowed: 'a plan with status done' }],
        );
      }
      return reply
        .type('text/csv; charset=utf-8; header=present')
        .header('content-disposition', `attachment; filename="plan-${stored.id}.csv"`)
        .send(tableToCsv(stored.table as PlanTable));
    },
  );

  r.get(
    '/v1/plans/:id/events',
    {
      schema: {
        summary: 'Progress as Server-Sent Events',
        description:
          'Events: `progress` (data: PlanProgress plus id and status) after every finished cell, then one ' +
          'terminal event named after the final status (`done`, `failed` or `cancelled`) with the plan status; ' +
          'the stream then ends. Event ids are the number of finished cells. Comment lines are heartbeats.',
        tags: ['plans'],
        params: idParams,
        response: {
          200: { description: 'An event stream', content: { 'text/event-stream': { schema: z.string() } } },
          ...problemResponses(401, 404),
        },
      },
    },
    async (request, reply) => {
      const stored = store.getPlan(request.params.id, tenancy(request).scope);
      if (!stored) throw notFound(request.params.id);
      streamEvents(reply, stored.id);
    },
  );

  r.delete(
    '/v1/plans/:id',
    {
      schema: {
        summary: 'Cancel a queued or running plan (finished cells are kept), or purge a plan',
        description:
          'Without `purge`: cancels (200 with the status; 409 once finished). With `purge=true`: removes ' +
          'the plan, its cells and its table whatever its status, cancelling it first if it runs (204).',
        tags: ['plans'],
        params: idParams,
        querystring: purgeQuery,
        response: {
          200: jsonResponse('Cancelled', planStatusSchema),
          204: z.null().describe('Purged'),
          ...problemResponses(401, 404, 409),
        },
      },
    },
    async (request, reply) => {
      const { scope } = tenancy(request);
      if (request.query.purge === 'true') {
        if (!lifecycle.delete('plan', request.params.id, scope)) throw notFound(request.params.id);
        return reply.code(204).send(null);
      }
      const stored = store.getPlan(request.params.id, scope);
      if (!stored) throw notFound(request.params.id);
      if (!plans.cancel(stored.id)) {
        throw new HttpProblem(409, `plan ${stored.id} is already ${stored.status}`, [
          { field: 'id', message: `status ${stored.status}`, allowed: 'a queued or running plan' },
        ]);
      }
      return statusBody(store.getPlan(stored.id)!);
    },
  );

  /** Writes the SSE stream by hand (WHATWG HTML "Server-sent events"): retry, id, event, data lines. */
  function streamEvents(reply: FastifyReply, id: string): void {
    reply.hijack();
    const raw = reply.raw;
    raw.writeHead(200, {
      'content-type': 'text/event-stream; charset=utf-8',
      'cache-control': 'no-cache, no-transform',
      connection: 'keep-alive',
      'x-accel-buffering': 'no',
      'x-request-id': reply.request.id,
    });
    const send = (event: string, eventId: number, data: unknown) => {
      raw.write(`id: ${eventId}\nevent: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
    };
    const terminal = (status: string) => status === 'done' || status === 'failed' || status === 'cancelled';
    let closed = false;
    const finish = () => {
      if (closed) return;
      closed = true;
      plans.off('progress', onProgress);
      clearInterval(heartbeat);
      streams.delete(finish);
      raw.end();
    };
    const onProgress = (progress: PlanProgress) => {
      if (progress.id !== id || closed) return;
      if (terminal(progress.status)) {
        const stored = store.getPlan(id);
        if (stored) send(progress.status, progress.done, statusBody(stored));
        finish();
        return;
      }
      send('progress', progress.done, progress);
    };
    raw.write('retry: 2000\n\n');
    const heartbeat = setInterval(() => raw.write(': heartbeat\n\n'), 15_000);
    heartbeat.unref();
    raw.on('close', finish);
    streams.add(finish);
    plans.on('progress', onProgress);
    // The state at connection time, so a late subscriber sees where the plan is.
    const stored = store.getPlan(id)!;
    const body = statusBody(stored);
    if (terminal(body.status)) {
      send(body.status, body.progress.done, body);
      finish();
    } else {
      send('progress', body.progress.done, { id, status: body.status, ...body.progress });
    }
  }
}
