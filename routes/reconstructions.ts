import { randomUUID } from 'node:crypto';
import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { type MaskDiagnostics, samplingSchema } from '../sampling/index.ts';
import { noiseSchema } from '../src/acquisition/index.ts';
import { allLimitFields, type Limits, limitsId } from '../src/core/limits.ts';
import type { RealImage } from '../src/core/real-image.ts';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { finiteOrNull, jsonSafe } from '../src/http/json-safe.ts';
import { HttpProblem, jsonResponse, problemResponses } from '../src/http/problem.ts';
import { type ResultImageKey, resultImageNames, resultImageUrl } from '../src/http/result-images.ts';
import {
  psfSummary,
  psfSummarySchema,
  sampledSummary,
  sampledSummarySchema,
} from '../src/http/sampled-summary.ts';
import { idParams, perLimits, requestSchemas } from '../src/http/schemas.ts';
import type { UploadedPixels } from '../src/jobs/tasks.ts';
import { type ReconstructionOutcome, sourceSchema } from '../src/pipeline/run-reconstruction.ts';
import { greyPng, maskPng } from '../src/render/png.ts';

/** The request body with the configured limits baked in (matrix sides, iterations). */
const reconstructionBody = perLimits((limits: Limits) =>
  z
    .strictObject({
      source: sourceSchema,
      matrix: requestSchemas(limits).scoredMatrix,
      sampling: samplingSchema,
      noise: noiseSchema.optional().describe('complex Gaussian k-space noise; omitted or "none": noiseless'),
      method: requestSchemas(limits).method,
      seed: z
        .int()
        .min(0)
        .max(4294967295)
        .optional()
        .describe('overrides sampling.seed and seeds the noise (the same request gives the same bytes)'),
    })
    .meta({ id: limitsId('ReconstructionRequest', limits, allLimitFields) }),
);

const metricValue = z.number().nullable().describe('null when not finite (PSNR of an exact reconstruction)');

const reconstructionResponse = z
  .object({
    id: z.string(),
    metrics: z
      .object({ nrmse: metricValue, psnr: metricValue, ssim: metricValue, hfen: metricValue })
      .describe('|x̂| against |reference| (fully sampled, noiseless): NRMSE, PSNR dB, SSIM, HFEN'),
    acceleration: z.object({ requested: z.number().nullable(), actual: z.number() }),
    acquired: z.object({ count: z.number(), unit: z.string() }),
    fraction: z.number(),
    timing: z.object({ reconMs: z.number() }),
    info: z.record(z.string(), z.unknown()).describe('method facts: iterations, objective, rank, …'),
    notes: z.array(z.string()),
    sampling: sampledSummarySchema,
    psf: psfSummarySchema,
    images: z
      .object({
        reconstruction: z.string(),
        zeroFilled: z.string(),
        reference: z.string(),
        errorMap: z.string(),
        mask: z.string(),
        psf: z.string(),
      })
      .describe('PNG URLs (GET /v1/results/{id}/{image}.png)'),
    createdAt: z.string(),
  })
  .meta({ id: 'Reconstruction' });

type ReconstructionBody = z.infer<typeof reconstructionResponse>;

function maxOf(image: RealImage): number {
  let max = 0;
  for (const v of image.data) if (v > max) max = v;
  return max;
}

function unknownImage(id: string): HttpProblem {
  return new HttpProblem(404, `no uploaded image ${id}`, [
    { field: 'source.imageId', message: 'unknown image id' },
  ]);
}

/** POST /v1/reconstructions (runs on the worker pool) and GET /v1/reconstructions/{id}. */
export async function reconstructionRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { pool, limits, store, tenancy } = app.services;

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
      const { seed, ...pipelineRequest } = request.body;
      const { owner, scope } = tenancy(request);
      let image: UploadedPixels | undefined;
      if ('imageId' in pipelineRequest.source) {
        const id = pipelineRequest.source.imageId;
        const pixels = store.getImagePixels(id, scope);
        if (!pixels) throw unknownImage(id);
        image = { id, image: pixels };
      }
      // A client that goes away stops the computation (the worker thread is ended).
      const { outcome, diagnostics } = await pool.runForRequest<{
        outcome: ReconstructionOutcome;
        diagnostics: MaskDiagnostics;
      }>(
        {
          kind: 'reconstruction',
          request: pipelineRequest,
          ...(seed === undefined ? {} : { seed }),
          ...(image ? { image } : {}),
          limits,
        },
        disconnectSignal(request, reply),
      );
      const id = randomUUID();
      const { images } = outcome;
      // Magnitudes share the reference's grey scale so they compare by eye; the error map uses its own.
      const white = maxOf(images.reference) || undefined;
      const pngs: Record<string, Buffer> = {
        [resultImageNames.reconstruction]: await greyPng(images.reconstruction, { max: white }),
        [resultImageNames.zeroFilled]: await greyPng(images.zeroFilled, { max: white }),
        [resultImageNames.reference]: await greyPng(images.reference, { max: white }),
        [resultImageNames.errorMap]: await greyPng(images.errorMap),
        [resultImageNames.mask]: await maskPng(outcome.sampled),
        [resultImageNames.psf]: await greyPng(diagnostics.psf, { scale: 'log' }),
      };
      const urls = Object.fromEntries(
        (Object.keys(resultImageNames) as ResultImageKey[]).map((key) => [key, resultImageUrl(id, key)]),
      ) as ReconstructionBody['images'];
      const body: ReconstructionBody = {
        id,
        metrics: {
          nrmse: finiteOrNull(outcome.metrics.nrmse),
          psnr: finiteOrNull(outcome.metrics.psnr),
          ssim: finiteOrNull(outcome.metrics.ssim),
          hfen: finiteOrNull(outcome.metrics.hfen),
        },
        acceleration: outcome.acceleration,
        acquired: outcome.acquired,
        fraction: outcome.fraction,
        timing: { reconMs: outcome.timing.reconMs },
        info: jsonSafe(outcome.info) as Record<string, unknown>,
        notes: outcome.notes,
        sampling: sampledSummary(outcome.sampled),
        psf: psfSummary(diagnostics),
        images: urls,
        createdAt: new Date().toISOString(),
      };
      // Linked to its upload, so deleting the upload deletes it; refused if the upload went meanwhile.
      const inputs = image ? [{ kind: 'image' as const, id: image.id }] : [];
      if (!store.putResult(id, 'reconstruction', body, pngs, { owner, inputs }))
        throw unknownImage(image!.id);
      return reply.code(201).header('location', `/v1/reconstructions/${id}`).send(body);
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
      const stored = store.getResult(request.params.id, tenancy(request).scope);
      if (stored?.kind !== 'reconstruction') {
        throw new HttpProblem(404, `no reconstruction ${request.params.id}`, [
          { field: 'id', message: 'unknown id' },
        ]);
      }
      return stored.body as ReconstructionBody;
    },
  );
}
