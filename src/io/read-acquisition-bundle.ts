import { DecodeError, LimitError, ValidationError } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import { createMultiCoilArray } from '../encoding/index.ts';
import { parseAcquisitionBundleHeader } from './acquisition-bundle-header.ts';
import type { ImportedRawKspace } from './ismrmrd/import-raw-kspace.ts';
import { inflatedNifti, singleFileNiftiKind } from './nifti.ts';
import { checkUnscaled } from './nifti-coil-maps.ts';
import { checkNiftiHeader } from './nifti-header.ts';

const COMPLEX64 = 32;

/**
 * The stored form of a fully sampled Cartesian acquisition bundle (docs/design.md §4.11): the
 * complex64 NIfTI of the `nifti` part (.nii, or .nii.gz inflated with the upload bound), voxel
 * (u, v, w, c) = column u, row v (row 0 at the top) and, for a 3D volume, partition w
 * (kz = w − ⌊nz/2⌋) of coil c in array order — the raw store's own order (coil-major, then
 * partition, row, column) — copied sample for sample into the coil k-space, so an export imported
 * again holds exactly the exported numbers (a volume as 3D raw data, nz > 1). The header
 * (acquisition.json, the `header` part) is
 * checked first (parseAcquisitionBundleHeader), so an undersampled bundle is refused unread.
 * Noise: data whose variance per complex sample is known and positive keep it as the covariance
 * Ψ = v·I, so reconstructions prewhiten them to unit variance as they do an ISMRMRD file with
 * noise scans; unknown (or zero) variance keeps none.
 */
export async function readAcquisitionBundle(
  upload: Uint8Array,
  headerBytes: Uint8Array,
  limits: Limits,
): Promise<ImportedRawKspace> {
  const header = parseAcquisitionBundleHeader(headerBytes, limits.maxMatrixSide);
  const { nx, ny, nz, coils, dims } = header;
  const options = {
    maxSide: limits.maxMatrixSide,
    maxBytes: limits.maxUploadBytes,
    datatypes: { codes: new Set([COMPLEX64]), described: 'acquisition.nii is complex64 (32)' },
  };
  const { nifti, facts } = await underNiftiPart(async () => {
    const plain = await inflatedNifti(upload, options);
    singleFileNiftiKind(plain);
    const found = checkNiftiHeader(plain, options);
    checkUnscaled(found.sclSlope, found.sclInter, 'the samples');
    return { nifti: plain, facts: found };
  });
  const niftiDims = [1, 2, 3, 4].map((d) => (d <= facts.dims[0] ? facts.dims[d] : 1));
  niftiDims.forEach((size, i) => {
    if (size !== dims[i]) {
      throw new ValidationError({
        field: `nifti.dim[${i + 1}]`,
        message: `dim[${i + 1}] = ${size} contradicts header.samples.dims [${dims.join(', ')}]`,
        allowed: String(dims[i]),
      });
    }
  });
  if (nifti.byteLength < facts.end) {
    throw new ValidationError({
      field: 'nifti',
      message: `truncated: the samples need ${facts.end} bytes, ${nifti.byteLength} present`,
      allowed: 'acquisition.nii as exported',
    });
  }
  // A 3D volume's nz partitions per coil follow each other as the ISMRMRD reader stores them.
  const kspace = createMultiCoilArray(coils * nz, nx, ny);
  const view = new DataView(nifti.buffer, nifti.byteOffset, nifti.byteLength);
  for (let i = 0; i < kspace.data.length; i++) {
    const value = view.getFloat32(facts.voxOffset + 4 * i, facts.littleEndian);
    if (!Number.isFinite(value)) throw notFinite(i, dims);
    kspace.data[i] = value;
  }
  const variance = header.noise.variancePerSample;
  const known = variance !== null && variance > 0;
  return {
    kspace: { ...kspace, coils },
    ...(nz > 1 ? { nz } : {}),
    noiseCovariance: known ? identityCovariance(coils, variance) : null,
    facts: {
      nx,
      ny,
      nz,
      coils,
      readoutOversampling: 1,
      readoutSamples: nx,
      noiseScans: 0,
      noiseSamples: 0,
      imagingRecords: 0,
      repeatedLines: 0,
      skippedRecords: 0,
      encodedFieldOfViewMm: null,
      reconFieldOfViewMm: null,
      format: 'acquisition-bundle',
      noiseVariancePerSample: known ? variance : null,
    },
  };
}

/** v·I as the interleaved complex C×C covariance the raw store keeps. */
function identityCovariance(coils: number, variance: number): Float64Array {
  const psi = new Float64Array(2 * coils * coils);
  for (let c = 0; c < coils; c++) psi[2 * (c * coils + c)] = variance;
  return psi;
}

function notFinite(index: number, [nx, ny, nz]: readonly number[]): ValidationError {
  const voxel = index >> 1;
  const u = voxel % nx;
  const v = Math.floor(voxel / nx) % ny;
  const w = Math.floor(voxel / (nx * ny)) % nz;
  const c = Math.floor(voxel / (nx * ny * nz));
  return new ValidationError({
    field: 'nifti',
    message: `sample (u ${u}, v ${v}${nz > 1 ? `, w ${w}` : ''}, coil ${c}) is not a finite number`,
    allowed: 'finite complex64 samples',
  });
}

/**
 * The NIfTI checks name their fields under `file` (the one part of other uploads); here the
 * samples come in the part `nifti`, and a file that is not the exported NIfTI is a bad bundle (422).
 */
async function underNiftiPart<T>(read: () => Promise<T>): Promise<T> {
  const rename = (field: string) => field.replace(/^file/, 'nifti');
  try {
    return await read();
  } catch (error) {
    if (error instanceof DecodeError) {
      throw new ValidationError({
        field: rename(error.field),
        message: error.message,
        allowed: 'acquisition.nii as exported',
      });
    }
    if (error instanceof ValidationError) {
      const problems = error.problems.map((p) => ({ ...p, field: rename(p.field) }));
      throw error instanceof LimitError ? new LimitError(problems) : new ValidationError(problems);
    }
    throw error;
  }
}
