import { z } from 'zod';
import {
  resolveSampling,
  type SampledMask,
  type SamplingSpec,
  samplingSchema,
} from '../../sampling/index.ts';
import type { Trajectory } from '../../sampling/trajectories/trajectory.ts';
import {
  acquire,
  acquireCoils,
  acquireTrajectory,
  acquireTrajectoryCoils,
  type CoilSimulation,
  checkedSnr,
  type FullAcquisition,
  fullKspaceFromImage,
  fullKspaceFromPhantom,
  type NoiseSpec,
  noiseSchema,
  type RawKspace,
} from '../acquisition/index.ts';
import { fft2c } from '../core/centered-fft.ts';
import { type ComplexImage, magnitude } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { matrixSchemaFor } from '../core/matrix.ts';
import type { RealImage } from '../core/real-image.ts';
import type { RealVolume } from '../core/real-volume.ts';
import { RecentCache } from '../core/recent-cache.ts';
import { parseOrThrow } from '../core/zod-problems.ts';
import { type CoilMaps, type MultiCoilKspace, transformPlaneInPlace } from '../encoding/index.ts';
import { type LesionsRequest, lesionsSchema } from '../fidelity/index.ts';
import { type MetricSet, SSIM_RADIUS, scoreAll } from '../metrics/index.ts';
import { densityWeightsFor, nufftPlanFor } from '../nufft/index.ts';
import { getPhantom } from '../phantoms/index.ts';
import { griddedCoilImages, griddingImage } from '../recon/gridding-recon.ts';
import {
  type CoilData,
  combineCoilImages,
  type MethodSpec,
  methodSchemaFor,
  partialFourierStep,
  type ReconInput,
  reconstruct,
  type TrajectoryData,
  zeroFilledCoilCombination,
  zeroFilledImage,
} from '../recon/index.ts';
import { type VolumeAcquisitionMode, volumeAcquisitionSchema } from '../volume/volume-schema.ts';
import { type AcquiredData, type AcquiredNoise, acquiredDataOf } from './acquired-data.ts';
import {
  arrayModel,
  imageCoilSimulation,
  phantomCoilSimulation,
  phasedSingleCoil,
} from './coil-acquisition.ts';
import {
  type GFactorResult,
  reconstructionGFactor,
  trajectoryReconstructionGFactor,
} from './coil-g-factor.ts';
import {
  type CoilsSpec,
  coilsLabel,
  coilsSchema,
  type GFactorRequestSpec,
  gFactorRequestSchema,
  type PhaseSpec,
  phaseSchema,
} from './coil-request.ts';
import { loadFromContext } from './context-loader.ts';
import { type FidelityOutcome, runLesionFidelity } from './lesion-run.ts';
import { rawAcquisition, rawCoilInput, rawNoise } from './raw-acquisition.ts';
import { resampleBilinear } from './resample.ts';
import { runVolumeReconstruction, type VolumeOutcome } from './volume-reconstruction.ts';

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
  z.strictObject({
    rawId: z
      .string()
      .min(1)
      .max(200)
      .describe(
        'id of imported raw k-space (POST /v1/raw): its fully sampled coil k-space is the data; the matrix must be ' +
          'its own (a 3D acquisition: matrix.nz its partitions, a volume acquired in 3D)',
      ),
  }),
]);
export type SourceSpec = z.infer<typeof sourceSchema>;

export interface ReconstructionRequest {
  source: SourceSpec;
  /** nz > 1: a volume (src/pipeline/volume-reconstruction.ts). */
  matrix: { nx: number; ny: number; nz?: number };
  /** How a volume is acquired; volumes only (default '3d'). */
  acquisition?: VolumeAcquisitionMode;
  sampling: SamplingSpec;
  noise?: NoiseSpec;
  method: MethodSpec;
  /** The receive array; absent or `uniform`: today's single coil. */
  coils?: CoilsSpec;
  /** A smooth object phase (the object becomes complex). */
  phase?: PhaseSpec;
  /** Ask for a pseudo-replica g-factor where no closed form applies. */
  gFactor?: GFactorRequestSpec;
  /** Lesions inserted for a feature-fidelity study (single coil, Cartesian). */
  lesions?: LesionsRequest;
}

