import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { allLimitFields, type Limits, limitsId } from '../src/core/limits.ts';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { HttpProblem, jsonResponse, problemResponses } from '../src/http/problem.ts';
import { idParams, perLimits } from '../src/http/schemas.ts';
import { reconstructionRequestSchemaFor } from '../src/pipeline/run-reconstruction.ts';
import { reconstructionSchema } from '../src/services/index.ts';

/**
 * The request body: the pipeline's own request schema with the configured limits baked in (matrix
 * sides, iterations), plus the seed a route call may set; one schema, so a field the pipeline takes
 * is never missing here.
 */
const reconstructionBody = perLimits((limits: Limits) =>
  reconstructionRequestSchemaFor(limits)
    .extend({
      seed: z
        .int()
        .min(0)
        .max(4294967295)
        .optional()
        .describe('overrides sampling.seed and seeds the noise (the same request gives the same bytes)'),
    })
    .meta({ id: limitsId('ReconstructionRequest', limits, allLimitFields) }),
);

const reconstructionResponse = reconstructionSchema.meta({ id: 'Reconstruction' });

function unknownImage(id: string): HttpProblem {
  return new HttpProblem(404, `no uploaded image ${id}`, [
    { field: 'source.imageId', message: 'unknown image id' },
  ]);
}

/** POST /v1/reconstructions (runs on the worker pool) and GET /v1/reconstructions/{id}. */
export async function reconstructionRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { limits, tenancy, reconstructions } = app.services;

  r.post(
    '/v1/reconstructions',
    {
      schema: {
        summary: 'Simulate one undersampled acquisition, reconstruct it and score it',
        tags: ['reconstructions'],
        body: reconstructionBody(limits),
        response: {
          201: jsonResponse('The scored reconstruction (Location: its URL)', reconstructionResponse),
          ...problemResponses(400, 401, 404, 413, 415, 422, 429),
        },
      },
    },
    async (request, reply) => {
      // A client that goes away stops the computation (the worker thread is ended).
      const result = await reconstructions.create(
        request.body,
        tenancy(request),
        disconnectSignal(request, reply),
      );
      if ('missingImage' in result) throw unknownImage(result.missingImage);
      return reply.code(201).header('location', `/v1/reconstructions/${result.id}`).send(result);
    },
  );

  r.get(
    '/v1/reconstructions/:id',
    {
      schema: {
        summary: 'A stored reconstruction result',
        tags: ['reconstructions'],
        params: idParams,
        response: {
          200: jsonResponse('The stored reconstruction', reconstructionResponse),
          ...problemResponses(401, 404),
        },
      },
    },
    async (request) => {
      const stored = reconstructions.get(request.params.id, tenancy(request));
      if (!stored) {
        throw new HttpProblem(404, `no reconstruction ${request.params.id}`, [
          { field: 'id', message: 'unknown id' },
        ]);
      }
      return stored;
    },
  );
}
