import { z } from 'zod';
import {
  resolveSampling,
  type SampledMask,
  type SamplingSpec,
  samplingSchema,
} from '../../sampling/index.ts';
import {
  acquire,
  checkedSnr,
  type FullAcquisition,
  fullKspaceFromImage,
  fullKspaceFromPhantom,
  type NoiseSpec,
  noiseSchema,
} from '../acquisition/index.ts';
import { type ComplexImage, magnitude } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { matrixSchemaFor } from '../core/matrix.ts';
import type { RealImage } from '../core/real-image.ts';
import { parseOrThrow } from '../core/zod-problems.ts';
import { type LesionsRequest, lesionsSchema } from '../fidelity/index.ts';
import { type MetricSet, SSIM_RADIUS, scoreAll } from '../metrics/index.ts';
import { getPhantom } from '../phantoms/index.ts';
import { type MethodSpec, methodSchemaFor, reconstruct, zeroFilledImage } from '../recon/index.ts';
import { type FidelityOutcome, runLesionFidelity } from './lesion-run.ts';
import { resampleBilinear } from './resample.ts';

export const sourceSchema = z.union([
  z.strictObject({
    phantom: z.string().min(1).max(100).describe('analytic phantom name (GET /v1/phantoms)'),
    kspace: z
      .enum(['analytic', 'raster'])
      .optional()
      .describe(
        "'analytic' (default): exact transform at the grid points; 'raster': DFT of the raster (inverse crime)",
      ),
  }),
  z.strictObject({
    imageId: z.string().min(1).max(200).describe('id of an uploaded image (POST /v1/images)'),
  }),
]);
export type SourceSpec = z.infer<typeof sourceSchema>;

export interface ReconstructionRequest {
  source: SourceSpec;
  matrix: { nx: number; ny: number };
  sampling: SamplingSpec;
  noise?: NoiseSpec;
  method: MethodSpec;
  lesions?: LesionsRequest;
}

export interface ReconstructionOutcome {
  acceleration: { requested: number | null; actual: number };
  acquired: SampledMask['acquired'];
  fraction: number;
  /** |reconstruction| against |reference| (fully sampled, noiseless). */
  metrics: MetricSet;
  timing: { reconMs: number };
  info: Record<string, unknown>;
  notes: string[];
  images: { reconstruction: RealImage; zeroFilled: RealImage; reference: RealImage; errorMap: RealImage };
  sampled: SampledMask;
  /** Feature-fidelity scores when the request has `lesions` (src/pipeline/lesion-run.ts). */
  fidelity?: FidelityOutcome;
}

export interface PipelineContext {
  loadImage?: (id: string) => Promise<RealImage>;
  signal?: AbortSignal;
  limits?: Limits;
}

/**
 * The noise seed is derived from the request seed by a fixed integer hash, so the noise stream is
 * not the mask generator's stream (both use SeededRandom) yet stays reproducible.
 */
export function noiseSeedFor(seed: number): number {
  let h = Math.imul((seed >>> 0) ^ 0x6a09e667, 0x85ebca6b) >>> 0;
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35) >>> 0;
  return (h ^ (h >>> 16)) >>> 0;
}

/**
 * Phantom acquisitions are deterministic in (phantom, nx, ny, mode) and the analytic k-space costs
 * far more than one cheap reconstruction, so the last few are kept (per thread) for the cells of a
 * plan. Entries are shared read-only: acquire() copies k-space before adding noise.
 */
const PHANTOM_CACHE_SIZE = 4;
const phantomCache = new Map<string, FullAcquisition>();

function cachedPhantomAcquisition(
  name: string,
  nx: number,
  ny: number,
  mode: 'analytic' | 'raster',
): FullAcquisition {
  const key = `${name}|${nx}|${ny}|${mode}`;
  const hit = phantomCache.get(key);
  if (hit) {
    phantomCache.delete(key);
    phantomCache.set(key, hit);
    return hit;
  }
  const full = fullKspaceFromPhantom(getPhantom(name), nx, ny, mode);
  phantomCache.set(key, full);
  if (phantomCache.size > PHANTOM_CACHE_SIZE) phantomCache.delete(phantomCache.keys().next().value as string);
  return full;
}

async function fullAcquisition(
  source: SourceSpec,
  nx: number,
  ny: number,
  ctx: PipelineContext,
  notes: string[],
): Promise<FullAcquisition> {
  if ('phantom' in source) {
    const mode = source.kspace ?? 'analytic';
    const full = cachedPhantomAcquisition(source.phantom, nx, ny, mode);
    if (full.inverseCrime) {
      notes.push('k-space is the DFT of the phantom raster (inverse crime): errors are optimistic');
    }
    return full;
  }
  if (!('imageId' in source) || typeof source.imageId !== 'string') {
    throw new ValidationError({
      field: 'source',
      message: 'needs a phantom or an imageId',
      allowed: 'phantom | imageId',
    });
  }
  if (!ctx.loadImage) {
    throw new ValidationError({ field: 'source.imageId', message: 'uploaded images are not available here' });
  }
  const loaded = await ctx.loadImage(source.imageId);
  let image = loaded;
  if (loaded.nx !== nx || loaded.ny !== ny) {
    image = resampleBilinear(loaded, nx, ny);
    notes.push(`uploaded image resampled from ${loaded.ny}×${loaded.nx} to ${ny}×${nx} (bilinear)`);
  }
  notes.push(
    'uploaded image: k-space is the DFT of the same pixels the reconstruction inverts (inverse crime)',
  );
  return fullKspaceFromImage(image);
}