/** The receive array as a response echoes it. */
export interface CoilsEcho {
  array: 'uniform' | 'loops' | 'gaussian' | 'maps';
  count: number;
  label: string;
  /** Phantoms: the trigonometric fit's largest relative error over the object (see coil-acquisition.ts). */
  fitError?: number;
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
  images: {
    reconstruction: RealImage;
    zeroFilled: RealImage;
    reference: RealImage;
    errorMap: RealImage;
    /** |S_c| of every coil (the maps the simulation used), for the coil-maps montage. */
    coilMaps?: CoilMaps;
    /** The g-factor map, where a g-factor is reported. */
    gFactor?: RealImage;
  };
  sampled: SampledMask;
  /** Present for a receive array other than the uniform single coil. */
  coils?: CoilsEcho;
  /** Where one applies (reconstructionGFactor): over the object; the map is in images.gFactor. */
  gFactor?: Omit<GFactorResult, 'map' | 'snrRetained'>;
  /** 1/(g·√R) over the object, beside gFactor. */
  snrRetained?: GFactorResult['snrRetained'];
  /** Feature-fidelity scores when the request has `lesions` (src/pipeline/lesion-run.ts). */
  fidelity?: FidelityOutcome;
  /**
   * The samples the method was given, kept with the result for export (acquired-data.ts); for a
   * 3D volume the 3D k-space lines, one exact inverse readout transform from the planes' input.
   */
  acquisition?: AcquiredData;
  /** Volumes (matrix.nz > 1): per-plane scores and the volumes; `metrics` are then the volume's. */
  volume?: VolumeOutcome;
}

