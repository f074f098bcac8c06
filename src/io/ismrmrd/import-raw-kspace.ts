import { CoilNoise } from '../../coils/index.ts';
import { ValidationError } from '../../core/errors.ts';
import type { Limits } from '../../core/limits.ts';
import type { MultiCoilKspace } from '../../encoding/multi-coil.ts';
import { readRawKspace } from './read-raw-kspace.ts';

/**
 * What `POST /v1/raw` keeps of an ISMRMRD file: the fully sampled coil k-space (readout
 * oversampling removed; a 3D file's nz partitions per coil, RawKspace), the noise covariance when
 * the file has noise scans, and numbers only. Nothing of the XML header's text (subject, study, free
 * text) is read, so nothing can be stored.
 */
export interface ImportedRawKspace {
  kspace: MultiCoilKspace;
  /** Partitions of a 3D acquisition (absent: 1, a 2D slice). */
  nz?: number;
  noiseCovariance: Float64Array | null;
  facts: RawKspaceFacts;
}

/** The numeric facts of an imported file, as `GET /v1/raw/{id}` answers them. */
export interface RawKspaceFacts {
  /** The reconstructed matrix: readout samples after oversampling removal, lines, partitions. */
  nx: number;
  ny: number;
  nz: number;
  coils: number;
  /** Encoded ÷ reconstructed field of view along the readout (2 for the usual 2× oversampling). */
  readoutOversampling: number;
  /** Readout samples as acquired (oversampling included). */
  readoutSamples: number;
  /** Noise-scan records (ACQ_IS_NOISE_MEASUREMENT) and the samples per coil they hold. */
  noiseScans: number;
  noiseSamples: number;
  /** Imaging records read; records of a line beyond the first are averaged into it. */
  imagingRecords: number;
  repeatedLines: number;
  /** Calibration, navigator and other non-imaging records left out. */
  skippedRecords: number;
  /** null for an acquisition bundle, whose positions are in cycles per FOV with no physical size. */
  encodedFieldOfViewMm: [number, number, number] | null;
  reconFieldOfViewMm: [number, number, number] | null;
  /** What was imported: an ISMRMRD file or an acquisition bundle (docs/design.md §4.11). */
  format: 'ismrmrd' | 'acquisition-bundle';
  /** A bundle's known noise variance per complex sample (kept as Ψ = v·I); null otherwise. */
  noiseVariancePerSample: number | null;
}

/** Reads an uploaded ISMRMRD file into the stored form (refusals as readRawKspace gives them). */
export async function importRawKspace(bytes: Uint8Array, limits: Limits): Promise<ImportedRawKspace> {
  const raw = await readRawKspace(bytes, limits);
  const { kspace, noise, records } = raw;
  if (noise) checkPrewhitening(noise.covariance, raw.coils, noise.samples);
  const fov = (s: { x: number; y: number; z: number }): [number, number, number] => [s.x, s.y, s.z];
  return {
    kspace,
    ...(raw.nz > 1 ? { nz: raw.nz } : {}),
    noiseCovariance: noise?.covariance ?? null,
    facts: {
      nx: kspace.nx,
      ny: kspace.ny,
      nz: raw.nz,
      coils: raw.coils,
      readoutOversampling: raw.readoutOversampling,
      readoutSamples: raw.readoutSamples,
      noiseScans: records.noise,
      noiseSamples: noise?.samples ?? 0,
      imagingRecords: records.imaging,
      repeatedLines: raw.repeatedLines,
      skippedRecords: records.skipped,
      encodedFieldOfViewMm: fov(raw.encodedFieldOfViewMm),
      reconFieldOfViewMm: fov(raw.reconFieldOfViewMm),
      format: 'ismrmrd',
      noiseVariancePerSample: null,
    },
  };
}

/**
 * The noise covariance must be positive definite to prewhiten with (its Cholesky factor exists):
 * fewer noise samples than coils, or a dead channel, make it singular. Refused at import, naming
 * the noise records, rather than at every reconstruction.
 */
export function checkPrewhitening(covariance: Float64Array, coils: number, samples: number): void {
  try {
    new CoilNoise(covariance, coils, 'file.data.noise');
  } catch (error) {
    if (!(error instanceof ValidationError)) throw error;
    throw new ValidationError({
      field: 'file.data.noise',
      message: `the noise scans (${samples} samples per coil, ${coils} coils) give a covariance that cannot prewhiten the data (not positive definite)`,
      allowed: 'noise scans with more samples than coils and no dead channel, or none',
    });
  }
}
