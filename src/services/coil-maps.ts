import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { NotFoundError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import type { CoilMaps } from '../encoding/index.ts';
import type { CoilPlanes } from '../io/coil-planes.ts';
import type { CoilMapsUpload } from '../io/decode-coil-maps.ts';
import type { Store, StoredCoilMaps } from '../jobs/store.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import type { Caller } from './caller.ts';

/** Uploaded coil maps as answered: their shape and numeric facts (the uploaded bytes are not kept). */
export const coilMapsInfoSchema = z.object({
  id: z.string(),
  nx: z.int().describe('columns'),
  ny: z.int().describe('rows'),
  coils: z.int().describe('number of coils (planes)'),
  format: z.enum(['planes', 'nifti']).describe('the upload form: JSON base64 planes or a NIfTI file'),
  details: z
    .record(z.string(), z.union([z.string(), z.number(), z.array(z.number())]))
    .describe('Numeric facts of the upload (datatype, NIfTI dims); never header strings'),
  createdAt: z.string(),
  url: z.string(),
});

export type CoilMapsInfo = z.infer<typeof coilMapsInfoSchema>;

function infoOf(stored: StoredCoilMaps): CoilMapsInfo {
  const { format, details } = stored.meta as Pick<CoilMapsInfo, 'format' | 'details'>;
  return {
    id: stored.id,
    nx: stored.nx,
    ny: stored.ny,
    coils: stored.coils,
    format,
    details,
    createdAt: stored.createdAt,
    url: `/v1/coil-maps/${stored.id}`,
  };
}

/**
 * User-supplied coil sensitivity maps: decoded and checked on the worker pool, stored as given
 * (never refitted or renormalised) with their owner, and read back for the reconstructions and plans
 * that name them. Deletion and retention treat them like image uploads (inputKinds.coilMaps).
 */
export class CoilMapService {
  constructor(private readonly deps: { pool: WorkerPool; store: Store; limits: Limits }) {}

  /** Maps sent as JSON base64 planes (the shape already checked at the edge). */
  uploadPlanes(planes: CoilPlanes, caller: Caller, signal?: AbortSignal): Promise<CoilMapsInfo> {
    return this.upload({ planes }, caller, signal);
  }

  /** Maps sent as a NIfTI file, bounded like image uploads (matrix side, decompressed bytes). */
  uploadNifti(bytes: Buffer, caller: Caller, signal?: AbortSignal): Promise<CoilMapsInfo> {
    const { limits } = this.deps;
    const bounds = { maxSide: limits.maxMatrixSide, maxBytes: limits.maxUploadBytes };
    return this.upload({ nifti: bytes, limits: bounds }, caller, signal);
  }

  private async upload(upload: CoilMapsUpload, caller: Caller, signal?: AbortSignal): Promise<CoilMapsInfo> {
    const { pool, store } = this.deps;
    const decoded = await pool.runForRequest('decode-coil-maps', upload, signal);
    const meta = { format: decoded.format, details: decoded.details };
    return infoOf(store.putCoilMaps(randomUUID(), decoded.maps, meta, caller.owner));
  }

  /** Uploaded maps the caller may see. */
  info(id: string, caller: Caller): CoilMapsInfo | undefined {
    const stored = this.deps.store.getCoilMapsInfo(id, caller.scope);
    return stored && infoOf(stored);
  }

  /**
   * The maps themselves, coil-major interleaved, exactly as uploaded (float32 values). An id the
   * caller may not see, or that does not exist, is a 404 naming `field` (where the request named it).
   */
  async loadCoilMaps(id: string, caller: Caller, field = 'coils.mapsId'): Promise<CoilMaps> {
    return readCoilMaps(this.deps.store, id, caller, field);
  }
}

/** The stored maps the caller may see, or a 404 naming `field`. */
export function readCoilMaps(store: Store, id: string, caller: Caller, field: string): CoilMaps {
  const maps = store.getCoilMaps(id, caller.scope);
  if (!maps) throw coilMapsNotFound(id, field);
  return maps;
}

export function coilMapsNotFound(id: string, field: string): NotFoundError {
  return new NotFoundError({ field, message: `no uploaded coil maps ${id}` });
}
