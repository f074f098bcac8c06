import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { MaskDiagnostics } from '../../sampling/index.ts';
import type { Limits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import type { InputRef, Store } from '../jobs/store.ts';
import type { ScoredOutcome, UploadedPixels } from '../jobs/tasks.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import type { MetricSet } from '../metrics/index.ts';
import { gFactorSummarySchema } from '../pipeline/coil-g-factor.ts';
import type { ReconstructionOutcome, ReconstructionRequest } from '../pipeline/run-reconstruction.ts';
import { coilMagnitudeMontage, G_FACTOR_WHITE } from '../render/coil-montage.ts';
import { greyPng, maskPng } from '../render/png.ts';
import { acquisitionUrls, storedAcquisition } from './acquisition-export.ts';
import type { Caller, MissingImage } from './caller.ts';
import { coilMapInputs, coilMapRefs, loadNamedCoilMaps } from './coil-map-refs.ts';
import { coilMapsNotFound } from './coil-maps.ts';
import { describeFidelity, fidelitySchema } from './fidelity-summary.ts';
import { finiteOrNull, jsonSafe } from './json-safe.ts';
import { rawIdOf, rawNotFound, readRawKspace } from './raw-data.ts';
import { resultArrays } from './result-arrays.ts';
import { type ResultImageKey, resultImageNames, resultImageUrl } from './result-images.ts';
import { psfSummary, psfSummarySchema, sampledSummary, sampledSummarySchema } from './sampled-summary.ts';
import { uploadedVolume } from './uploaded-volume.ts';
import { volumeOnPool } from './volume-runs.ts';
import { volumeSummary, volumeSummarySchema } from './volume-summary.ts';

const metricValue = z.number().nullable().describe('null when not finite (PSNR of an exact reconstruction)');
const metricSetSchema = z.object({
  nrmse: metricValue,
  psnr: metricValue,
  ssim: metricValue,
  hfen: metricValue,
});

/** The stored, scored reconstruction (its images are stored beside it as PNGs). */
export const reconstructionSchema = z.object({
  id: z.string(),
  metrics: metricSetSchema.describe(
    '|x̂| against |reference| (fully sampled, noiseless): NRMSE, PSNR dB, SSIM, HFEN',
  ),
  zeroFilledMetrics: metricSetSchema
    .optional()
    .describe(
      'the same four scores of the zero-filled image (inverse DFT of the acquired samples, unsampled ' +
        'points zero) against the same reference; equal to metrics when the method is zero-filled. ' +
        'Absent from results stored before it was added.',
    ),
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
      coilMaps: z.string().optional().describe('montage of |S_c|, one tile per coil (receive arrays only)'),
      gFactor: z
        .string()
        .optional()
        .describe(
          `g-factor map, linear grey from 0 (black) to g = ${G_FACTOR_WHITE} (white); where a g-factor applies`,
        ),
      lesions: z.string().optional().describe('the reconstruction of the data with lesions (lesions only)'),
    })
    .describe('PNG URLs (GET /v1/results/{id}/{image}.png)'),
  coils: z
    .object({
      array: z.enum(['uniform', 'loops', 'gaussian', 'maps']),
      count: z.int(),
      label: z.string().describe('"8 loops", "maps <id>"'),
      fitError: z
        .number()
        .optional()
        .describe(
          "phantoms: largest relative ℓ2 error over the object between a coil's map and its trigonometric fit (the simulation's truth)",
        ),
    })
    .optional()
    .describe('the receive array, when it is not the uniform single coil'),
  gFactor: gFactorSummarySchema
    .extend({
      replicas: z
        .int()
        .nullable()
        .describe('noise replicas of a pseudo-replica estimate; null when analytic'),
    })
    .optional()
    .describe(
      'noise amplification g over the object, where it applies (analytic: SENSE on a uniform lattice)',
    ),
  snrRetained: z
    .object({ mean: z.number(), min: z.number() })
    .optional()
    .describe('1/(g·√R) over the object: the SNR kept against the fully sampled scan (beside gFactor)'),
  fidelity: fidelitySchema.optional(),
  acquisition: z
    .object({ nifti: z.string(), json: z.string() })
    .optional()
    .describe(
      'the acquired data the method was given, for your own pipeline: complex64 NIfTI and its JSON header ' +
        '(absent from results stored before acquisitions were kept)',
    ),
  volume: volumeSummarySchema.optional(),
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
      const volume = (pipelineRequest.matrix.nz ?? 1) > 1 ? uploadedVolume(store, id, caller) : undefined;
      image = { id, image: pixels, ...(volume ? { volume } : {}) };
    }
    const mapRefs = coilMapRefs(pipelineRequest);
    const coilMaps = loadNamedCoilMaps(store, mapRefs, caller);
    const rawId = rawIdOf(pipelineRequest);
    const raw = rawId === undefined ? undefined : { id: rawId, raw: readRawKspace(store, rawId, caller) };
    // Volumes (an uploaded volume or 3D raw data) spread their planes over the pool.
    const volumeRequest =
      image?.volume !== undefined || (raw !== undefined && (pipelineRequest.matrix.nz ?? 1) > 1);
    const scored = volumeRequest
      ? await volumeOnPool(
          pool,
          {
            request: pipelineRequest,
            ...(seed === undefined ? {} : { seed }),
            ...(image ? { image } : {}),
            ...(raw ? { raw } : {}),
            limits,
          },
          signal,
        )
      : await pool.runForRequest(
          'reconstruction',
          {
            request: pipelineRequest,
            ...(seed === undefined ? {} : { seed }),
            ...(image ? { image } : {}),
            ...(coilMaps.length > 0 ? { coilMaps } : {}),
            ...(raw ? { raw } : {}),
            limits,
          },
          signal,
        );
    // Linked to its upload, so deleting the upload deletes it; refused if the upload went meanwhile.
    const inputs = [
      ...(image ? [{ kind: 'image' as const, id: image.id }] : []),
      ...(raw ? [{ kind: 'raw' as const, id: raw.id }] : []),
      ...coilMapInputs(mapRefs),
    ];
    const body = await this.keep(scored, { owner: caller.owner, inputs });
    if (body) return body;
    if (raw && !store.inputExists({ kind: 'raw', id: raw.id })) throw rawNotFound(raw.id);
    const goneMaps = mapRefs.find((ref) => !store.inputExists({ kind: 'coilMaps', id: ref.id }));
    if (goneMaps) throw coilMapsNotFound(goneMaps.id, goneMaps.field);
    return { missingImage: image!.id };
  }

  /**
   * Stores a plan row's representative outcome (its seed-1 cell) as a reconstruction owned like the
   * plan, linked to the plan's inputs and to the plan itself (purging the plan deletes it).
   */
  async keepPlanRow(planId: string, scored: ScoredOutcome): Promise<string | undefined> {
    const provenance = this.deps.store.planProvenance(planId);
    if (!provenance) return undefined;
    return (await this.keep(scored, { ...provenance, planId }))?.id;
  }

  /** Renders and stores a scored outcome; undefined when an input or the plan went meanwhile. */
  private async keep(
    scored: ScoredOutcome,
    provenance: { owner: string | null; inputs: InputRef[]; planId?: string },
  ): Promise<Reconstruction | undefined> {
    const id = randomUUID();
    const pngs = await renderImages(scored.outcome, scored.diagnostics);
    const body = describe(id, scored);
    const arrays = resultArrays(scored.outcome);
    const acquisition = storedAcquisition(scored.outcome);
    return this.deps.store.putResult(id, 'reconstruction', body, pngs, provenance, arrays, acquisition)
      ? body
      : undefined;
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
    ...(images.coilMaps
      ? { [resultImageNames.coilMaps]: await greyPng(coilMagnitudeMontage(images.coilMaps)) }
      : {}),
    ...(images.gFactor
      ? { [resultImageNames.gFactor]: await greyPng(images.gFactor, { max: G_FACTOR_WHITE }) }
      : {}),
    ...(outcome.fidelity
      ? { [resultImageNames.lesions]: await greyPng(outcome.fidelity.image, { max: white }) }
      : {}),
  };
}

