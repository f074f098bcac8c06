import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { jsonResponse } from '../src/http/problem.ts';

const healthSchema = z
  .object({
    status: z.literal('ok'),
    workers: z.int().describe('worker threads'),
    queuedPlans: z.int().describe('plans queued or running'),
    cellQueue: z
      .object({
        kind: z
          .enum(['embedded', 'redis'])
          .describe('worker threads of this process, or the Redis job queue (QUEUE_URL)'),
        reachable: z.boolean().describe('false when Redis did not answer; the counts are then 0'),
        waitingCells: z.int().describe('plan cells waiting for a worker'),
        runningCells: z.int().describe('plan cells being computed'),
        workerProcesses: z
          .int()
          .describe('`npm run worker` processes connected to the queue (0 when embedded)'),
      })
      .describe('where plan cells run and how deep their queue is'),
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
      cellQueue: await cellQueueHealth(app),
    }),
  );
}

/** The queue's depth and workers; Redis gets a second to answer so /health never hangs on it. */
async function cellQueueHealth(app: FastifyInstance) {
  const { cells } = app.services;
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<null>((resolve) => {
    timer = setTimeout(() => resolve(null), 1000);
  });
  try {
    const status = await Promise.race([cells.status(), timeout]);
    if (status) return { ...status, reachable: true };
  } catch {
    // Reported as unreachable below.
  } finally {
    clearTimeout(timer);
  }
  return { kind: 'redis' as const, reachable: false, waitingCells: 0, runningCells: 0, workerProcesses: 0 };
}
