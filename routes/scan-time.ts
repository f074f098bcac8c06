import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { samplingSchema } from '../sampling/index.ts';
import { allLimitFields, type Limits, limitsId } from '../src/core/limits.ts';
import { jsonResponse, problemResponses } from '../src/http/problem.ts';
import { perLimits, requestSchemas } from '../src/http/schemas.ts';
import { protocolSchema, scanTimeResultSchema } from '../src/protocol/index.ts';

/** The request body with the configured matrix limit baked in. */
const scanTimeBody = perLimits((limits: Limits) =>
  z
    .strictObject({
      matrix: requestSchemas(limits).matrix,
      protocol: protocolSchema,
      sampling: samplingSchema.optional().describe('Without sampling: fully sampled'),
    })
    .meta({ id: limitsId('ScanTimeRequest', limits, allLimitFields) }),
);

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
        body: scanTimeBody(limits),
        response: {
          200: jsonResponse('The acquisition time', scanTimeResponse),
          ...problemResponses(400, 401, 413, 422, 429),
        },
      },
    },
    async (request) => {
      const { matrix, protocol, sampling } = request.body;
      return scanTimes.compute(matrix, protocol, sampling);
    },
  );
}
