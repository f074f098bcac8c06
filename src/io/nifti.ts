import { DecodeError, LimitError } from '../core/errors.ts';
import { MAX_VOLUME_VOXELS } from '../core/matrix.ts';
import { gunzipBounded } from './bounded-inflate.ts';
import type { DecodedImage, DecodeOptions } from './decoded-image.ts';
import { checkIndex } from './image-size.ts';
import { checkNiftiHeader, type NiftiHeaderOptions } from './nifti-header.ts';

/** nifti1.h datatype codes we read, with their typed-array reader. */
const datatypes: Record<
  number,
  { name: string; bytes: number; read: (view: DataView, offset: number, le: boolean) => number }
> = {
  2: { name: 'uint8', bytes: 1, read: (v, o) => v.getUint8(o) },
  4: { name: 'int16', bytes: 2, read: (v, o, le) => v.getInt16(o, le) },
  8: { name: 'int32', bytes: 4, read: (v, o, le) => v.getInt32(o, le) },
  16: { name: 'float32', bytes: 4, read: (v, o, le) => v.getFloat32(o, le) },
  64: { name: 'float64', bytes: 8, read: (v, o, le) => v.getFloat64(o, le) },
  256: { name: 'int8', bytes: 1, read: (v, o) => v.getInt8(o) },
  512: { name: 'uint16', bytes: 2, read: (v, o, le) => v.getUint16(o, le) },
  768: { name: 'uint32', bytes: 4, read: (v, o, le) => v.getUint32(o, le) },
};

export function isGzip(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
}

function ascii(bytes: Uint8Array, start: number, length: number): string {
  return String.fromCharCode(...bytes.subarray(start, start + length));
}

export type NiftiKind =
  | 'nifti-1'
  | 'nifti-2'
  | 'nifti-1-pair-header'
  | 'nifti-2-pair-header'
  | 'analyze'
  | null;

/** Classifies a (decompressed) header by sizeof_hdr (348 or 540, either byte order) and magic. */
export function niftiKind(bytes: Uint8Array): NiftiKind {
  if (bytes.length < 348) return null;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const size = [view.getInt32(0, true), view.getInt32(0, false)];
  if (size.includes(348)) {
    const magic = ascii(bytes, 344, 4);
    if (magic === 'n+1\0') return 'nifti-1';
    if (magic === 'ni1\0') return 'nifti-1-pair-header';
    return 'analyze';
  }
  if (size.includes(540) && bytes.length >= 540) {
    const magic = ascii(bytes, 4, 4);
    if (magic.startsWith('n+2')) return 'nifti-2';
    if (magic.startsWith('ni2')) return 'nifti-2-pair-header';
  }
  return null;
}

/** How many leading bytes tell a NIfTI-2 header (the larger) apart and hold it whole. */
export const niftiHeaderBytes = 540;

/**
 * The length a (decompressed) file must have according to its header, for bounded gunzip: a
 * single-file header is checked in full (checkNiftiHeader); other NIfTI-like headers stop the
 * inflation at once so that decodeNifti can say what they are.
 */
export function niftiDeclaredLength(
  head: Uint8Array,
  options: DecodeOptions & NiftiHeaderOptions = {},
): number {
  const kind = niftiKind(head);
  if (kind === null) throw new DecodeError(unrecognisedFile);
  if (kind !== 'nifti-1' && kind !== 'nifti-2') return head.length;
  return checkNiftiHeader(head, options).end;
}

/**
 * A single-file NIfTI as plain bytes: .nii.gz is inflated with the bound of uploads (the header is
 * checked as soon as it is inflated, and inflation stops at the length it declares or at
 * `maxBytes`, so a small upload cannot expand without limit); other bytes are returned as they are.
 */
export async function inflatedNifti(
  bytes: Uint8Array,
  options: DecodeOptions & NiftiHeaderOptions & { maxBytes: number },
): Promise<Uint8Array> {
  if (!isGzip(bytes)) return bytes;
  return gunzipBounded(bytes, {
    maxBytes: options.maxBytes,
    headerBytes: niftiHeaderBytes,
    declaredLength: (head) => niftiDeclaredLength(head, options),
  });
}

export const unrecognisedFile =
  'unrecognised file: send PNG, JPEG, TIFF, DICOM Part 10 or single-file NIfTI (.nii, .nii.gz)';

