import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { jsonResponse } from '../src/http/problem.ts';

const healthSchema = z
  .object({
    status: z.literal('ok'),
    workers: z.int().describe('worker threads'),
    queuedPlans: z.int().describe('plans queued or running'),
  })
  .meta({ id: 'Health' });

/** GET /health: answers from the event loop, which plans never block (their cells run in workers). */
export async function healthRoutes(app: FastifyInstance): Promise<void> {
  app.withTypeProvider<ZodTypeProvider>().get(
    '/health',
    {
      schema: {
        summary: 'Liveness',
        tags: ['service'],
        response: { 200: jsonResponse('The service is up', healthSchema) },
      },
    },
    async () => ({
      status: 'ok' as const,
      workers: app.services.pool.size,
      queuedPlans: app.services.plans.length,
    }),
  );
}