export interface PipelineContext {
  loadImage?: (id: string) => Promise<RealImage>;
  /** An uploaded volume (NIfTI uploaded with slices=all) by id, for matrix.nz > 1. */
  loadVolume?: (id: string) => Promise<RealVolume>;
  /** Uploaded sensitivity maps by id (POST /v1/coil-maps), for `coils: { mapsId }`. */
  loadCoilMaps?: (id: string) => Promise<CoilMaps>;
  /** Imported raw k-space by id (POST /v1/raw), for `source: { rawId }`. */
  loadRaw?: (id: string) => Promise<RawKspace>;
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
const phantomCache = new RecentCache<FullAcquisition>(4);

function cachedPhantomAcquisition(
  name: string,
  nx: number,
  ny: number,
  mode: 'analytic' | 'raster',
): FullAcquisition {
  return phantomCache.get(`${name}|${nx}|${ny}|${mode}`, () =>
    fullKspaceFromPhantom(getPhantom(name), nx, ny, mode),
  );
}

/**
 * Multi-coil phantom simulations (maps, their fit and the coil k-space) cost far more than one
 * reconstruction, so the last two are kept per thread like the phantom acquisitions. Entries are
 * shared read-only: acquireCoils copies k-space and maps before adding noise and prewhitening.
 */
const coilCache = new RecentCache<CoilSimulation>(2);

/** The simulation of a receive array (not `uniform`): phantoms through the fit, uploads through F(S_c·x). */
async function coilSimulation(
  source: SourceSpec,
  coils: Exclude<CoilsSpec, { array: 'uniform' }>,
  phase: PhaseSpec | undefined,
  nx: number,
  ny: number,
  ctx: PipelineContext,
  notes: string[],
): Promise<CoilSimulation> {
  let uploadedMaps: CoilMaps | undefined;
  if ('mapsId' in coils) {
    uploadedMaps = await loadFromContext(ctx.loadCoilMaps, coils.mapsId, {
      field: 'coils.mapsId',
      message: 'uploaded coil maps are not available here',
      allowed: 'an array: { array: "uniform" | "loops" | "gaussian", … }',
    });
  }
  const build = (image?: RealImage): CoilSimulation => {
    const model = arrayModel(coils, nx, ny, uploadedMaps);
    if (image) return imageCoilSimulation(image, model.maps, model.noise, phase);
    if (!('phantom' in source)) throw new RangeError('a phantom source is needed here');
    return phantomCoilSimulation({
      phantom: getPhantom(source.phantom),
      nx,
      ny,
      mode: source.kspace ?? 'analytic',
      ...model,
      ...(phase ? { phase } : {}),
    });
  };
  if ('phantom' in source) {
    const mode = source.kspace ?? 'analytic';
    const simulation =
      uploadedMaps === undefined
        ? coilCache.get(JSON.stringify([source.phantom, nx, ny, mode, coils, phase ?? null]), () => build())
        : build();
    if (simulation.inverseCrime) {
      notes.push('k-space is the DFT of the phantom raster (inverse crime): errors are optimistic');
    }
    if (simulation.fitError !== undefined) {
      notes.push(
        `coil k-space is exact for the trigonometric fit of each coil's sensitivity (Guerquin-Kern et al. 2012); ` +
          `the fit differs from the ${uploadedMaps ? 'uploaded' : 'Biot–Savart or Gaussian'} maps by at most ` +
          `${(100 * simulation.fitError).toPrecision(3)} % (relative ℓ2 over the object, worst coil)`,
      );
    }
    return simulation;
  }
  const image = await uploadedImage(source, nx, ny, ctx, notes);
  return build(image);
}

async function fullAcquisition(
  source: SourceSpec,
  nx: number,
  ny: number,
  ctx: PipelineContext,
  notes: string[],
  phase?: PhaseSpec,
): Promise<FullAcquisition> {
  if ('phantom' in source) {
    const mode = source.kspace ?? 'analytic';
    const full = phase
      ? phasedSingleCoil({ phantom: getPhantom(source.phantom), mode }, nx, ny, phase)
      : cachedPhantomAcquisition(source.phantom, nx, ny, mode);
    if (full.inverseCrime) {
      notes.push('k-space is the DFT of the phantom raster (inverse crime): errors are optimistic');
    }
    return full;
  }
  const image = await uploadedImage(source, nx, ny, ctx, notes);
  return phase ? phasedSingleCoil({ image }, nx, ny, phase) : fullKspaceFromImage(image);
}

/** The uploaded image of `source`, resampled to the matrix when it differs. */
async function uploadedImage(
  source: SourceSpec,
  nx: number,
  ny: number,
  ctx: PipelineContext,
  notes: string[],
): Promise<RealImage> {
  if (!('imageId' in source) || typeof source.imageId !== 'string') {
    throw new ValidationError({
      field: 'source',
      message: 'needs a phantom or an imageId',
      allowed: 'phantom | imageId',
    });
  }
  const loaded = await loadFromContext(ctx.loadImage, source.imageId, {
    field: 'source.imageId',
    message: 'uploaded images are not available here',
  });
  let image = loaded;
  if (loaded.nx !== nx || loaded.ny !== ny) {
    image = resampleBilinear(loaded, nx, ny);
    notes.push(`uploaded image resampled from ${loaded.ny}×${loaded.nx} to ${ny}×${nx} (bilinear)`);
  }
  notes.push(
    'uploaded image: k-space is the DFT of the same pixels the reconstruction inverts (inverse crime)',
  );
  return image;
}

function cartesianInput(
  full: FullAcquisition,
  sampled: SampledMask,
  noise: NoiseSpec | undefined,
  noiseSeed: number,
): { input: ReconInput; sigma: number } {
  const { kspace, sigma } = acquire(full, sampled.mask, noise, noiseSeed);
  return { input: { kspace, mask: sampled.mask, density: sampled.density }, sigma };
}

/**
 * A non-Cartesian acquisition (docs/design.md §2.1): samples at the exact trajectory points, its
 * NUFFT plan (cached per trajectory) and density compensation; `kspace` holds the gridded data.
 */
function trajectoryInput(
  full: FullAcquisition,
  sampled: SampledMask,
  noise: NoiseSpec | undefined,
  noiseSeed: number,
  notes: string[],
): { input: ReconInput; sigma: number; gridded: ComplexImage } {
  const trajectory = sampled.trajectory as Trajectory;
  const plan = nufftPlanFor(trajectory, sampled.nx, sampled.ny);
  const { samples, sigma, inverseCrime } = acquireTrajectory(full, trajectory, plan, noise, noiseSeed);
  if (inverseCrime) {
    notes.push(
      'non-Cartesian samples are the NUFFT of the same pixels the reconstruction inverts (inverse crime)',
    );
  }
  const { weights, weighting } = densityWeightsFor(trajectory, sampled.nx, sampled.ny);
  const data: TrajectoryData = { trajectory, plan, samples: { coils: 1, data: samples }, weights, weighting };
  const gridded = griddingImage(data).image;
  return { input: { kspace: fft2c(gridded), mask: sampled.mask, trajectory: data }, sigma, gridded };
}

/**
 * A receive-array acquisition on a non-Cartesian trajectory (docs/design.md §3.8): every coil's
 * samples at the exact trajectory points (acquireTrajectoryCoils), prewhitened with the maps; each
 * coil gridded, the coil images combined as on the grid (sensitivity-weighted with the maps).
 * `coils.kspace` holds the gridded coil k-space (for scales and map calibration), `kspace` the
 * combined image's.
 */
function trajectoryCoilInput(
  simulation: CoilSimulation,
  sampled: SampledMask,
  noise: NoiseSpec | undefined,
  noiseSeed: number,
  notes: string[],
): { input: ReconInput; sigma: number; coilSigma: number; prewhitened: boolean; gridded: ComplexImage } {
  const trajectory = sampled.trajectory as Trajectory;
  const { nx, ny } = sampled;
  const plan = nufftPlanFor(trajectory, nx, ny);
  const acquired = acquireTrajectoryCoils(simulation, trajectory, plan, noise, noiseSeed);
  if (acquired.inverseCrime) {
    notes.push(
      'non-Cartesian coil samples are the NUFFT of S_c times the same pixels the reconstruction inverts (inverse crime)',
    );
  }
  if (acquired.sigma > 0) {
    notes.push(
      `complex Gaussian noise: σ = ${acquired.sigma.toPrecision(4)} per real channel in the optimally combined ` +
        `fully sampled image, σ = ${acquired.coilSigma.toPrecision(4)} per coil and sample before prewhitening`,
    );
  }
  const { weights, weighting } = densityWeightsFor(trajectory, nx, ny);
  const data: TrajectoryData = { trajectory, plan, samples: acquired.samples, weights, weighting };
  const images = griddedCoilImages(data);
  const gridded = combineCoilImages(images, acquired.maps).image;
  const kspace = { ...images, data: images.data.slice() };
  for (let c = 0; c < kspace.coils; c++) transformPlaneInPlace(kspace.data, c * nx * ny, nx, ny, -1);
  return {
    input: {
      kspace: fft2c(gridded),
      mask: sampled.mask,
      coils: { kspace, maps: acquired.maps },
      trajectory: data,
    },
    sigma: acquired.sigma,
    coilSigma: acquired.coilSigma,
    prewhitened: acquired.prewhitened,
    gridded,
  };
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
    true,
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
    coils: coilsSchema.optional(),
    phase: phaseSchema.optional(),
    gFactor: gFactorRequestSchema.optional(),
    lesions: lesionsSchema.optional(),
    acquisition: volumeAcquisitionSchema.optional(),
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
  if ((req.matrix.nz ?? 1) > 1) return runVolumeReconstruction(req, seed, ctx, noiseSeedFor);
  if (req.acquisition !== undefined) {
    throw new ValidationError({
      field: 'acquisition',
      message: 'the acquisition mode applies to volumes only',
      allowed: 'matrix.nz > 1 with acquisition, or no acquisition',
    });
  }
  const limits = ctx.limits ?? defaultLimits;
  // The request was checked once at the edge (reconstructionRequestSchemaFor): trusted here.
  const { nx, ny } = req.matrix;
  const notes: string[] = [];
  const raw = 'rawId' in req.source ? await loadedRaw(req.source.rawId, req.phase, ctx) : undefined;
  const coils = req.coils !== undefined && !isUniform(req.coils) && !raw ? req.coils : undefined;
  const simulation = coils
    ? await coilSimulation(req.source, coils, req.phase, nx, ny, ctx, notes)
    : undefined;
  const full =
    simulation || raw ? undefined : await fullAcquisition(req.source, nx, ny, ctx, notes, req.phase);
  const sampling =
    seed !== undefined && req.sampling.pattern !== 'custom'
      ? ({ ...req.sampling, seed } as SamplingSpec)
      : req.sampling;
  const sampled = await resolveSampling({ nx, ny }, sampling, limits);
  const baseSeed = seed ?? sampled.seed ?? 0;
  let input: ReconInput;
  /** The zero-filled comparison image when the acquisition already made it (coils, trajectories). */
  let knownZeroFilled: ComplexImage | undefined;
  let referenceImage: ComplexImage;
  let objectMask: Uint8Array;
  let coilSigma = 0;
  let whitenedFull: MultiCoilKspace | undefined;
  let sigma = 0;
  let noise: Omit<AcquiredNoise, 'seed'>;
  const noiseSeed = noiseSeedFor(baseSeed);
  if (req.lesions && (simulation || raw || sampled.trajectory)) {
    throw new ValidationError({
      field: 'lesions',
      message: 'lesion studies run on single-coil Cartesian acquisitions only, for now',
      allowed: "coils: { array: 'uniform' } and a Cartesian (or rasterised) pattern with lesions",
    });
  }
  if (raw) {
    const acquired = rawAcquisition(raw, req, sampled, noiseSeed, notes);
    ({ input, zeroFilled: knownZeroFilled } = rawCoilInput(acquired.coils.kspace, sampled));
    referenceImage = acquired.reference;
    objectMask = acquired.objectMask;
    noise = rawNoise(raw, acquired.sigma);
  } else if (simulation && sampled.trajectory) {
    const acquired = trajectoryCoilInput(simulation, sampled, req.noise, noiseSeed, notes);
    coilSigma = acquired.coilSigma;
    // CN(0, 2σ_c²Ψ) times L⁻¹ is CN(0, 2σ_c²·I).
    noise = { prewhitened: acquired.prewhitened, variance: 2 * coilSigma ** 2 };
    sigma = acquired.sigma;
    input = acquired.input;
    knownZeroFilled = acquired.gridded;
    referenceImage = simulation.reference;
    objectMask = simulation.objectMask;
  } else if (simulation) {
    const acquired = acquireCoils(simulation, sampled.mask, req.noise, noiseSeed);
    if (acquired.sigma > 0) {
      notes.push(
        `complex Gaussian noise: σ = ${acquired.sigma.toPrecision(4)} per real channel in the optimally combined ` +
          `fully sampled image, σ = ${acquired.coilSigma.toPrecision(4)} per coil before prewhitening`,
      );
    }
    coilSigma = acquired.coilSigma;
    // CN(0, 2σ_c²Ψ) times L⁻¹ is CN(0, 2σ_c²·I).
    noise = { prewhitened: acquired.prewhitened, variance: 2 * coilSigma ** 2 };
    whitenedFull = acquired.full;
    sigma = acquired.sigma;
    const coilData: CoilData = { kspace: acquired.kspace, maps: acquired.maps };
    knownZeroFilled = zeroFilledCoilCombination(coilData);
    input = {
      kspace: fft2c(knownZeroFilled),
      mask: sampled.mask,
      density: sampled.density,
      coils: coilData,
      // Prewhitened coil noise: σ per real channel of every coil.
      noiseSigma: coilSigma,
    };
    referenceImage = simulation.reference;
    objectMask = simulation.objectMask;
  } else {
    const single = full as FullAcquisition;
    const acquired: { input: ReconInput; sigma: number; gridded?: ComplexImage } = sampled.trajectory
      ? trajectoryInput(single, sampled, req.noise, noiseSeed, notes)
      : cartesianInput(single, sampled, req.noise, noiseSeed);
    sigma = acquired.sigma;
    noise = { prewhitened: false, variance: 2 * sigma ** 2 };
    if (sigma > 0) notes.push(`complex Gaussian noise, σ = ${sigma.toPrecision(4)} per real channel`);
    input = { ...acquired.input, noiseSigma: sigma };
    // Non-Cartesian: the gridded image already made for `kspace` is the zero-filled comparison.
    knownZeroFilled = acquired.gridded;
    referenceImage = single.reference;
    objectMask = single.objectMask;
  }

  const started = performance.now();
  const methodOutput = reconstruct(input, req.method, { signal: ctx.signal, limits });
  const result = partialFourierStep(methodOutput, input, req.method, sampled.partialFourier, ctx.signal);
  const reconMs = performance.now() - started;
  if (result.info.note) notes.push(String(result.info.note));

  const reconstruction = magnitudeImage(result.image);
  const zeroFilled = knownZeroFilled
    ? magnitudeImage(knownZeroFilled)
    : req.method.name === 'zero-filled' &&
        !req.method.densityCompensation &&
        result.image === methodOutput.image
      ? reconstruction
      : magnitudeImage(zeroFilledImage(input).image);
  const reference = magnitudeImage(referenceImage);
  const errorMap = new Float64Array(nx * ny);
  for (let i = 0; i < errorMap.length; i++)
    errorMap[i] = Math.abs(reconstruction.data[i] - reference.data[i]);
  const gFactor =
    input.trajectory && input.coils?.maps
      ? trajectoryReconstructionGFactor({
          input: { ...input, trajectory: input.trajectory },
          method: req.method,
          baseInfo: methodOutput.info,
          sampled,
          objectMask,
          coilSigma,
          reference: referenceImage,
          seed: noiseSeedFor(baseSeed),
          options: { signal: ctx.signal, limits },
          ...(req.gFactor ? { count: req.gFactor.replicas } : {}),
        })
      : whitenedFull && input.coils?.maps
        ? reconstructionGFactor({
            method: req.method.name,
            sampled,
            maps: input.coils.maps,
            objectMask,
            replicas: {
              input,
              method: req.method,
              coilSigma,
              seed: noiseSeedFor(baseSeed),
              options: { signal: ctx.signal, limits },
              full: whitenedFull,
              baseInfo: methodOutput.info,
              reference: referenceImage,
              ...(req.gFactor ? { count: req.gFactor.replicas } : {}),
            },
          })
        : undefined;
  const coilFacts = simulation && coils ? coilsEcho(coils, simulation) : {};
  const gFactorFacts = gFactor ? gFactorEcho(gFactor, nx, ny) : { facts: {}, images: {} };

  // Lesion studies are single-coil Cartesian (refused above otherwise): `full` is then defined.
  const fidelity =
    req.lesions && full
      ? runLesionFidelity({
          lesions: req.lesions,
          full,
          kind: 'phantom' in req.source && !full.inverseCrime ? 'analytic' : 'raster',
          sampled,
          acquired: input.kspace,
          image: result.image,
          method: req.method,
          info: result.info,
          sigma,
          snr: checkedSnr(req.noise),
          noiseSeed,
          magnitudes: { without: reconstruction.data, reference: reference.data },
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
    images: {
      reconstruction,
      zeroFilled,
      reference,
      errorMap: { nx, ny, data: errorMap },
      ...(simulation ? { coilMaps: simulation.maps } : {}),
      ...gFactorFacts.images,
    },
    sampled,
    ...coilFacts,
    ...gFactorFacts.facts,
    ...(fidelity ? { fidelity } : {}),
    acquisition: acquiredDataOf(input, { ...noise, seed: noiseSeed }),
  };
}

/** The raw k-space a `rawId` source names (the service loaded it for the caller); no object phase. */
async function loadedRaw(id: string, phase: PhaseSpec | undefined, ctx: PipelineContext): Promise<RawKspace> {
  if (phase) {
    throw new ValidationError({
      field: 'phase',
      message: 'raw data carry their own phase; a simulated object phase cannot be added',
      allowed: 'no phase piece with source.rawId',
    });
  }
  return loadFromContext(ctx.loadRaw, id, {
    field: 'source.rawId',
    message: 'raw data are not available here',
  });
}

function isUniform(spec: CoilsSpec): spec is { array: 'uniform' } {
  return 'array' in spec && spec.array === 'uniform';
}

function coilsEcho(
  spec: Exclude<CoilsSpec, { array: 'uniform' }>,
  simulation: CoilSimulation,
): { coils: CoilsEcho } {
  return {
    coils: {
      array: 'mapsId' in spec ? 'maps' : spec.array,
      count: simulation.maps.coils,
      label: coilsLabel(spec),
      ...(simulation.fitError === undefined ? {} : { fitError: simulation.fitError }),
    },
  };
}

function gFactorEcho(
  result: GFactorResult,
  nx: number,
  ny: number,
): { facts: Pick<ReconstructionOutcome, 'gFactor' | 'snrRetained'>; images: { gFactor: RealImage } } {
  const { map, snrRetained, ...summary } = result;
  return { facts: { gFactor: summary, snrRetained }, images: { gFactor: { nx, ny, data: map } } };
}
