import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { sampleOrderingSchema, samplingSchema } from '../sampling/index.ts';
import { allLimitFields, type Limits, limitsId } from '../src/core/limits.ts';
import { preferredType } from '../src/http/accept.ts';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { sendPng } from '../src/http/png-reply.ts';
import { HttpProblem, problemResponses } from '../src/http/problem.ts';
import { perLimits, requestSchemas } from '../src/http/schemas.ts';
import { maskResultSchema } from '../src/services/index.ts';

/** The request body with the configured matrix limit baked in. */
const maskBody = perLimits((limits: Limits) =>
  z
    .strictObject({ matrix: requestSchemas(limits).matrix, sampling: samplingSchema })
    .meta({ id: limitsId('MaskRequest', limits, allLimitFields) }),
);

const maskResponse = maskResultSchema.meta({ id: 'MaskResult' });

/** POST /v1/masks: draw a mask, report R, counts and PSF side lobes; Accept: image/png gives the mask itself. */
export async function maskRoutes(app: FastifyInstance): Promise<void> {
  const { limits, tenancy, masks } = app.services;
  app.withTypeProvider<ZodTypeProvider>().post(
    '/v1/masks',
    {
      schema: {
        summary: 'Draw a sampling mask and its point-spread function',
        tags: ['sampling'],
        body: maskBody(limits),
        response: {
          200: {
            description: 'The mask summary, or the mask as PNG with Accept: image/png',
            content: {
              'application/json': { schema: maskResponse },
              'image/png': { schema: z.string().describe('8-bit grey PNG, ny×nx, 255 = acquired') },
            },
          },
          ...problemResponses(400, 401, 413, 415, 422, 429),
        },
      },
    },
    async (request, reply) => {
      const signal = disconnectSignal(request, reply);
      if (preferredType(request, ['application/json', 'image/png']) === 'image/png') {
        return sendPng(reply, await masks.png(request.body, signal));
      }
      const body = await masks.describe(request.body, tenancy(request), signal);
      return reply.type('application/json').send(body);
    },
  );

  const tableParams = z.object({
    id: z.string().min(1).max(200).describe('Mask id from POST /v1/masks'),
  });
  const tableQuery = z.strictObject({ order: sampleOrderingSchema.optional() });
  for (const format of ['csv', 'json'] as const) {
    const type = format === 'csv' ? 'text/csv' : 'application/json';
    app.withTypeProvider<ZodTypeProvider>().get(
      `/v1/masks/:id/table.${format}`,
      {
        schema: {
          summary: `The mask's sampled positions in acquisition order, as ${format.toUpperCase()}`,
          description:
            'Cartesian: header order,ky,kx with integer indices relative to the k-space centre (ky up), ' +
            'in the order `order` names (linear by default, centre-out, spiral-out; docs/design.md §4.10); ' +
            'non-Cartesian: header order,kx,ky in cycles per FOV, readout by readout (only order=linear). ' +
            (format === 'csv'
              ? 'RFC 4180, one header row, CRLF line ends, no comment lines.'
              : 'The same rows with the matrix, R, ACS, seed and ordering.'),
          tags: ['sampling'],
          params: tableParams,
          querystring: tableQuery,
          response: {
            200: {
              description: `The sample table (${type})`,
              content: {
                [type]: {
                  schema:
                    format === 'csv'
                      ? z.string().describe('CSV text')
                      : z.looseObject({}).describe('header facts and samples'),
                },
              },
            },
            ...problemResponses(401, 404, 422),
          },
        },
      },
      async (request, reply) => {
        const { id } = request.params;
        const order = request.query.order ?? 'linear';
        const table = masks.table(id, format, tenancy(request), order);
        if (!table) {
          throw new HttpProblem(404, `no mask ${id}`, [{ field: 'id', message: 'unknown mask id' }]);
        }
        if (!Buffer.isBuffer(table)) {
          throw new HttpProblem(
            422,
            `mask ${id} is a non-Cartesian trajectory: its table keeps the readout order`,
            [
              {
                field: 'order',
                message: 'trajectory tables are listed readout by readout',
                allowed: 'linear',
              },
            ],
          );
        }
        if (format === 'json') return reply.type('application/json').send(JSON.parse(table.toString('utf8')));
        return reply
          .type('text/csv; charset=utf-8; header=present')
          .header('content-disposition', `attachment; filename="mask-${id}.csv"`)
          .send(table.toString('utf8'));
      },
    );
  }
}
