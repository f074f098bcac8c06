/** Bytes of a NIfTI-1 single-file header (sizeof_hdr) and the offset of the first voxel (vox_offset). */
const HEADER_BYTES = 348;
const VOXEL_OFFSET = 352;

/**
 * One volume of a 4D float32 NIfTI file: nz slices (absent: 1) of ny×nx values, slice-major then
 * row-major, row 0 at the top of the picture (src/core/real-volume.ts).
 */
export interface NiftiVolume {
  nx: number;
  ny: number;
  nz?: number;
  data: Float32Array;
}

/**
 * A single-file NIfTI-1 (".nii", magic "n+1") of float32 volumes (datatype 16, bitpix 32), one per
 * index of the 4th dimension: dim = [4, nx, ny, nz, volumes, 1, 1, 1] (nz = 1 for images),
 * little-endian, no scaling (scl_slope 0: values as stored), unit voxels (pixdim 1, xyzt_units 0:
 * unknown), and no orientation (qform_code = sform_code = 0), as nifti1.h lays the header out
 * (docs/references.md §10.2). Voxel (i, j, k) is column i, row ny − 1 − j of slice k, so j runs
 * upward as y does in the phantom frame (the same flip the NIfTI decoders undo: an uploaded volume
 * written back keeps its voxel order). `description` (≤ 79 ASCII characters) goes into `descrip`.
 */
export function niftiFloat32Volumes(volumes: readonly NiftiVolume[], description: string): Buffer {
  if (volumes.length < 1) throw new RangeError('at least one volume is needed');
  const { nx, ny } = volumes[0];
  const nz = volumes[0].nz ?? 1;
  if (
    volumes.some((v) => v.nx !== nx || v.ny !== ny || (v.nz ?? 1) !== nz || v.data.length !== nx * ny * nz)
  ) {
    throw new RangeError('every volume must hold nx·ny·nz values of one size');
  }
  const out = niftiWithHeader([nx, ny, nz, volumes.length], FLOAT32, description);
  // Row copies into a float32 view of the voxels (Buffer.alloc owns its memory from offset 0, so
  // byte 352 is 4-aligned); the host order is little-endian, as niftiComplex64 assumes too.
  const voxels = new Float32Array(out.buffer, out.byteOffset + VOXEL_OFFSET, nx * ny * nz * volumes.length);
  let at = 0;
  for (const volume of volumes) {
    for (let k = 0; k < nz; k++) {
      for (let j = 0; j < ny; j++) {
        const row = (k * ny + ny - 1 - j) * nx;
        voxels.set(volume.data.subarray(row, row + nx), at);
        at += nx;
      }
    }
  }
  return out;
}

/**
 * A single-file NIfTI-1 of complex64 values (datatype 32, bitpix 64: re, im as float32 pairs),
 * dim = [4, d1, d2, d3, d4], the first index fastest; `data` holds the interleaved pairs in that
 * order as they are (no flip), with the same header conventions as niftiFloat32Volumes.
 */
export function niftiComplex64(
  dims: readonly [number, number, number, number],
  data: Float32Array,
  description: string,
): Buffer {
  if (data.length !== 2 * dims.reduce((a, b) => a * b, 1)) {
    throw new RangeError(`${data.length / 2} complex values for dims ${dims.join('×')}`);
  }
  const out = niftiWithHeader(dims, COMPLEX64, description);
  Buffer.from(data.buffer, data.byteOffset, data.byteLength).copy(out, VOXEL_OFFSET);
  return out;
}

const FLOAT32 = { datatype: 16, bitpix: 32 };
const COMPLEX64 = { datatype: 32, bitpix: 64 };

/** A zeroed file with the NIfTI-1 header filled in (nifti1.h, docs/references.md §10.2). */
function niftiWithHeader(
  dims: readonly [number, number, number, number],
  type: { datatype: number; bitpix: number },
  description: string,
): Buffer {
  if (!/^[\x20-\x7e]{0,79}$/.test(description)) throw new RangeError('descrip: at most 79 ASCII characters');
  if (dims.some((d) => !Number.isInteger(d) || d < 1 || d > 32767)) {
    throw new RangeError(`NIfTI-1 dimensions are 1 … 32767: ${dims.join('×')}`);
  }
  const voxels = dims.reduce((a, b) => a * b, 1);
  const out = Buffer.alloc(VOXEL_OFFSET + (type.bitpix / 8) * voxels);
  out.writeInt32LE(HEADER_BYTES, 0); // sizeof_hdr
  out.writeUInt8(0x72, 38); // regular = 'r' (an Analyze 7.5 field NIfTI-1 keeps); dim_info 0
  const dim = [4, ...dims, 1, 1, 1];
  for (let i = 0; i < dim.length; i++) out.writeInt16LE(dim[i], 40 + 2 * i);
  out.writeInt16LE(type.datatype, 70);
  out.writeInt16LE(type.bitpix, 72);
  for (let i = 0; i < 8; i++) out.writeFloatLE(1, 76 + 4 * i); // pixdim: qfac 1, unit steps
  out.writeFloatLE(VOXEL_OFFSET, 108); // vox_offset
  out.writeFloatLE(0, 112); // scl_slope 0: no scaling
  out.writeFloatLE(0, 116); // scl_inter
  out.write(description, 148, 80, 'latin1'); // descrip (zero padded)
  out.write('n+1\0', 344, 4, 'latin1'); // magic
  return out;
}
