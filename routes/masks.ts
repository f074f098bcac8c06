import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { type MaskDiagnostics, type SampledMask, samplingSchema } from '../sampling/index.ts';
import { allLimitFields, type Limits, limitsId } from '../src/core/limits.ts';
import { preferredType } from '../src/http/accept.ts';
import { contentId } from '../src/http/content-id.ts';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { problemResponses } from '../src/http/problem.ts';
import { resultImageUrl } from '../src/http/result-images.ts';
import {
  psfSummary,
  psfSummarySchema,
  sampledSummary,
  sampledSummarySchema,
} from '../src/http/sampled-summary.ts';
import { perLimits, requestSchemas } from '../src/http/schemas.ts';
import { greyPng, maskPng } from '../src/render/png.ts';

/** The request body with the configured matrix limit baked in. */
const maskBody = perLimits((limits: Limits) =>
  z
    .strictObject({ matrix: requestSchemas(limits).matrix, sampling: samplingSchema })
    .meta({ id: limitsId('MaskRequest', limits, allLimitFields) }),
);

const maskResponse = sampledSummarySchema
  .extend({
    id: z.string().describe('Result id: the PNGs stay available under /v1/results/{id}/'),
    psf: psfSummarySchema,
    images: z
      .object({ mask: z.string(), psf: z.string() })
      .describe('URLs of the mask and |PSF| (log scale) PNGs'),
  })
  .meta({ id: 'MaskResult' });

/** POST /v1/masks: draw a mask, report R, counts and PSF side lobes; Accept: image/png gives the mask itself. */
export async function maskRoutes(app: FastifyInstance): Promise<void> {
  const { pool, limits, store, tenancy } = app.services;
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
      const { matrix, sampling } = request.body;
      const wantsPng = preferredType(request, ['application/json', 'image/png']) === 'image/png';
      // Masks are a pure function of the request, so equal requests share one id and one stored result
      // (per tenant under isolation: the owner digest joins the id, undefined otherwise).
      const { owner, scope } = tenancy(request);
      const id = contentId('mask', { matrix, sampling, owner: scope === 'all' ? undefined : owner });
      if (!wantsPng) {
        const stored = store.getResult(id, scope);
        if (stored) return reply.type('application/json').send(stored.body as z.infer<typeof maskResponse>);
      }
      const { sampled, diagnostics } = await pool.runForRequest<{
        sampled: SampledMask;
        diagnostics: MaskDiagnostics | null;
      }>(
        { kind: 'mask', matrix, sampling, limits, diagnostics: !wantsPng },
        disconnectSignal(request, reply),
      );
      const mask = await maskPng(sampled);
      if (wantsPng) return reply.type('image/png').send(mask as unknown as string);
      const psf = diagnostics!;
      const body = {
        id,
        ...sampledSummary(sampled),
        psf: psfSummary(psf),
        images: { mask: resultImageUrl(id, 'mask'), psf: resultImageUrl(id, 'psf') },
      };
      store.putResult(id, 'mask', body, { mask, psf: await greyPng(psf.psf, { scale: 'log' }) }, { owner });
      return reply.type('application/json').send(body);
    },
  );
}
