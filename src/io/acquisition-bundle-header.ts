import { z } from 'zod';
import { ValidationError } from '../core/errors.ts';
import { parseOrThrow } from '../core/zod-problems.ts';

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
  matrix: z.object({ nx: size, ny: size }),
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
  coils: number;
  /** The expected NIfTI dims: [nx, ny, 1, coils]. */
  dims: [number, number, number, number];
  noise: { prewhitened: boolean; variancePerSample: number | null };
}

/**
 * acquisition.json (the bytes of the `header` part) checked for import: valid JSON of the export's
 * format, Cartesian, dims [nx, ny, 1, coils] and fully sampled (every grid point acquired). Each
 * refusal is a ValidationError naming the field under `header`.
 */
export function parseAcquisitionBundleHeader(bytes: Uint8Array): AcquisitionBundleHeader {
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
  const dims: [number, number, number, number] = [nx, ny, 1, header.coils];
  if (header.samples.dims.some((d, i) => d !== dims[i])) {
    throw refused(
      'header.samples.dims',
      `dims [${header.samples.dims.join(', ')}] contradict matrix ${nx}×${ny} and ${header.coils} coil(s)`,
      `[${dims.join(', ')}]`,
    );
  }
  const total = nx * ny;
  if (header.samples.count !== total) {
    const fraction = header.samples.count / total;
    throw refused(
      'header.samples.count',
      `the acquisition is not fully sampled: ${header.samples.count} of ${total} grid points acquired ` +
        `(fraction ${Number(fraction.toPrecision(4))}); raw data must be fully sampled`,
      `${total} (every point of the ${nx}×${ny} grid)`,
    );
  }
  if (header.table.rows.length !== header.samples.count) {
    throw refused(
      'header.table.rows',
      `${header.table.rows.length} rows for ${header.samples.count} samples per coil`,
      `${header.samples.count} rows, one per acquired grid point`,
    );
  }
  return { nx, ny, coils: header.coils, dims, noise: header.noise };
}

function refused(field: string, message: string, allowed: string): ValidationError {
  return new ValidationError({ field, message, allowed });
}
