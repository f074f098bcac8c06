import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import type { Store, StoredImage } from '../jobs/store.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import type { Caller } from './caller.ts';

const metaValue = z.union([z.string(), z.number(), z.boolean(), z.array(z.number()), z.null()]);

/** An uploaded image as stored and answered (decoded pixels only; the original file is not kept). */
export const imageInfoSchema = z.object({
  id: z.string(),
  nx: z.int().describe('columns'),
  ny: z.int().describe('rows'),
  nz: z
    .int()
    .optional()
    .describe('slices of the volume kept with the upload (NIfTI with slices=all), for matrix.nz'),
  format: z.enum(['png', 'jpeg', 'tiff', 'dicom', 'nifti']),
  details: z
    .record(z.string(), metaValue)
    .describe(
      'Format facts: bit depth, scaling, frame/slice chosen. Never patient, study or institution data.',
    ),
  notes: z.array(z.string()).describe('Every transformation applied while decoding'),
  stats: z.object({ min: z.number(), max: z.number(), mean: z.number() }),
  createdAt: z.string(),
  url: z.string(),
});

export type ImageInfo = z.infer<typeof imageInfoSchema>;

/** Which 2D picture of a multi-frame, multi-slice or multi-volume file to keep (0-based). */
export interface PictureChoice {
  frame?: number;
  slice?: number;
  volume?: number;
  /** NIfTI: 'all' keeps every slice of the chosen volume as well (volume sources, matrix.nz). */
  slices?: 'one' | 'all';
}

function infoOf(stored: StoredImage): ImageInfo {
  const { details, notes, stats, format } = stored.meta as Pick<
    ImageInfo,
    'details' | 'notes' | 'stats' | 'format'
  >;
  return {
    id: stored.id,
    nx: stored.nx,
    ny: stored.ny,
    ...(stored.nz ? { nz: stored.nz } : {}),
    format,
    details,
    notes,
    stats,
    createdAt: stored.createdAt,
    url: `/v1/images/${stored.id}`,
  };
}

function statistics(data: Float64Array): ImageInfo['stats'] {
  let min = Number.POSITIVE_INFINITY;
  let max = Number.NEGATIVE_INFINITY;
  let sum = 0;
  for (const v of data) {
    if (v < min) min = v;
    if (v > max) max = v;
    sum += v;
  }
  return { min, max, mean: sum / data.length };
}

/**
 * Uploads: decoded on the worker pool, stored as pixels plus whitelisted format facts. The file's
 * bytes, its name and every header string are dropped, so no patient identifier is ever stored.
 */
export class UploadService {
  constructor(private readonly deps: { pool: WorkerPool; store: Store; limits: Limits }) {}

  /** Decodes (gunzip, DICOM/NIfTI parsing, sharp) on a worker: a 64 MB file never stalls the loop. */
  async upload(bytes: Buffer, choice: PictureChoice, caller: Caller): Promise<ImageInfo> {
    const { pool, store, limits } = this.deps;
    const { slices, ...picture } = choice;
    const decoded = await pool.runForRequest('decode', {
      bytes,
      options: {
        ...picture,
        ...(slices === 'all' ? { wholeVolume: true } : {}),
        maxSide: limits.maxMatrixSide,
        maxBytes: limits.maxUploadBytes,
      },
    });
    if (slices === 'all' && !decoded.volume) {
      throw new ValidationError({
        field: 'slices',
        message: `a ${decoded.format} file holds one slice: slices=all needs a NIfTI volume`,
        allowed: "'one', or a NIfTI file",
      });
    }
    const meta = {
      format: decoded.format,
      details: decoded.meta,
      notes: decoded.notes,
      stats: statistics(decoded.image.data),
    };
    return infoOf(store.putImage(randomUUID(), decoded.image, meta, caller.owner, decoded.volume));
  }

  /** The caller's uploads, newest first, `limit` per page after position `after`. */
  list(
    caller: Caller,
    options: { limit: number; after?: number },
  ): { items: ImageInfo[]; after: number | null } {
    const page = this.deps.store.listImages(caller.scope, options);
    return { items: page.items.map(infoOf), after: page.after };
  }

  /** An uploaded image the caller may see. */
  info(id: string, caller: Caller): ImageInfo | undefined {
    const stored = this.deps.store.getImageInfo(id, caller.scope);
    return stored && infoOf(stored);
  }
}
