import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { RawKspace } from '../acquisition/index.ts';
import { NotFoundError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import type { ImportedRawKspace, RawKspaceFacts } from '../io/ismrmrd/import-raw-kspace.ts';
import type { Store, StoredRawKspace } from '../jobs/store.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { checkRawMatrixSides } from '../pipeline/raw-acquisition.ts';
import type { Caller } from './caller.ts';

const side = (what: string) => z.int().describe(what);

/** The numeric facts kept of an imported file (RawKspaceFacts), as stored and answered. */
const rawFactsSchema = z.object({
  nx: side('reconstructed readout samples (readout oversampling removed)'),
  ny: side('phase-encode lines'),
  nz: side('partitions (1: one 2D slice)'),
  coils: side('receiver channels'),
  readoutOversampling: z.number().describe('encoded ÷ reconstructed field of view along the readout'),
  readoutSamples: side('readout samples as acquired (oversampling included)'),
  noiseScans: side('noise-scan records (their covariance prewhitens the data in reconstructions)'),
  noiseSamples: side('noise samples per coil in those records'),
  imagingRecords: side('imaging records read'),
  repeatedLines: side('records of a line beyond its first (averaged into the line)'),
  skippedRecords: side('calibration, navigator and other non-imaging records left out'),
  encodedFieldOfViewMm: z
    .array(z.number())
    .length(3)
    .nullable()
    .describe('encoded field of view x, y, z (mm); null for an acquisition bundle (no physical size)'),
  reconFieldOfViewMm: z
    .array(z.number())
    .length(3)
    .nullable()
    .describe('reconstructed field of view x, y, z (mm); null for an acquisition bundle'),
  format: z
    .enum(['ismrmrd', 'acquisition-bundle'])
    .default('ismrmrd')
    .describe('what was imported: an ISMRMRD file or an acquisition bundle (acquisition.nii + .json)'),
  noiseVariancePerSample: z
    .number()
    .nullable()
    .default(null)
    .describe(
      "an acquisition bundle's noise variance per complex sample, kept as the covariance v·I (reconstructions " +
        'prewhiten with it); null when unknown and for ISMRMRD files (their noise scans give the covariance)',
    ),
});

/** Imported raw k-space as answered: numbers of the file only (no header text is ever read). */
export const rawInfoSchema = z.object({
  id: z.string(),
  ...rawFactsSchema.shape,
  createdAt: z.string(),
  url: z.string(),
});

export type RawInfo = z.infer<typeof rawInfoSchema>;

function infoOf(stored: StoredRawKspace): RawInfo {
  const facts = rawFactsSchema.parse(stored.meta);
  return { id: stored.id, ...facts, createdAt: stored.createdAt, url: `/v1/raw/${stored.id}` };
}

/**
 * Raw multi-coil k-space imported from ISMRMRD files or acquisition bundles: read on the worker
 * pool, stored as the fully sampled coil k-space with its noise covariance and numeric facts (the
 * files and their header text are dropped), owned by the caller; deletion and retention as for
 * uploads (inputKinds.raw).
 */
export class RawDataService {
  constructor(private readonly deps: { pool: WorkerPool; store: Store; limits: Limits }) {}

  async upload(bytes: Buffer, caller: Caller, signal?: AbortSignal): Promise<RawInfo> {
    const { pool, limits } = this.deps;
    const view = new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    const imported = await pool.runForRequest('read-raw-kspace', { bytes: view, limits }, signal);
    return this.keep(imported, caller);
  }

  /**
   * A fully sampled Cartesian acquisition bundle (acquisition.nii + acquisition.json, docs/design.md
   * §4.11), header and samples checked and read on the worker pool (a 1024² header's sample table
   * is some 18 MB of JSON).
   */
  async uploadBundle(nifti: Buffer, header: Buffer, caller: Caller, signal?: AbortSignal): Promise<RawInfo> {
    const view = (b: Buffer) => new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
    const { pool, limits } = this.deps;
    const input = { nifti: view(nifti), header: view(header), limits };
    const imported = await pool.runForRequest('read-acquisition-bundle', input, signal);
    return this.keep(imported, caller);
  }

  private keep(imported: ImportedRawKspace, caller: Caller): RawInfo {
    const meta: RawKspaceFacts = imported.facts;
    return infoOf(this.deps.store.putRawKspace(randomUUID(), imported, { ...meta }, caller.owner));
  }

  /** Imported raw data the caller may see. */
  info(id: string, caller: Caller): RawInfo | undefined {
    const stored = this.deps.store.getRawKspaceInfo(id, caller.scope);
    return stored && infoOf(stored);
  }
}

/** The stored raw k-space the caller may see, or a 404 naming `field`. */
export function readRawKspace(store: Store, id: string, caller: Caller, field = 'source.rawId'): RawKspace {
  const raw = store.getRawKspace(id, caller.scope);
  if (!raw) throw rawNotFound(id, field);
  return raw;
}

export function rawNotFound(id: string, field = 'source.rawId'): NotFoundError {
  return new NotFoundError({ field, message: `no imported raw data ${id}` });
}

/** The raw id a request or plan names in `source`, if any. */
export function rawIdOf(request: { source: unknown }): string | undefined {
  const source = request.source;
  return typeof source === 'object' &&
    source !== null &&
    'rawId' in source &&
    typeof source.rawId === 'string'
    ? source.rawId
    : undefined;
}

/**
 * The submit check of a plan's raw source (as for its image): the data must exist for the caller
 * (else a 404 on `source.rawId`) and the plan's matrix must be the data's own (raw data are not resampled).
 */
export function checkRawMatrix(
  stored: StoredRawKspace | undefined,
  id: string,
  matrix: { nx: number; ny: number; nz?: number },
): void {
  if (!stored) throw rawNotFound(id);
  const nz = typeof stored.meta.nz === 'number' ? stored.meta.nz : 1;
  checkRawMatrixSides({ nx: stored.nx, ny: stored.ny, nz }, matrix);
}
