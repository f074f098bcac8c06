import { z } from 'zod';
import { LimitError, ValidationError } from '../core/errors.ts';
import { MAX_VOLUME_VOXELS } from '../core/matrix.ts';
import { parseOrThrow } from '../core/zod-problems.ts';
import { volumeAcquisitionSchema } from '../volume/volume-schema.ts';

/** Export format name and version written into acquisition.json (docs/design.md §4.11). */
export const ACQUISITION_FORMAT = 'kspace-planner acquisition 1';

/** Receive channels an acquisition bundle may carry (as many as an ISMRMRD import reads). */
const MAX_BUNDLE_COILS = 1024;

const size = z.int().min(1);

/**
 * The fields of acquisition.json that POST /v1/raw reads back (everything else — result id, notes,
 * scaling text, the mask summary — is passed over and never stored). Unknown keys are allowed: the
 * export writes more than the import needs.
 */
export const acquisitionBundleHeaderSchema = z.object({
  format: z.literal(ACQUISITION_FORMAT),
  geometry: z.enum(['cartesian', 'non-cartesian']),
  matrix: z.object({ nx: size, ny: size, nz: size.optional() }),
  volume: z.object({ acquisition: volumeAcquisitionSchema }).optional(),
  coils: size.max(MAX_BUNDLE_COILS),
  samples: z.object({
    datatype: z.literal('complex64'),
    dims: z.tuple([size, size, size, size]),
    count: z.int().min(0).describe('acquired samples per coil'),
  }),
  noise: z.object({
    prewhitened: z.boolean(),
    variancePerSample: z.number().min(0).nullable(),
  }),
  table: z.object({ rows: z.array(z.array(z.number())) }),
});

/** The header facts a fully sampled Cartesian bundle is imported with (numbers and flags only). */
export interface AcquisitionBundleHeader {
  nx: number;
  ny: number;
  /** Partitions (kz) of a 3D acquisition; 1 for a 2D slice. */
  nz: number;
  coils: number;
  /** The expected NIfTI dims: [nx, ny, nz, coils]. */
  dims: [number, number, number, number];
  noise: { prewhitened: boolean; variancePerSample: number | null };
}

/**
 * acquisition.json (the bytes of the `header` part) checked for import: valid JSON of the export's
 * format, Cartesian, dims [nx, ny, nz, coils] (nz 1 for a 2D slice) and fully sampled (every grid
 * point acquired; a 3D volume: every kx of every ky–kz line). A multi-slice volume is refused: its
 * slices are separate 2D acquisitions, not one 3D raw acquisition. Each refusal is a
 * ValidationError naming the field under `header`; `maxSide` bounds nz (LimitError).
 */
export function parseAcquisitionBundleHeader(bytes: Uint8Array, maxSide?: number): AcquisitionBundleHeader {
  let json: unknown;
  try {
    json = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(bytes));
  } catch {
    throw refused(
      'header',
      'not UTF-8 JSON',
      'acquisition.json as GET /v1/results/{id}/acquisition.json gives it',
    );
  }
  const header = parseOrThrow(acquisitionBundleHeaderSchema, json, 'header');
  if (header.geometry !== 'cartesian') {
    throw refused(
      'header.geometry',
      'non-Cartesian raw data are not accepted: POST /v1/raw takes k-space on the Cartesian grid only',
      '"cartesian"',
    );
  }
  const { nx, ny } = header.matrix;
  const nz = volumeDepth(header, maxSide);
  const dims: [number, number, number, number] = [nx, ny, nz, header.coils];
  if (header.samples.dims.some((d, i) => d !== dims[i])) {
    const grid = nz > 1 ? `${nx}×${ny}×${nz}` : `${nx}×${ny}`;
    throw refused(
      'header.samples.dims',
      `dims [${header.samples.dims.join(', ')}] contradict matrix ${grid} and ${header.coils} coil(s)`,
      `[${dims.join(', ')}]`,
    );
  }
  // A 3D volume acquires whole readout lines: count = nx × the acquired ky–kz points.
  const { count } = header.samples;
  const lines = nz > 1 ? count / nx : count;
  if (!Number.isInteger(lines)) {
    throw refused(
      'header.samples.count',
      `${count} samples per coil are not whole readout lines of ${nx} kx values`,
      `a multiple of ${nx}`,
    );
  }
  const total = ny * (nz > 1 ? nz : nx);
  if (lines !== total) {
    const what = nz > 1 ? 'ky–kz points' : 'grid points';
    const grid = nz > 1 ? `${ny}×${nz} ky–kz plane, each with its ${nx} kx values` : `${nx}×${ny} grid`;
    throw refused(
      'header.samples.count',
      `the acquisition is not fully sampled: ${lines} of ${total} ${what} acquired ` +
        `(fraction ${Number((lines / total).toPrecision(4))}); raw data must be fully sampled`,
      `${nz > 1 ? total * nx : total} (every point of the ${grid})`,
    );
  }
  if (header.table.rows.length !== lines) {
    const per = nz > 1 ? 'ky–kz line' : 'grid point';
    throw refused(
      'header.table.rows',
      `${header.table.rows.length} rows for ${lines} acquired ${per}s`,
      `${lines} rows, one per acquired ${per}`,
    );
  }
  return { nx, ny, nz, coils: header.coils, dims, noise: header.noise };
}

/**
 * The partitions of the bundle's acquisition: 1 for a 2D slice; nz for a 3D volume (`matrix.nz`
 * and `volume.acquisition` "3d" together, as the export writes them). A multi-slice volume is nz
 * separately excited 2D slices whose third NIfTI axis is z in image space, not kz: there is no 3D
 * k-space to store, and raw data of a slice stack are not one 2D slice either, so it is refused.
 */
function volumeDepth(header: z.infer<typeof acquisitionBundleHeaderSchema>, maxSide?: number): number {
  const { nz } = header.matrix;
  const mode = header.volume?.acquisition;
  if (nz === undefined && mode === undefined) return 1;
  if (nz === undefined) {
    throw refused(
      'header.matrix.nz',
      `a volume (volume.acquisition "${mode}") without matrix.nz`,
      'an integer ≥ 2',
    );
  }
  if (mode === undefined) {
    throw refused('header.volume', `matrix.nz = ${nz} without volume.acquisition`, '{ "acquisition": "3d" }');
  }
  if (mode === 'multi-slice') {
    throw refused(
      'header.volume.acquisition',
      'a multi-slice acquisition is not accepted as raw data: its z-slices are separate 2D acquisitions ' +
        '(the third axis is z in image space, not kz), so they are neither one 3D acquisition nor one 2D slice',
      '"3d"',
    );
  }
  if (nz < 2) throw refused('header.matrix.nz', `nz = ${nz} is not a volume`, 'an integer ≥ 2');
  const { nx, ny } = header.matrix;
  if ((maxSide !== undefined && nz > maxSide) || nx * ny * nz > MAX_VOLUME_VOXELS) {
    throw new LimitError({
      field: 'header.matrix.nz',
      message: `${nx}×${ny}×${nz} is larger than the configured limit`,
      allowed: `nz ≤ ${maxSide ?? 'the matrix limit'} and nx·ny·nz ≤ ${MAX_VOLUME_VOXELS}`,
    });
  }
  return nz;
}

function refused(field: string, message: string, allowed: string): ValidationError {
  return new ValidationError({ field, message, allowed });
}
