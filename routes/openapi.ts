import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';

/** GET /openapi.yaml: the contract, generated from the route schemas (the committed openapi.yaml is the same text). */
export async function openapiRoutes(app: FastifyInstance): Promise<void> {
  app.withTypeProvider<ZodTypeProvider>().get(
    '/openapi.yaml',
    {
      schema: {
        summary: 'The OpenAPI 3.1 contract of this service',
        tags: ['service'],
        response: {
          200: { description: 'OpenAPI document', content: { 'application/yaml': { schema: z.string() } } },
        },
      },
    },
    async (_request, reply) =>
      reply.type('application/yaml; charset=utf-8').send(app.swagger({ yaml: true })),
  );
}
