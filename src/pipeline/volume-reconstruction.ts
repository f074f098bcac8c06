import { resolveSampling, type SampledMask, type SamplingSpec } from '../../sampling/index.ts';
import type { RawKspace } from '../acquisition/index.ts';
import { ValidationError } from '../core/errors.ts';
import { defaultLimits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import { type RealVolume, volumeSlice } from '../core/real-volume.ts';
import type { MetricSet } from '../metrics/index.ts';
import { patternGrid } from '../protocol/volume-scan-time.ts';
import {
  type PlaneBatch,
  type PlaneReconstructions,
  reconstructPlanes,
} from '../volume/plane-reconstruction.ts';
import { resampleTrilinear } from '../volume/resample-volume.ts';
import { acquireVolume } from '../volume/volume-acquisition.ts';
import type { VolumeAcquisitionMode } from '../volume/volume-schema.ts';
import { type SliceScores, scoreVolume, volumeScores } from '../volume/volume-scores.ts';
import { nonCartesianVolume, unsupportedVolumePieces } from '../volume/volume-support.ts';
import type { AcquiredData } from './acquired-data.ts';
import { loadFromContext } from './context-loader.ts';
import { checkRawMatrixSides, rawDataNote, rawNoise } from './raw-acquisition.ts';
import { acquireRawVolume } from './raw-volume.ts';
import type { PipelineContext, ReconstructionOutcome, ReconstructionRequest } from './run-reconstruction.ts';

/** What a volume adds to a reconstruction outcome (docs/design.md §2.5). */
export interface VolumeOutcome {
  acquisition: VolumeAcquisitionMode;
  matrix: { nx: number; ny: number; nz: number };
  /** The axis the reconstructed planes are stacked along: x (3D hybrid space) or z (multi-slice). */
  planeAxis: 'x' | 'z';
  /** Scores of every reconstructed plane, in planeAxis order. */
  slices: SliceScores;
  /** Magnitudes as volumes (x fastest), for the float32 NIfTI download. */
  volumes: { reconstruction: RealVolume; zeroFilled: RealVolume; reference: RealVolume };
}

/**
 * A volume acquired and split into planes, ready for the 2D reconstructions: plain data, so the
 * service can spread `batch` over the worker pool (src/services/volume-runs.ts) and finish on a worker.
 */
export interface PreparedVolume {
  acquisition: VolumeAcquisitionMode;
  matrix: { nx: number; ny: number; nz: number };
  batch: PlaneBatch;
  sampled: SampledMask;
  notes: string[];
  /** The acquired samples for the acquisition export (GET /v1/results/{id}/acquisition.nii). */
  acquired: AcquiredData;
}

/** Stacks planes back into a volume (x fastest), from x-planes (ny × nz) or z-slices (ny × nx). */
function assemble(
  planes: readonly RealImage[],
  axis: 'x' | 'z',
  nx: number,
  ny: number,
  nz: number,
): RealVolume {
  const data = new Float64Array(nx * ny * nz);
  if (axis === 'z') {
    planes.forEach((plane, z) => {
      data.set(plane.data, z * nx * ny);
    });
  } else {
    planes.forEach((plane, x) => {
      for (let y = 0; y < ny; y++)
        for (let z = 0; z < nz; z++) data[(z * ny + y) * nx + x] = plane.data[y * nz + z];
    });
  }
  return { nx, ny, nz, data };
}

/** The planes of a stacked volume again: x-planes (ny × nz) or z-slices (ny × nx). */
function planesOf(volume: RealVolume, axis: 'x' | 'z'): RealImage[] {
  const { nx, ny, nz, data } = volume;
  if (axis === 'z') return Array.from({ length: nz }, (_, z) => volumeSlice(volume, z));
  return Array.from({ length: nx }, (_, x) => {
    const plane = new Float64Array(ny * nz);
    for (let y = 0; y < ny; y++) for (let z = 0; z < nz; z++) plane[y * nz + z] = data[(z * ny + y) * nx + x];
    return { nx: nz, ny, data: plane };
  });
}

/**
 * The volume scores of the zero-filled planes, computed only when asked (a reconstruction's answer
 * shows them; plan cells do not): scoring every plane costs as much as a cheap reconstruction.
 * Plain zero-filling is its own comparison, so its scores are the reconstruction's.
 */
export function volumeZeroFilledMetrics(
  outcome: ReconstructionOutcome & { volume: VolumeOutcome },
): MetricSet {
  const { volumes, planeAxis } = outcome.volume;
  if (volumes.zeroFilled === volumes.reconstruction) return { ...outcome.metrics };
  return scoreVolume(planesOf(volumes.zeroFilled, planeAxis), planesOf(volumes.reference, planeAxis)).volume;
}

function centralSlice(volume: RealVolume): RealImage {
  return volumeSlice(volume, Math.floor(volume.nz / 2));
}

/** The raw data a volume request names: a 3D acquisition of the request's matrix, acquired in 3D. */
async function rawVolume(
  req: ReconstructionRequest,
  id: string,
  acquisition: VolumeAcquisitionMode,
  ctx: PipelineContext,
): Promise<RawKspace> {
  if (acquisition !== '3d') {
    throw new ValidationError({
      field: 'acquisition',
      message:
        'raw data of a 3D acquisition cannot be re-planned as separate 2D slices: its partitions share one excitation and one ky–kz encoding',
      allowed: "'3d' (the default for a raw source)",
    });
  }
  const raw = await loadFromContext(ctx.loadRaw, id, {
    field: 'source.rawId',
    message: 'raw data are not available here',
  });
  const { nx, ny } = raw.kspace;
  checkRawMatrixSides({ nx, ny, nz: raw.nz ?? 1 }, req.matrix);
  return raw;
}

/** An uploaded volume (NIfTI with slices=all), resampled to the request's matrix. */
async function uploadedVolume(
  id: string,
  matrix: { nx: number; ny: number; nz: number },
  ctx: PipelineContext,
  notes: string[],
): Promise<RealVolume> {
  const { nx, ny, nz } = matrix;
  const loaded = await loadFromContext(ctx.loadVolume, id, {
    field: 'source.imageId',
    message: 'uploaded volumes are not available here',
  });
  const volume = resampleTrilinear(loaded, nx, ny, nz);
  if (volume !== loaded) {
    notes.push(
      `uploaded volume resampled from ${loaded.nz}×${loaded.ny}×${loaded.nx} to ${nz}×${ny}×${nx} (trilinear)`,
    );
  }
  notes.push(
    'uploaded volume: k-space is the DFT of the same voxels the reconstruction inverts (inverse crime)',
  );
  return volume;
}

/**
 * The first half of a volume request (matrix.nz > 1): refusals, the source (an uploaded volume, or
 * the raw data of a 3D acquisition), the pattern (ky–kz for 3D, ky–kx for multi-slice), the
 * acquisition (3D: exact readout transform, hybrid-space x-planes, one coil or the raw data's
 * coils; multi-slice: every z-slice) and the batch of 2D problems.
 */
export async function prepareVolume(
  req: ReconstructionRequest,
  seed: number | undefined,
  ctx: PipelineContext,
  noiseSeedFor: (seed: number) => number,
): Promise<PreparedVolume> {
  const problems = unsupportedVolumePieces({
    source: req.source,
    coils: req.coils ? [{ field: 'coils', spec: req.coils }] : [],
    lesions: req.lesions,
    phase: req.phase,
    gFactor: req.gFactor,
  });
  if (problems.length > 0) throw new ValidationError(problems);
  const limits = ctx.limits ?? defaultLimits;
  const { nx, ny } = req.matrix;
  const nz = req.matrix.nz as number;
  const acquisition = req.acquisition ?? '3d';
  const notes: string[] = [];
  const raw = 'rawId' in req.source ? await rawVolume(req, req.source.rawId, acquisition, ctx) : undefined;
  const volume = raw
    ? undefined
    : await uploadedVolume((req.source as { imageId: string }).imageId, { nx, ny, nz }, ctx, notes);
  const sampling =
    seed !== undefined && req.sampling.pattern !== 'custom'
      ? ({ ...req.sampling, seed } as SamplingSpec)
      : req.sampling;
  const sampled = await resolveSampling(patternGrid(req.matrix, acquisition), sampling, limits);
  if (sampled.trajectory) throw new ValidationError(nonCartesianVolume);
  const noiseSeed = noiseSeedFor(seed ?? sampled.seed ?? 0);
  const stack = raw
    ? acquireRawVolume(raw, sampled, req.noise, noiseSeed)
    : acquireVolume(acquisition, volume as RealVolume, sampled, req.noise, noiseSeed);
  if (raw) notes.push(rawDataNote(raw));
  if (stack.sigma > 0) {
    notes.push(
      `complex Gaussian noise, σ = ${stack.sigma.toPrecision(4)} per real channel${raw ? ' in every coil' : ''}`,
    );
  }
  notes.push(
    acquisition === '3d'
      ? `3D: readout x transformed exactly, ${nx} hybrid-space x-planes (ky × kz = ${ny}×${nz}) reconstructed`
      : `multi-slice: ${nz} z-slices (ky × kx = ${ny}×${nx}) acquired and reconstructed separately`,
  );
  return {
    acquisition,
    matrix: { nx, ny, nz },
    batch: {
      inputs: stack.inputs,
      references: stack.references,
      method: req.method,
      ...(sampled.partialFourier ? { partialFourier: sampled.partialFourier } : {}),
    },
    sampled,
    notes,
    acquired: {
      geometry: 'cartesian',
      nx,
      ny,
      coils: raw?.kspace.coils ?? 1,
      samples: stack.samples,
      mask: sampled.mask.slice(),
      // σ per real channel: E|n|² = 2σ² per complex k-space sample (raw data: on top of their own).
      noise: {
        ...(raw ? rawNoise(raw, stack.sigma) : { prewhitened: false, variance: 2 * stack.sigma ** 2 }),
        seed: noiseSeed,
      },
      volume: { nz, acquisition },
    },
  };
}

/**
 * The second half: the planes' reconstructions and scores (from reconstructPlanes, here or on the
 * worker pool) stacked into volumes and scored over the volume. Images: the central z-slice.
 */
export function finishVolume(prepared: PreparedVolume, planes: PlaneReconstructions): ReconstructionOutcome {
  const { acquisition, sampled, batch } = prepared;
  const { nx, ny, nz } = prepared.matrix;
  const notes = [...prepared.notes];
  if (planes.info.note) notes.push(String(planes.info.note));
  const scored = volumeScores(planes.scores, planes.images, batch.references);
  const axis = acquisition === '3d' ? 'x' : 'z';
  const reconstructionVolume = assemble(planes.images, axis, nx, ny, nz);
  const sameZeroFilled = planes.zeroFilled.every((image, i) => image === planes.images[i]);
  const volumes = {
    reconstruction: reconstructionVolume,
    zeroFilled: sameZeroFilled ? reconstructionVolume : assemble(planes.zeroFilled, axis, nx, ny, nz),
    reference: assemble(batch.references, axis, nx, ny, nz),
  };
  const reconstruction = centralSlice(volumes.reconstruction);
  const reference = centralSlice(volumes.reference);
  const errorMap = new Float64Array(nx * ny);
  for (let i = 0; i < errorMap.length; i++)
    errorMap[i] = Math.abs(reconstruction.data[i] - reference.data[i]);
  return {
    acceleration: sampled.acceleration,
    acquired: sampled.acquired,
    fraction: sampled.fraction,
    metrics: scored.volume,
    timing: { reconMs: planes.reconMs },
    info: planes.info,
    notes,
    images: {
      reconstruction,
      zeroFilled: centralSlice(volumes.zeroFilled),
      reference,
      errorMap: { nx, ny, data: errorMap },
    },
    sampled,
    acquisition: prepared.acquired,
    volume: { acquisition, matrix: { nx, ny, nz }, planeAxis: axis, slices: scored.slices, volumes },
  };
}

/** A whole volume request in this thread (plan cells, scripts, tests): prepare, every plane, finish. */
export async function runVolumeReconstruction(
  req: ReconstructionRequest,
  seed: number | undefined,
  ctx: PipelineContext,
  noiseSeedFor: (seed: number) => number,
): Promise<ReconstructionOutcome> {
  const prepared = await prepareVolume(req, seed, ctx, noiseSeedFor);
  const planes = reconstructPlanes(prepared.batch, {
    signal: ctx.signal,
    limits: ctx.limits ?? defaultLimits,
  });
  return finishVolume(prepared, planes);
}