function magnitudeImage(image: ComplexImage): RealImage {
  return { nx: image.nx, ny: image.ny, data: magnitude(image) };
}

/** Smallest side that can be scored: SSIM needs one whole 11×11 window (Wang et al. 2004). */
export const MIN_SCORED_SIDE = 2 * SSIM_RADIUS + 1;

/**
 * The matrix of a scored request (reconstructions, plans): sides from MIN_SCORED_SIDE, the one lower
 * bound, to the configured limit, the one upper bound.
 */
export function scoredMatrixSchemaFor(limits: Limits) {
  return matrixSchemaFor(
    limits,
    MIN_SCORED_SIDE,
    `SSIM needs an ${MIN_SCORED_SIDE}×${MIN_SCORED_SIDE} window to score`,
  );
}

/**
 * A reconstruction request checked as the HTTP schema checks it, for callers outside HTTP (scripts,
 * tests): the same schemas, so the same field problems and limits.
 */
export function parseReconstructionRequest(
  input: unknown,
  limits: Limits = defaultLimits,
): ReconstructionRequest {
  return parseOrThrow(reconstructionRequestSchemaFor(limits), input, '');
}

export function reconstructionRequestSchemaFor(limits: Limits) {
  return z.strictObject({
    source: sourceSchema,
    matrix: scoredMatrixSchemaFor(limits),
    sampling: samplingSchema,
    noise: noiseSchema.optional().describe('complex Gaussian k-space noise; omitted or "none": noiseless'),
    method: methodSchemaFor(limits),
    lesions: lesionsSchema.optional(),
  });
}

/**
 * One simulated acquisition + reconstruction + scoring (docs/design.md §2.1):
 * source → full k-space and reference; sampling → mask; y = M ⊙ (y_full + noise); x̂ = recon(y);
 * metrics of |x̂| against |reference|. `seed` (when given) replaces sampling.seed and seeds the
 * noise (noise seed = noiseSeedFor(seed ?? sampling.seed ?? 0)).
 * Error map: the absolute difference of magnitudes, | |x̂| − |reference| | (non-negative, for display).
 */
export async function runReconstruction(
  req: ReconstructionRequest,
  seed: number | undefined,
  ctx: PipelineContext = {},
): Promise<ReconstructionOutcome> {
  const limits = ctx.limits ?? defaultLimits;
  // The request was checked once at the edge (reconstructionRequestSchemaFor): trusted here.
  const { nx, ny } = req.matrix;
  const notes: string[] = [];
  const full = await fullAcquisition(req.source, nx, ny, ctx, notes);
  const sampling =
    seed !== undefined && req.sampling.pattern !== 'custom'
      ? ({ ...req.sampling, seed } as SamplingSpec)
      : req.sampling;
  const sampled = await resolveSampling({ nx, ny }, sampling, limits);
  const baseSeed = seed ?? sampled.seed ?? 0;
  const noiseSeed = noiseSeedFor(baseSeed);
  const { kspace, sigma } = acquire(full, sampled.mask, req.noise, noiseSeed);
  if (sigma > 0) notes.push(`complex Gaussian noise, σ = ${sigma.toPrecision(4)} per real channel`);
  const input = { kspace, mask: sampled.mask, density: sampled.density };

  const started = performance.now();
  const result = reconstruct(input, req.method, { signal: ctx.signal, limits });
  const reconMs = performance.now() - started;
  if (result.info.note) notes.push(String(result.info.note));

  const reconstruction = magnitudeImage(result.image);
  const zeroFilled =
    req.method.name === 'zero-filled' && !req.method.densityCompensation
      ? reconstruction
      : magnitudeImage(zeroFilledImage(input).image);
  const reference = magnitudeImage(full.reference);
  const errorMap = new Float64Array(nx * ny);
  for (let i = 0; i < errorMap.length; i++)
    errorMap[i] = Math.abs(reconstruction.data[i] - reference.data[i]);

  const fidelity = req.lesions
    ? runLesionFidelity({
        lesions: req.lesions,
        full,
        kind: 'phantom' in req.source && !full.inverseCrime ? 'analytic' : 'raster',
        sampled,
        acquired: kspace,
        image: result.image,
        method: req.method,
        info: result.info,
        sigma,
        snr: checkedSnr(req.noise),
        noiseSeed,
        signal: ctx.signal,
        limits,
      })
    : undefined;
  if (fidelity) notes.push(...fidelity.notes);

  return {
    acceleration: sampled.acceleration,
    acquired: sampled.acquired,
    fraction: sampled.fraction,
    metrics: scoreAll(reconstruction, reference),
    timing: { reconMs },
    info: result.info,
    notes,
    images: { reconstruction, zeroFilled, reference, errorMap: { nx, ny, data: errorMap } },
    sampled,
    ...(fidelity ? { fidelity } : {}),
  };
}
