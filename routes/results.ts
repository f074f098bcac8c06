import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { sendPng } from '../src/http/png-reply.ts';
import { HttpProblem, problemResponses } from '../src/http/problem.ts';
import { idParams } from '../src/http/schemas.ts';
import { resultImageNames } from '../src/services/index.ts';

const names = Object.values(resultImageNames);

const imageParams = z.object({
  id: z.string().min(1).max(200).describe('Result id (a reconstruction or a mask)'),
  image: z
    .string()
    .min(1)
    .max(40)
    .describe(`One of ${names.join(', ')}`),
});

function notFound(id: string): HttpProblem {
  return new HttpProblem(404, `no result ${id}`, [{ field: 'id', message: 'unknown result id' }]);
}

/**
 * GET /v1/results/{id}/{image}.png: images stored with a result (SQLite, so they survive restarts).
 * Reconstructions have all six (receive arrays add coil-maps, and g-factor where it applies); masks have
 * mask and psf. DELETE /v1/results/{id} removes a result.
 */
export async function resultRoutes(app: FastifyInstance): Promise<void> {
  const { store, lifecycle, tenancy } = app.services;
  const r = app.withTypeProvider<ZodTypeProvider>();

  r.delete(
    '/v1/results/:id',
    {
      schema: {
        summary: 'Delete a result (a reconstruction or a mask) with its images',
        tags: ['results'],
        params: idParams,
        response: { 204: z.null().describe('Deleted'), ...problemResponses(401, 404) },
      },
    },
    async (request, reply) => {
      if (!lifecycle.delete('result', request.params.id, tenancy(request).scope)) {
        throw notFound(request.params.id);
      }
      return reply.code(204).send(null);
    },
  );

  r.get(
    '/v1/results/:id/:image.png',
    {
      schema: {
        summary: 'A result image as PNG: reconstruction, zero-filled, reference, error-map, mask or psf',
        description:
          'Magnitude images are 8-bit grey scaled to the reference maximum (the error map to its own ' +
          'maximum); the PSF on a log scale over 3 decades; the mask 255 = acquired. A reconstruction ' +
          'with lesions also has lesions (the reconstruction of the data with the lesions, on the same grey scale).',
        tags: ['results'],
        params: imageParams,
        response: {
          200: {
            description: 'PNG image',
            content: { 'image/png': { schema: z.string().describe('PNG bytes') } },
          },
          ...problemResponses(401, 404),
        },
      },
    },
    async (request, reply) => {
      const { id, image } = request.params;
      const { scope } = tenancy(request);
      const png = (names as readonly string[]).includes(image)
        ? store.getResultImage(id, image, scope)
        : undefined;
      if (!png) {
        if (store.getResult(id, scope) === undefined) throw notFound(id);
        throw new HttpProblem(404, `result ${id} has no image ${image}`, [
          { field: 'image', message: 'unknown image', allowed: names.join(', ') },
        ]);
      }
      return sendPng(reply.header('cache-control', 'private, max-age=86400, immutable'), png);
    },
  );
}