function scoresOf(metrics: MetricSet): Reconstruction['metrics'] {
  return {
    nrmse: finiteOrNull(metrics.nrmse),
    psnr: finiteOrNull(metrics.psnr),
    ssim: finiteOrNull(metrics.ssim),
    hfen: finiteOrNull(metrics.hfen),
  };
}

function describe(id: string, { outcome, diagnostics, zeroFilledMetrics }: ScoredOutcome): Reconstruction {
  const shown = (key: ResultImageKey) =>
    key === 'coilMaps'
      ? outcome.images.coilMaps !== undefined
      : key === 'gFactor'
        ? outcome.images.gFactor !== undefined
        : key === 'lesions'
          ? outcome.fidelity !== undefined
          : true;
  const urls = Object.fromEntries(
    (Object.keys(resultImageNames) as ResultImageKey[])
      .filter(shown)
      .map((key) => [key, resultImageUrl(id, key)]),
  ) as Reconstruction['images'];
  return {
    id,
    metrics: scoresOf(outcome.metrics),
    zeroFilledMetrics: scoresOf(zeroFilledMetrics),
    acceleration: outcome.acceleration,
    acquired: outcome.acquired,
    fraction: outcome.fraction,
    timing: { reconMs: outcome.timing.reconMs },
    info: jsonSafe(outcome.info) as Record<string, unknown>,
    notes: outcome.notes,
    sampling: sampledSummary(outcome.sampled),
    psf: psfSummary(diagnostics),
    images: urls,
    ...(outcome.coils ? { coils: outcome.coils } : {}),
    ...(outcome.gFactor ? { gFactor: outcome.gFactor } : {}),
    ...(outcome.snrRetained ? { snrRetained: outcome.snrRetained } : {}),
    ...(outcome.fidelity ? { fidelity: describeFidelity(outcome.fidelity) } : {}),
    ...(outcome.acquisition ? { acquisition: acquisitionUrls(id) } : {}),
    ...(outcome.volume ? { volume: volumeSummary(outcome.volume) } : {}),
    createdAt: new Date().toISOString(),
  };
}
