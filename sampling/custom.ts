import sharp, { type OutputInfo } from 'sharp';
import { LimitError, ValidationError } from '../src/core/errors.ts';
import { defaultLimits, type Limits } from '../src/core/limits.ts';
import type { Matrix } from '../src/core/matrix.ts';
import { cartesianSampledMask, type SampledMask } from './sampled-mask.ts';
import type { CustomSpec } from './schema.ts';

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
const FIELD = 'sampling.maskPng';
const TABLE_FIELD = 'sampling.table';

function tableProblem(message: string, allowed: string): ValidationError {
  return new ValidationError({ field: TABLE_FIELD, message, allowed });
}

/**
 * The mask of a sample table in the form GET /v1/masks/{id}/table.csv writes (sample-table.ts):
 * header `order,ky,kx`, then integer indices relative to the k-space centre, ky up. The order
 * column is read and checked to be an integer, not used (a mask has no order). Trajectory tables
 * (`order,kx,ky` in cycles per FOV) are not masks and are refused.
 */
function maskFromTable(matrix: Matrix, csv: string): Uint8Array {
  const { nx, ny } = matrix;
  const lines = csv.split(/\r?\n/);
  if (lines.length > 0 && lines[lines.length - 1] === '') lines.pop();
  const header = (lines[0] ?? '').trim();
  if (header === 'order,kx,ky') {
    throw tableProblem(
      'is a non-Cartesian trajectory table; only Cartesian sample tables can be read back as a mask',
      'header order,ky,kx',
    );
  }
  if (header !== 'order,ky,kx')
    throw tableProblem(`header is ${JSON.stringify(header.slice(0, 40))}`, 'header order,ky,kx');
  const mask = new Uint8Array(nx * ny);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  for (let i = 1; i < lines.length; i++) {
    const fields = lines[i].split(',');
    const numbers = fields.map(Number);
    if (fields.length !== 3 || !numbers.every(Number.isInteger)) {
      throw tableProblem(`row ${i + 1} is not three integers`, 'rows order,ky,kx of integers');
    }
    const row = cy - numbers[1];
    const col = cx + numbers[2];
    if (row < 0 || row >= ny || col < 0 || col >= nx) {
      throw tableProblem(
        `row ${i + 1}: ky ${numbers[1]}, kx ${numbers[2]} lies outside the ${ny}×${nx} grid`,
        `${cy - ny + 1} ≤ ky ≤ ${cy}, ${-cx} ≤ kx ≤ ${nx - 1 - cx}`,
      );
    }
    mask[row * nx + col] = 1;
  }
  return mask;
}

/**
 * Bookkeeping for a mask given point by point (ny×nx, non-zero = sampled). If every sampled row is
 * sampled across all nx columns the mask is a line mask and R counts lines (total ny); otherwise
 * R counts points (total nx·ny). `details.accelerationBasis` says which.
 */
export function customMaskFromArray(
  matrix: Matrix,
  values: ArrayLike<number>,
  field: string = FIELD,
): SampledMask {
  const { nx, ny } = matrix;
  if (values.length !== nx * ny) {
    throw new ValidationError({
      field,
      message: `mask holds ${values.length} values, expected ny·nx = ${ny * nx}`,
      allowed: `exactly ${nx}×${ny} (width × height) pixels`,
    });
  }
  const mask = new Uint8Array(nx * ny);
  let points = 0;
  let lines = 0;
  let wholeLines = true;
  for (let row = 0; row < ny; row++) {
    let inRow = 0;
    for (let col = 0; col < nx; col++) {
      if (values[row * nx + col] !== 0) {
        mask[row * nx + col] = 1;
        inRow++;
      }
    }
    points += inRow;
    if (inRow > 0) {
      lines++;
      if (inRow < nx) wholeLines = false;
    }
  }
  if (points === 0) {
    throw new ValidationError({
      field,
      message: 'the mask samples no k-space point',
      allowed: 'at least one non-zero pixel',
    });
  }
  const unit = wholeLines ? 'lines' : 'points';
  const count = wholeLines ? lines : points;
  const total = wholeLines ? ny : nx * ny;
  return cartesianSampledMask({
    nx,
    ny,
    mask,
    pattern: 'custom',
    requested: null,
    acquired: { count, unit },
    total,
    acs: null,
    seed: null,
    details: {
      accelerationBasis: wholeLines
        ? 'lines: every sampled row is sampled across all columns'
        : 'points: some sampled rows are partial',
    },
  });
}

/**
 * Decodes a custom mask from its base64 PNG (sharp). The picture must be exactly nx wide and ny
 * high, row 0 at the top = mask row 0; a pixel is sampled when any colour channel is non-zero
 * (alpha is ignored). 16-bit PNGs are read at 16 bits so that a value of 1 still counts.
 */
export async function decodeCustomMask(
  matrix: Matrix,
  spec: CustomSpec,
  limits: Limits = defaultLimits,
): Promise<SampledMask> {
  const { nx, ny } = matrix;
  if ((spec.maskPng === undefined) === (spec.table === undefined)) {
    throw new ValidationError({
      field: 'sampling',
      message: 'a custom mask needs exactly one of maskPng and table',
      allowed: 'maskPng (base64 PNG) or table (CSV of order,ky,kx)',
    });
  }
  if (spec.table !== undefined)
    return customMaskFromArray(matrix, maskFromTable(matrix, spec.table), TABLE_FIELD);
  const bytes = Buffer.from(spec.maskPng as string, 'base64');
  if (bytes.length > limits.maxUploadBytes) {
    throw new LimitError({
      field: FIELD,
      message: `${bytes.length} bytes exceed the configured limit`,
      allowed: `≤ ${limits.maxUploadBytes} bytes`,
    });
  }
  if (bytes.length < PNG_SIGNATURE.length || !bytes.subarray(0, 8).equals(PNG_SIGNATURE)) {
    throw new ValidationError({ field: FIELD, message: 'is not a PNG image', allowed: 'a base64 PNG' });
  }
  let decoded: { data: Buffer; info: OutputInfo };
  try {
    const image = sharp(bytes, { limitInputPixels: limits.maxMatrixSide * limits.maxMatrixSide });
    const meta = await image.metadata();
    if (meta.width !== nx || meta.height !== ny) {
      throw new ValidationError({
        field: FIELD,
        message: `PNG is ${meta.width}×${meta.height} (width × height) but the matrix is nx = ${nx}, ny = ${ny}`,
        allowed: `exactly ${nx}×${ny} (width × height) pixels`,
      });
    }
    // rgb16 keeps every non-zero sample non-zero whatever the PNG's depth, palette or channels.
    decoded = await image
      .toColourspace('rgb16')
      .raw({ depth: 'ushort' })
      .toBuffer({ resolveWithObject: true });
  } catch (error) {
    if (error instanceof ValidationError) throw error;
    throw new ValidationError({
      field: FIELD,
      message: `PNG could not be decoded (${(error as Error).message})`,
      allowed: 'a valid PNG image',
    });
  }
  const { data, info } = decoded;
  // A fresh copy guarantees the 2-byte alignment a Uint16Array view needs (native byte order).
  const samples = new Uint16Array(Uint8Array.from(data).buffer);
  const channels = info.channels;
  const colour = Math.min(3, channels - (info.hasAlpha ? 1 : 0));
  const values = new Uint8Array(nx * ny);
  for (let i = 0; i < nx * ny; i++) {
    for (let c = 0; c < colour; c++) {
      if (samples[i * channels + c] !== 0) {
        values[i] = 1;
        break;
      }
    }
  }
  return customMaskFromArray(matrix, values);
}