/** The version of a single-file NIfTI, or a DecodeError saying what the bytes are instead. */
export function singleFileNiftiKind(bytes: Uint8Array): 'nifti-1' | 'nifti-2' {
  const kind = niftiKind(bytes);
  if (kind === 'analyze')
    throw new DecodeError('ANALYZE 7.5 headers are not supported; convert to single-file NIfTI (.nii)');
  if (kind === 'nifti-1-pair-header' || kind === 'nifti-2-pair-header') {
    throw new DecodeError(
      'this is the header of a .hdr/.img pair; upload a single-file NIfTI (.nii or .nii.gz)',
    );
  }
  if (kind === null) throw new DecodeError('not a NIfTI file');
  return kind;
}

/**
 * Single-file NIfTI-1 or NIfTI-2 (.nii, or .nii.gz after gunzipBounded): one slice of one volume,
 * scaled by scl_slope/scl_inter (value = scl_slope × stored + scl_inter; slope 0 means no scaling,
 * nifti1.h). Voxel index i becomes the column and j the row counted from the bottom, so the first
 * row of the image is the largest j (j increases upward, as in a radiological display of an axial slice).
 */
export function decodeNifti(bytes: Uint8Array, options: DecodeOptions = {}): DecodedImage {
  const kind = singleFileNiftiKind(bytes);
  // Geometry, datatype and vox_offset are checked before any voxel is read.
  const facts = checkNiftiHeader(bytes, options);
  const dims = facts.dims;
  const ndim = dims[0];
  const nx = dims[1];
  const ny = ndim >= 2 ? dims[2] : 1;
  const nz = ndim >= 3 ? dims[3] : 1;
  const nt = ndim >= 4 ? dims[4] : 1;
  const type = datatypes[facts.datatype];
  const slice = options.slice ?? Math.floor(nz / 2);
  const volume = options.volume ?? 0;
  checkIndex('slice', slice, nz);
  checkIndex('volume', volume, nt);

  const voxOffset = facts.voxOffset;
  const sliceVoxels = nx * ny;
  const needed = facts.end;
  if (bytes.byteLength < needed) {
    throw new DecodeError(
      `the NIfTI file is truncated: the image needs ${needed} bytes, ${bytes.byteLength} present`,
    );
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const slope = facts.sclSlope;
  const scaled = Number.isFinite(slope) && slope !== 0;
  const inter = scaled && Number.isFinite(facts.sclInter) ? facts.sclInter : 0;
  const readSlice = (data: Float64Array, k: number, at: number) => {
    const start = voxOffset + (volume * nz + k) * sliceVoxels * type.bytes;
    for (let j = 0; j < ny; j++) {
      const row = ny - 1 - j;
      for (let i = 0; i < nx; i++) {
        const stored = type.read(view, start + (j * nx + i) * type.bytes, facts.littleEndian);
        data[at + row * nx + i] = scaled ? slope * stored + inter : stored;
      }
    }
  };
  const data = new Float64Array(sliceVoxels);
  readSlice(data, slice, 0);
  let whole: Float64Array | undefined;
  if (options.wholeVolume) {
    if (nx * ny * nz > MAX_VOLUME_VOXELS || (options.maxSide !== undefined && nz > options.maxSide)) {
      throw new LimitError({
        field: 'file.dim[3]',
        message: `a ${nx}×${ny}×${nz} volume is larger than the configured limit`,
        allowed: `nz ≤ ${options.maxSide ?? 'the matrix limit'} and nx·ny·nz ≤ ${MAX_VOLUME_VOXELS}`,
      });
    }
    whole = new Float64Array(sliceVoxels * nz);
    for (let k = 0; k < nz; k++) readSlice(whole, k, k * sliceVoxels);
  }
  const notes = ['rows flipped: image row 0 is voxel j = ny − 1 (j increases upward)'];
  if (scaled && (slope !== 1 || inter !== 0))
    notes.push(`scl_slope/scl_inter applied: value = ${slope} × stored + ${inter}`);
  return {
    image: { nx, ny, data },
    format: 'nifti',
    meta: {
      version: kind === 'nifti-2' ? 2 : 1,
      dims: dims.slice(0, ndim + 1),
      datatype: type.name,
      littleEndian: facts.littleEndian,
      sclSlope: scaled ? slope : 1,
      sclInter: inter,
      slices: nz,
      slice,
      volumes: nt,
      volume,
      voxelSizeMm: [Math.abs(facts.pixdim[0]), Math.abs(facts.pixdim[1])],
    },
    notes,
    ...(whole ? { volume: { nx, ny, nz, data: whole } } : {}),
  };
}
