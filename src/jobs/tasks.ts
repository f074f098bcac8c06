import type { MaskDiagnostics, SampledMask, SamplingSpec } from '../../sampling/index.ts';
import type { RawKspace } from '../acquisition/index.ts';
import type { WorkerFailure } from '../core/error-transport.ts';
import type { Limits } from '../core/limits.ts';
import type { Matrix } from '../core/matrix.ts';
import type { RealImage } from '../core/real-image.ts';
import type { RealVolume } from '../core/real-volume.ts';
import type { CoilMaps } from '../encoding/index.ts';
import type { CoilMapsUpload, DecodedCoilMaps } from '../io/decode-coil-maps.ts';
import type { DecodedImage, DecodeOptions } from '../io/decoded-image.ts';
import type { ImportedRawKspace } from '../io/ismrmrd/import-raw-kspace.ts';
import type { MetricSet } from '../metrics/index.ts';
import type { ReconstructionOutcome, ReconstructionRequest } from '../pipeline/run-reconstruction.ts';
import type { PreparedVolume } from '../pipeline/volume-reconstruction.ts';
import type { CellResult, Plan, PlanCell } from '../plan/index.ts';
import type { PlaneBatch, PlaneReconstructions } from '../volume/plane-reconstruction.ts';

/** An uploaded image the task needs, sent along so workers never open the database. */
export interface UploadedPixels {
  id: string;
  image: RealImage;
  /** The whole volume, for volume requests (matrix.nz > 1). */
  volume?: RealVolume;
}

/** A reconstruction with what its answer shows beside it: mask diagnostics, zero-filled scores. */
export interface ScoredOutcome {
  outcome: ReconstructionOutcome;
  diagnostics: MaskDiagnostics;
  zeroFilledMetrics: MetricSet;
}

/** Uploaded coil maps a task needs, sent along like images (workers never open the database). */
export interface UploadedCoilMaps {
  id: string;
  maps: CoilMaps;
}

/** Imported raw k-space a task needs, sent along like images (workers never open the database). */
export interface UploadedRawKspace {
  id: string;
  raw: RawKspace;
}

/** What a reconstruction or a plan cell may read besides its request: the caller's uploads, and the limits. */
export interface TaskInputs {
  image?: UploadedPixels;
  coilMaps?: UploadedCoilMaps[];
  raw?: UploadedRawKspace;
  limits: Limits;
}

/** A volume request with its source: an uploaded volume (image) or the raw data of a 3D acquisition. */
export interface VolumeTaskInputs {
  request: ReconstructionRequest;
  seed?: number;
  image?: UploadedPixels;
  raw?: UploadedRawKspace;
  limits: Limits;
}

/**
 * Every task a worker thread runs: its input (typed values the HTTP edge or the plan schema already
 * validated; plain, structured-clonable data) and its output. The worker trusts its inputs and does
 * not parse them again.
 */
export interface TaskMap {
  decode: { input: { bytes: Uint8Array; options: DecodeOptions }; output: DecodedImage };
  'decode-coil-maps': { input: CoilMapsUpload; output: DecodedCoilMaps };
  'read-raw-kspace': { input: { bytes: Uint8Array; limits: Limits }; output: ImportedRawKspace };
  'read-acquisition-bundle': {
    input: { nifti: Uint8Array; header: Uint8Array; limits: Limits };
    output: ImportedRawKspace;
  };
  'phantom-kspace': { input: { name: string; kx: Float64Array; ky: Float64Array }; output: Float64Array };
  'phantom-raster': {
    input: { name: string; nx: number; ny: number; supersample?: number };
    output: RealImage;
  };
  mask: {
    input: { matrix: Matrix; sampling: SamplingSpec; limits: Limits; diagnostics: boolean };
    output: { sampled: SampledMask; diagnostics: MaskDiagnostics | null };
  };
  reconstruction: {
    input: TaskInputs & { request: ReconstructionRequest; seed?: number };
    output: ScoredOutcome;
  };
  /** A volume reconstruction in three steps, its planes spread over the pool (src/services/volume-runs.ts). */
  'volume-prepare': {
    input: VolumeTaskInputs;
    output: PreparedVolume;
  };
  'volume-planes': { input: { batch: PlaneBatch; limits: Limits }; output: PlaneReconstructions };
  'volume-finish': {
    input: { prepared: PreparedVolume; planes: PlaneReconstructions };
    output: ScoredOutcome;
  };
  /** Limits and one draw of every mask of a plan that already has the plan schema's shape. */
  'validate-plan': { input: { plan: Plan; limits: Limits }; output: Plan };
  /** With `keepOutcome`, a seed-1 cell also returns its outcome, to be stored as the row's result. */
  cell: {
    input: TaskInputs & { plan: Plan; cell: PlanCell; keepOutcome?: boolean };
    output: { result: CellResult; outcome?: ScoredOutcome };
  };
}

export type TaskKind = keyof TaskMap;
export type TaskInput<K extends TaskKind> = TaskMap[K]['input'];
export type TaskOutput<K extends TaskKind> = TaskMap[K]['output'];

/** What the pool posts to a thread: the kind picks the handler, the input is its typed argument. */
export type WorkerTask = { [K in TaskKind]: { kind: K; input: TaskInput<K> } }[TaskKind];

/** A task's answer: its typed output, or an error as data (src/core/error-transport.ts). */
export type WorkerReply<K extends TaskKind> =
  | { ok: true; value: TaskOutput<K> }
  | { ok: false; error: WorkerFailure };
