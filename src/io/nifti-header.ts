import { DecodeError, LimitError, ValidationError } from '../core/errors.ts';
import { checkImageSize } from './image-size.ts';

/**
 * Header checks for single-file NIfTI-1 and NIfTI-2 before any voxel is read, from the field
 * definitions of nifti1.h and nifti2.h (NIfTI Data Format Working Group). Bad values answer 422
 * naming the header field (`file.vox_offset`, `file.dim[3]`, ...); a readable header of a kind we
 * do not read (complex or RGB voxels, five or more dimensions) stays 415.
 */

/** Every datatype code nifti1.h defines (nifti2.h reuses them) with the bitpix it implies. */
const datatypeBits: Record<number, number> = {
  1: 1, // binary
  2: 8, // uint8
  4: 16, // int16
  8: 32, // int32
  16: 32, // float32
  32: 64, // complex64
  64: 64, // float64
  128: 24, // RGB24
  256: 8, // int8
  512: 16, // uint16
  768: 32, // uint32
  1024: 64, // int64
  1280: 64, // uint64
  1536: 128, // float128
  1792: 128, // complex128
  2048: 256, // complex256
  2304: 32, // RGBA32
};

/** The real scalar codes the decoder reads. */
export const supportedDatatypes = new Set([2, 4, 8, 16, 64, 256, 512, 768]);

interface Layout {
  version: 1 | 2;
  headerSize: number;
  /** Smallest vox_offset of a single file: header plus the 4-byte extension flag. */
  minVoxOffset: number;
  dimAt: number;
  dimBytes: 2 | 8;
  datatypeAt: number;
  bitpixAt: number;
  voxOffsetAt: number;
  /** pixdim[8], then scl_slope and scl_inter: float32 in NIfTI-1, float64 in NIfTI-2. */
  pixdimAt: number;
  sclSlopeAt: number;
  sclInterAt: number;
  floatBytes: 4 | 8;
}

// Byte offsets of nifti1.h (struct nifti_1_header) and nifti2.h (struct nifti_2_header).
const layouts: Record<1 | 2, Layout> = {
  1: {
    version: 1,
    headerSize: 348,
    minVoxOffset: 352,
    dimAt: 40,
    dimBytes: 2,
    datatypeAt: 70,
    bitpixAt: 72,
    voxOffsetAt: 108,
    pixdimAt: 76,
    sclSlopeAt: 112,
    sclInterAt: 116,
    floatBytes: 4,
  },
  2: {
    version: 2,
    headerSize: 540,
    minVoxOffset: 544,
    dimAt: 16,
    dimBytes: 8,
    datatypeAt: 12,
    bitpixAt: 14,
    voxOffsetAt: 168,
    pixdimAt: 104,
    sclSlopeAt: 176,
    sclInterAt: 184,
    floatBytes: 8,
  },
};

export interface NiftiHeaderFacts {
  version: 1 | 2;
  littleEndian: boolean;
  /** dim[0..dim[0]]: the rank, then each size. */
  dims: number[];
  datatype: number;
  bitpix: number;
  voxOffset: number;
  /** vox_offset plus the voxel bytes: how long the file must be. */
  end: number;
  /** pixdim[1], pixdim[2]: voxel sizes along i and j. */
  pixdim: [number, number];
  sclSlope: number;
  sclInter: number;
}

function invalid(field: string, message: string, allowed: string): ValidationError {
  return new ValidationError({ field: `file.${field}`, message, allowed });
}

/** An int64 field as a Number, or NaN when it cannot be represented exactly. */
function int64(view: DataView, at: number, littleEndian: boolean): number {
  const value = view.getBigInt64(at, littleEndian);
  return value >= BigInt(Number.MIN_SAFE_INTEGER) && value <= BigInt(Number.MAX_SAFE_INTEGER)
    ? Number(value)
    : Number.NaN;
}

/**
 * Which layout a header has (sizeof_hdr 348 with magic "n+1", 540 with "n+2"), or null when the
 * bytes are not a single-file NIfTI header (pairs and ANALYZE are classified by niftiKind).
 */
function layoutOf(bytes: Uint8Array): { layout: Layout; littleEndian: boolean } | null {
  if (bytes.length < 348) return null;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (const littleEndian of [true, false]) {
    const size = view.getInt32(0, littleEndian);
    if (size === 348 && bytes[344] === 0x6e && bytes[345] === 0x2b && bytes[346] === 0x31)
      return { layout: layouts[1], littleEndian };
    if (size === 540 && bytes.length >= 540 && bytes[4] === 0x6e && bytes[5] === 0x2b && bytes[6] === 0x32)
      return { layout: layouts[2], littleEndian };
  }
  return null;
}

