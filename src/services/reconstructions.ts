import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { MaskDiagnostics } from '../../sampling/index.ts';
import type { Limits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import type { Store } from '../jobs/store.ts';
import type { UploadedPixels } from '../jobs/tasks.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import type { ReconstructionOutcome, ReconstructionRequest } from '../pipeline/run-reconstruction.ts';
import { greyPng, maskPng } from '../render/png.ts';
import type { Caller, MissingImage } from './caller.ts';
import { describeFidelity, fidelitySchema } from './fidelity-summary.ts';
import { finiteOrNull, jsonSafe } from './json-safe.ts';
import { type ResultImageKey, resultImageNames, resultImageUrl } from './result-images.ts';
import { psfSummary, psfSummarySchema, sampledSummary, sampledSummarySchema } from './sampled-summary.ts';

const metricValue = z.number().nullable().describe('null when not finite (PSNR of an exact reconstruction)');

/** The stored, scored reconstruction (its images are stored beside it as PNGs). */
export const reconstructionSchema = z.object({
  id: z.string(),
  metrics: z
    .object({ nrmse: metricValue, psnr: metricValue, ssim: metricValue, hfen: metricValue })
    .describe('|x̂| against |reference| (fully sampled, noiseless): NRMSE, PSNR dB, SSIM, HFEN'),
  acceleration: sampledSummarySchema.shape.acceleration,
  acquired: sampledSummarySchema.shape.acquired,
  fraction: sampledSummarySchema.shape.fraction,
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
      lesions: z.string().optional().describe('the reconstruction of the data with lesions (lesions only)'),
    })
    .describe('PNG URLs (GET /v1/results/{id}/{image}.png)'),
  fidelity: fidelitySchema.optional(),
  createdAt: z.string(),
});

/** The pipeline's request, with the seed that overrides sampling.seed and seeds the noise. */
export type SeededReconstructionRequest = ReconstructionRequest & { seed?: number };
export type Reconstruction = z.infer<typeof reconstructionSchema>;

function maxOf(image: RealImage): number {
  let max = 0;
  for (const v of image.data) if (v > max) max = v;
  return max;
}

/** Runs reconstructions on the worker pool, renders their images and stores them for the caller. */
export class ReconstructionService {
  constructor(private readonly deps: { pool: WorkerPool; store: Store; limits: Limits }) {}

  /**
   * Reconstructs, scores and stores one request. `signal` (the client leaving) ends the worker thread.
   * An upload the request names must be the caller's and must still exist when the result is stored.
   */
  async create(
    request: SeededReconstructionRequest,
    caller: Caller,
    signal?: AbortSignal,
  ): Promise<Reconstruction | MissingImage> {
    const { pool, store, limits } = this.deps;
    const { seed, ...pipelineRequest } = request;
    let image: UploadedPixels | undefined;
    if ('imageId' in pipelineRequest.source) {
      const id = pipelineRequest.source.imageId;
      const pixels = store.getImagePixels(id, caller.scope);
      if (!pixels) return { missingImage: id };
      image = { id, image: pixels };
    }
    const { outcome, diagnostics } = await pool.runForRequest(
      'reconstruction',
      {
        request: pipelineRequest,
        ...(seed === undefined ? {} : { seed }),
        ...(image ? { image } : {}),
        limits,
      },
      signal,
    );
    const id = randomUUID();
    const pngs = await renderImages(outcome, diagnostics);
    const body = describe(id, outcome, diagnostics);
    // Linked to its upload, so deleting the upload deletes it; refused if the upload went meanwhile.
    const inputs = image ? [{ kind: 'image' as const, id: image.id }] : [];
    if (!store.putResult(id, 'reconstruction', body, pngs, { owner: caller.owner, inputs })) {
      return { missingImage: image!.id };
    }
    return body;
  }

  /** A stored reconstruction the caller may see. */
  get(id: string, caller: Caller): Reconstruction | undefined {
    const stored = this.deps.store.getResult(id, caller.scope);
    return stored?.kind === 'reconstruction' ? (stored.body as Reconstruction) : undefined;
  }
}

/** The six result PNGs, named as GET /v1/results/{id}/{name}.png serves them. */
async function renderImages(
  outcome: ReconstructionOutcome,
  diagnostics: MaskDiagnostics,
): Promise<Record<string, Buffer>> {
  const { images } = outcome;
  // Magnitudes share the reference's grey scale so they compare by eye; the error map uses its own.
  const white = maxOf(images.reference) || undefined;
  return {
    [resultImageNames.reconstruction]: await greyPng(images.reconstruction, { max: white }),
    [resultImageNames.zeroFilled]: await greyPng(images.zeroFilled, { max: white }),
    [resultImageNames.reference]: await greyPng(images.reference, { max: white }),
    [resultImageNames.errorMap]: await greyPng(images.errorMap),
    [resultImageNames.mask]: await maskPng(outcome.sampled),
    [resultImageNames.psf]: await greyPng(diagnostics.psf, { scale: 'log' }),
    ...(outcome.fidelity
      ? { [resultImageNames.lesions]: await greyPng(outcome.fidelity.image, { max: white }) }
      : {}),
  };
}

function describe(id: string, outcome: ReconstructionOutcome, diagnostics: MaskDiagnostics): Reconstruction {
  const keys = (Object.keys(resultImageNames) as ResultImageKey[]).filter(
    (key) => key !== 'lesions' || outcome.fidelity,
  );
  const urls = Object.fromEntries(
    keys.map((key) => [key, resultImageUrl(id, key)]),
  ) as Reconstruction['images'];
  return {
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
    ...(outcome.fidelity ? { fidelity: describeFidelity(outcome.fidelity) } : {}),
    createdAt: new Date().toISOString(),
  };
}
