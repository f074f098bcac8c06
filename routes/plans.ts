import type { FastifyInstance, FastifyReply } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { cursorAfter, listLimit, listQuery, pageSchema } from '../src/http/list-query.ts';
import { HttpProblem, jsonResponse, problemResponses } from '../src/http/problem.ts';
import { idParams } from '../src/http/schemas.ts';
import type { PlanEvent } from '../src/jobs/plan-queue.ts';
import { planSchemaFor, recommendationSchema, tableToCsv } from '../src/plan/index.ts';
import {
  isTerminal,
  planListItemSchema,
  planProgressSchema,
  planRowViewSchema,
  planStatusNames,
  planStatusSchema,
  planTableViewSchema,
} from '../src/services/index.ts';

// The plan status as src/services builds it, its parts published as components (`.meta` returns
// registered copies; the tradeoff table is src/plan's own schema).
const recommendationComponent = recommendationSchema.meta({ id: 'Recommendation' });
const tableComponent = planTableViewSchema
  .extend({
    rows: z
      .array(planRowViewSchema.meta({ id: 'PlanRow' }))
      .describe(planTableViewSchema.shape.rows.description ?? ''),
    recommendation: recommendationComponent,
  })
  .meta({ id: 'PlanTable' });
const planStatusResponse = planStatusSchema
  .extend({
    progress: planProgressSchema.meta({ id: 'PlanProgress' }),
    table: tableComponent.optional().describe('when status is done'),
    recommendation: recommendationComponent.optional(),
  })
  .meta({ id: 'PlanStatus' });

const planListQuery = listQuery.extend({
  status: z.enum(planStatusNames).optional().describe('only plans with this status'),
});
const planListResponse = pageSchema(planListItemSchema.meta({ id: 'PlanListItem' })).meta({ id: 'PlanList' });

const purgeQuery = z.object({
  purge: z
    .enum(['true', 'false'])
    .optional()
    .describe('true: delete the plan and its results instead of cancelling it'),
});

/** The plan whose id the route already checked against the caller's scope. */
const allPlans = { owner: null, scope: 'all' as const };

function notFound(id: string): HttpProblem {
  return new HttpProblem(404, `no plan ${id}`, [{ field: 'id', message: 'unknown plan id' }]);
}

/**
 * Plans as jobs: POST (202 at once), GET status/table, GET table.csv, GET events (SSE), DELETE (cancel;
 * with ?purge=true, removal).
 */
export async function planRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { plans, planning, lifecycle, tenancy, limits } = app.services;
  // Open event streams are ended before the server closes, or close would wait for them.
  const streams = new Set<() => void>();
  app.addHook('preClose', async () => {
    for (const end of [...streams]) end();
  });

  r.post(
    '/v1/plans',
    {
      schema: {
        summary: 'Queue a sweep of patterns × accelerations × methods × seeds',
        description: 'Answers 202 at once; follow progress at Location, or as Server-Sent Events.',
        tags: ['plans'],
        body: planSchemaFor(limits),
        response: {
          202: jsonResponse('Queued (Location: the plan)', planStatusResponse),
          ...problemResponses(400, 401, 404, 413, 422, 429),
        },
      },
    },
    async (request, reply) => {
      const stored = await planning.submit(request.body, tenancy(request), disconnectSignal(request, reply));
      if ('missingImage' in stored) {
        throw new HttpProblem(404, `no uploaded image ${stored.missingImage}`, [
          { field: 'source.imageId', message: 'unknown image id' },
        ]);
      }
      return reply.code(202).header('location', `/v1/plans/${stored.id}`).send(planning.status(stored));
    },
  );

  r.get(
    '/v1/plans',
    {
      schema: {
        summary: "The caller's plans, newest first, a page at a time",
        description:
          'Pages follow `next` (an opaque cursor); plans created meanwhile appear only on a new first page, ' +
          'never shifting the pages still to read. With tenant isolation a key lists only its own plans.',
        tags: ['plans'],
        querystring: planListQuery,
        response: { 200: jsonResponse('One page of plans', planListResponse), ...problemResponses(401, 422) },
      },
    },
    async (request) => {
      const { limit, cursor, status } = request.query;
      const page = planning.list(tenancy(request), {
        limit: limit ?? listLimit.default,
        ...(cursor === undefined ? {} : { after: cursor }),
        ...(status === undefined ? {} : { status }),
      });
      return { items: page.items, next: cursorAfter(page.after) };
    },
  );

  r.get(
    '/v1/plans/:id',
    {
      schema: {
        summary: 'Status, progress and, when done, the tradeoff table and recommendation',
        tags: ['plans'],
        params: idParams,
        response: { 200: jsonResponse('The plan status', planStatusResponse), ...problemResponses(401, 404) },
      },
    },
    async (request) => {
      const stored = planning.get(request.params.id, tenancy(request));
      if (!stored) throw notFound(request.params.id);
      return planning.status(stored);
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
      const stored = planning.get(request.params.id, tenancy(request));
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
        .send(tableToCsv(stored.table));
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
      const stored = planning.get(request.params.id, tenancy(request));
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
          200: jsonResponse('Cancelled', planStatusResponse),
          204: z.null().describe('Purged'),
          ...problemResponses(401, 404, 409),
        },
      },
    },
    async (request, reply) => {
      const caller = tenancy(request);
      if (request.query.purge === 'true') {
        if (!lifecycle.delete('plan', request.params.id, caller.scope)) throw notFound(request.params.id);
        return reply.code(204).send(null);
      }
      const stored = planning.get(request.params.id, caller);
      if (!stored) throw notFound(request.params.id);
      if (!plans.cancel(stored.id)) {
        throw new HttpProblem(409, `plan ${stored.id} is already ${stored.status}`, [
          { field: 'id', message: `status ${stored.status}`, allowed: 'a queued or running plan' },
        ]);
      }
      return planning.status(planning.get(stored.id, allPlans)!);
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
    let closed = false;
    const finish = () => {
      if (closed) return;
      closed = true;
      plans.off('progress', onProgress);
      clearInterval(heartbeat);
      streams.delete(finish);
      raw.end();
    };
    const onProgress = (progress: PlanEvent) => {
      if (progress.id !== id || closed) return;
      if (isTerminal(progress.status)) {
        const stored = planning.get(id, allPlans);
        if (stored) send(progress.status, progress.done, planning.status(stored));
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
    const body = planning.status(planning.get(id, allPlans)!);
    if (isTerminal(body.status)) {
      send(body.status, body.progress.done, body);
      finish();
    } else {
      send('progress', body.progress.done, { id, status: body.status, ...body.progress });
    }
  }
}