/** What a reader accepts: size bounds and, when not the real scalar types, its own datatypes. */
export interface NiftiHeaderOptions {
  maxSide?: number;
  maxBytes?: number;
  datatypes?: { codes: ReadonlySet<number>; described: string };
}

/**
 * Reads and checks the geometry fields of a single-file NIfTI-1/-2 header. `maxSide` bounds the
 * slice (LimitError), `maxBytes` the whole file as the header declares it (LimitError), so a
 * compressed upload can be refused before it is inflated.
 */
export function checkNiftiHeader(bytes: Uint8Array, options: NiftiHeaderOptions = {}): NiftiHeaderFacts {
  const found = layoutOf(bytes);
  if (!found) throw new DecodeError('not a single-file NIfTI-1/-2 header');
  const { layout, littleEndian } = found;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const readDim = (d: number): number =>
    layout.dimBytes === 2
      ? view.getInt16(layout.dimAt + 2 * d, littleEndian)
      : int64(view, layout.dimAt + 8 * d, littleEndian);

  // dim[0] is the rank, 1..7; dim[1..dim[0]] are the sizes, each ≥ 1 (nifti1.h, nifti2.h).
  const rank = readDim(0);
  if (!(Number.isInteger(rank) && rank >= 1 && rank <= 7))
    throw invalid('dim[0]', `dim[0] = ${rank} is not a rank`, '1 ≤ dim[0] ≤ 7');
  const dims = [rank];
  for (let d = 1; d <= rank; d++) {
    const size = readDim(d);
    if (!(Number.isInteger(size) && size >= 1))
      throw invalid(`dim[${d}]`, `dim[${d}] = ${size} is not a size`, 'an integer ≥ 1');
    dims.push(size);
  }

  const datatype = view.getInt16(layout.datatypeAt, littleEndian);
  const bits = datatypeBits[datatype];
  if (bits === undefined)
    throw invalid('datatype', `datatype ${datatype} is not a NIfTI datatype code`, 'a code of nifti1.h');
  const bitpix = view.getInt16(layout.bitpixAt, littleEndian);
  if (bitpix !== bits)
    throw invalid(
      'bitpix',
      `bitpix ${bitpix} contradicts datatype ${datatype}`,
      `${bits} for datatype ${datatype}`,
    );
  const accepted = options.datatypes ?? { codes: supportedDatatypes, described: 'real scalar types only' };
  if (!accepted.codes.has(datatype)) {
    throw new DecodeError(
      `NIfTI datatype ${datatype} is not supported (${accepted.described})`,
      'file.datatype',
    );
  }

  // NIfTI-1 stores vox_offset as a float32, NIfTI-2 as an int64. nifti1.h reads a value below 352 as
  // 352; a writer that stored one (or a fraction, NaN, ∞) is not trusted to have written the rest.
  const voxOffset =
    layout.version === 1
      ? view.getFloat32(layout.voxOffsetAt, littleEndian)
      : int64(view, layout.voxOffsetAt, littleEndian);
  if (!(Number.isInteger(voxOffset) && voxOffset >= layout.minVoxOffset)) {
    throw invalid(
      'vox_offset',
      `vox_offset ${voxOffset} cannot start the voxel data`,
      `an integer ≥ ${layout.minVoxOffset} (NIfTI-${layout.version} header and extension flag)`,
    );
  }

  for (let d = 5; d <= rank; d++) {
    if (dims[d] > 1)
      throw new DecodeError(
        'NIfTI images with more than four dimensions are not supported',
        `file.dim[${d}]`,
      );
  }
  checkImageSize(dims[1], rank >= 2 ? dims[2] : 1, options.maxSide);

  let voxels = 1;
  for (let d = 1; d <= rank; d++) voxels *= dims[d];
  const end = voxOffset + (voxels * bitpix) / 8;
  if (options.maxBytes !== undefined && end > options.maxBytes) {
    throw new LimitError({
      field: 'file',
      message: `the NIfTI header declares ${end} bytes of image`,
      allowed: `≤ ${options.maxBytes} bytes (the upload limit)`,
    });
  }
  // Extensions (between byte 352/544 and vox_offset) are never parsed: nothing in them is needed.
  const float = (at: number): number =>
    layout.floatBytes === 4 ? view.getFloat32(at, littleEndian) : view.getFloat64(at, littleEndian);
  const pixdim: [number, number] = [
    float(layout.pixdimAt + layout.floatBytes),
    float(layout.pixdimAt + 2 * layout.floatBytes),
  ];
  return {
    version: layout.version,
    littleEndian,
    dims,
    datatype,
    bitpix,
    voxOffset,
    end,
    pixdim,
    sclSlope: float(layout.sclSlopeAt),
    sclInter: float(layout.sclInterAt),
  };
}
