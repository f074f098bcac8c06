import type { FastifyInstance } from 'fastify';
import { installApiKeyAuth } from '../src/http/auth.ts';
import { HttpProblem } from '../src/http/problem.ts';
import type { InputRef } from '../src/jobs/store.ts';
import { toWireJson } from '../src/jobs/wire-json.ts';

/**
 * GET /internal/worker/{images|coil-maps}/{id}: the uploads that worker processes (`npm run
 * worker`) need for queued plan cells, as wire JSON (src/jobs/wire-json.ts). Not part of the public
 * contract. With API_KEYS, only WORKER_KEY opens these routes (an API key does not), and only an
 * upload that a queued or running plan names is answered, whatever its tenant.
 */
export function workerInputRoutes(options: { apiKeys: readonly string[]; workerKey?: string }) {
  return async (app: FastifyInstance): Promise<void> => {
    if (options.apiKeys.length > 0 && !options.workerKey) return;
    if (options.workerKey) installApiKeyAuth(app, [options.workerKey]);
    const { store } = app.services;
    const namedByUnfinishedPlan = (kind: InputRef['kind'], id: string) => {
      const holders = store.holdersOf({ kind, id }).filter((holder) => holder.kind === 'plan');
      if (holders.length === 0) return false;
      const unfinished = new Set(store.unfinishedPlans().map((plan) => plan.id));
      return holders.some((holder) => unfinished.has(holder.id));
    };
    const notQueued = (id: string) =>
      new HttpProblem(404, `no queued plan cell needs upload ${id}`, [
        { field: 'id', message: 'not an input of a queued plan' },
      ]);

    // The path segment, the input kind the plans link, and the stored value.
    const inputs = [
      { path: 'images', kind: 'image', load: (id: string) => store.getImagePixels(id) },
      { path: 'coil-maps', kind: 'coilMaps', load: (id: string) => store.getCoilMaps(id) },
    ] as const;
    for (const input of inputs) {
      app.get<{ Params: { id: string } }>(
        `/internal/worker/${input.path}/:id`,
        { schema: { hide: true } },
        async (request, reply) => {
          const { id } = request.params;
          const value = namedByUnfinishedPlan(input.kind, id) ? input.load(id) : undefined;
          if (!value) throw notQueued(id);
          return reply.type('application/json').send(toWireJson(value));
        },
      );
    }
  };
}
