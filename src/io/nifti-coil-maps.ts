import { COIL_LIMITS } from '../coils/index.ts';
import { DecodeError, LimitError, ValidationError } from '../core/errors.ts';
import { type CoilMaps, createMultiCoilArray } from '../encoding/index.ts';
import { checkCoilMapValues } from './coil-map-values.ts';
import { inflatedNifti, singleFileNiftiKind } from './nifti.ts';
import { checkNiftiHeader, type NiftiHeaderOptions } from './nifti-header.ts';

/** nifti1.h codes read as coil maps: both carry float32 numbers, so the maps are stored unrounded. */
const FLOAT32 = 16;
const COMPLEX64 = 32;
const coilMapDatatypes = {
  codes: new Set([FLOAT32, COMPLEX64]),
  described: 'coil maps are complex64 (32) or float32 (16, real maps)',
};

/** Maps read from a NIfTI file, with the numeric header facts worth showing (no header strings). */
export interface NiftiCoilMaps {
  maps: CoilMaps;
  details: { version: 1 | 2; datatype: 'complex64' | 'float32'; dims: number[]; voxelSizeMm: number[] };
}

/**
 * Coil sensitivity maps from a single-file NIfTI-1/-2 (.nii or .nii.gz, gunzipped with the same
 * bound as image uploads): the coil is the last dimension, i.e. (x, y) for one coil, (x, y, coils)
 * or (x, y, 1, coils). complex64 voxels are (re, im) pairs (nifti1.h); float32 voxels are real maps
 * (imaginary part 0). Rows are flipped as for images: image row 0 is voxel j = ny − 1. Scaling
 * (scl_slope/scl_inter) other than none is refused, since maps are used as given; description,
 * intent name and extensions are never read.
 */
export async function decodeNiftiCoilMaps(
  bytes: Uint8Array,
  options: { maxSide: number; maxBytes: number },
): Promise<NiftiCoilMaps> {
  const headerOptions: NiftiHeaderOptions = { ...options, datatypes: coilMapDatatypes };
  const plain = await inflatedNifti(bytes, { ...headerOptions, maxBytes: options.maxBytes });
  const kind = singleFileNiftiKind(plain);
  const facts = checkNiftiHeader(plain, headerOptions);
  const { dims } = facts;
  const [rank, nx] = dims;
  const ny = rank >= 2 ? dims[2] : 1;
  const coilAxis = coilAxisOf(dims);
  const coils = coilAxis === 0 ? 1 : dims[coilAxis];
  if (coils > COIL_LIMITS.maxCoils) {
    throw new LimitError({
      field: `file.dim[${coilAxis}]`,
      message: `${coils} coils`,
      allowed: `1 … ${COIL_LIMITS.maxCoils} coils`,
    });
  }
  checkUnscaled(facts.sclSlope, facts.sclInter);
  if (plain.byteLength < facts.end) {
    throw new DecodeError(
      `the NIfTI file is truncated: the maps need ${facts.end} bytes, ${plain.byteLength} present`,
    );
  }
  const complex = facts.datatype === COMPLEX64;
  const maps = createMultiCoilArray(coils, nx, ny);
  const view = new DataView(plain.buffer, plain.byteOffset, plain.byteLength);
  const voxelBytes = complex ? 8 : 4;
  const plane = nx * ny;
  for (let c = 0; c < coils; c++) {
    for (let j = 0; j < ny; j++) {
      const row = ny - 1 - j;
      for (let i = 0; i < nx; i++) {
        const at = facts.voxOffset + (c * plane + j * nx + i) * voxelBytes;
        const target = 2 * (c * plane + row * nx + i);
        maps.data[target] = view.getFloat32(at, facts.littleEndian);
        maps.data[target + 1] = complex ? view.getFloat32(at + 4, facts.littleEndian) : 0;
      }
    }
  }
  checkCoilMapValues(maps, () => 'file');
  return {
    maps,
    details: {
      version: kind === 'nifti-2' ? 2 : 1,
      datatype: complex ? 'complex64' : 'float32',
      dims: dims.slice(1, rank + 1),
      voxelSizeMm: [Math.abs(facts.pixdim[0]), Math.abs(facts.pixdim[1])],
    },
  };
}

/**
 * The dimension that counts coils: the last one larger than 1 beyond (x, y) (trailing sizes of 1
 * are no dimension); a 4D file must have one slice (dim[3] = 1). 0 for a single 2D map.
 */
function coilAxisOf(dims: number[]): number {
  let rank = dims[0];
  while (rank > 2 && dims[rank] === 1) rank--;
  if (rank <= 2) return 0;
  if (rank === 4 && dims[3] !== 1) {
    throw new ValidationError({
      field: 'file.dim[3]',
      message: `${dims[3]} slices`,
      allowed: 'one slice: (x, y, coils) or (x, y, 1, coils)',
    });
  }
  return rank;
}

/**
 * nifti1.h: scl_slope 0 (or not a number, as nibabel writes for float data) means no scaling; any
 * other scaling is refused since `what` is used as given.
 */
export function checkUnscaled(slope: number, inter: number, what = 'the maps'): void {
  const scaled = Number.isFinite(slope) && slope !== 0;
  if (!scaled) return;
  if (slope !== 1) {
    throw new ValidationError({
      field: 'file.scl_slope',
      message: `scl_slope ${slope} would rescale ${what}`,
      allowed: `0, 1 or NaN (${what} are used as given)`,
    });
  }
  if (Number.isFinite(inter) && inter !== 0) {
    throw new ValidationError({
      field: 'file.scl_inter',
      message: `scl_inter ${inter} would shift ${what}`,
      allowed: `0 or NaN (${what} are used as given)`,
    });
  }
}
