import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { samplingSchema } from '../sampling/index.ts';
import { jsonResponse, problemResponses } from '../src/http/problem.ts';
import { checkMatrixLimit, matrixSchema } from '../src/http/schemas.ts';
import { protocolSchema, scanTimeResultSchema } from '../src/protocol/index.ts';

const scanTimeBody = z
  .strictObject({
    matrix: matrixSchema,
    protocol: protocolSchema,
    sampling: samplingSchema.optional().describe('Without sampling: fully sampled'),
  })
  .meta({ id: 'ScanTimeRequest' });

// The response is the scan-time model's own result schema (src/protocol), published as a component.
const scanTimeResponse = scanTimeResultSchema.meta({ id: 'ScanTime' });

/** POST /v1/scan-time: the scan-time model (src/protocol) for a matrix, protocol and optional mask. */
export async function scanTimeRoutes(app: FastifyInstance): Promise<void> {
  const { limits, scanTimes } = app.services;
  app.withTypeProvider<ZodTypeProvider>().post(
    '/v1/scan-time',
    {
      schema: {
        summary: 'Scan time of a protocol, fully sampled or with a sampling mask',
        tags: ['protocol'],
        body: scanTimeBody,
        response: {
          200: jsonResponse('The acquisition time', scanTimeResponse),
          ...problemResponses(400, 401, 413, 422, 429),
        },
      },
    },
    async (request) => {
      const { matrix, protocol, sampling } = request.body;
      checkMatrixLimit(matrix, limits);
      return scanTimes.compute(matrix, protocol, sampling);
    },
  );
}
