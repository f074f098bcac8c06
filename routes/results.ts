import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { HttpProblem, problemResponses } from '../src/http/problem.ts';
import { resultImageNames } from '../src/http/result-images.ts';

const names = Object.values(resultImageNames);

const imageParams = z.object({
  id: z.string().min(1).max(200).describe('Result id (a reconstruction or a mask)'),
  image: z
    .string()
    .min(1)
    .max(40)
    .describe(`One of ${names.join(', ')}`),
});

/**
 * GET /v1/results/{id}/{image}.png: images stored with a result (SQLite, so they survive restarts).
 * Reconstructions have all six; masks have mask and psf.
 */
export async function resultRoutes(app: FastifyInstance): Promise<void> {
  const { store } = app.services;
  app.withTypeProvider<ZodTypeProvider>().get(
    '/v1/results/:id/:image.png',
    {
      schema: {
        summary: 'A result image as PNG: reconstruction, zero-filled, reference, error-map, mask or psf',
        description:
          'Magnitude images are 8-bit grey scaled to the reference maximum (the error map to its own ' +
          'maximum); the PSF on a log scale over 3 decades; the mask 255 = acquired.',
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
      const png = names.includes(image as never) ? store.getResultImage(id, image) : undefined;
      if (!png) {
        const known = store.getResult(id) !== undefined;
        throw new HttpProblem(404, known ? `result ${id} has no image ${image}` : `no result ${id}`, [
          known
            ? { field: 'image', message: 'unknown image', allowed: names.join(', ') }
            : { field: 'id', message: 'unknown result id' },
        ]);
      }
      // A Buffer is sent as is; the schema's string type documents the binary body.
      return reply
        .type('image/png')
        .header('cache-control', 'private, max-age=86400, immutable')
        .send(png as unknown as string);
    },
  );
}
