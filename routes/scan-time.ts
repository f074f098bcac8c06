import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { SampledMask } from '../sampling/index.ts';
import { samplingSchema } from '../sampling/index.ts';
import { allLimitFields, type Limits, limitsId } from '../src/core/limits.ts';
import { jsonResponse, problemResponses } from '../src/http/problem.ts';
import { perLimits, requestSchemas } from '../src/http/schemas.ts';
import { protocolSchema, scanTime } from '../src/protocol/index.ts';

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

const scanTimeResponse = z
  .object({
    seconds: z.number().describe('acquisition time in seconds (calibration and preparation scans excluded)'),
    formatted: z.string().describe('m:ss'),
    acquired: z.number().describe('the count that costs time, in `unit`'),
    unit: z.enum(['lines', 'points', 'spokes']),
    shots: z.int().describe('TRs per pass and per average: ⌈acquired / echoTrainLength⌉'),
    passes: z.int().describe('slice passes (2D)'),
  })
  .meta({ id: 'ScanTime' });

/** POST /v1/scan-time: the scan-time model (src/protocol) for a matrix, protocol and optional mask. */
export async function scanTimeRoutes(app: FastifyInstance): Promise<void> {
  const { pool, limits } = app.services;
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
      let sampled: SampledMask | undefined;
      if (sampling) {
        ({ sampled } = await pool.runForRequest<{ sampled: SampledMask }>({
          kind: 'mask',
          matrix,
          sampling,
          limits,
          diagnostics: false,
        }));
      }
      const time = scanTime(matrix, protocol, sampled);
      return time;
    },
  );
}
