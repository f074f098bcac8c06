import type { FastifyRequest } from 'fastify';
import { readFileParts } from './multipart-file.ts';
import { HttpProblem } from './problem.ts';

/** What POST /v1/raw was sent: an ISMRMRD file, or an acquisition bundle's two files. */
export type RawUpload = { kind: 'ismrmrd'; file: Buffer } | { kind: 'bundle'; nifti: Buffer; header: Buffer };

const either = '"file" (ISMRMRD) alone, or "nifti" and "header" (acquisition bundle) together';

/**
 * The parts of a raw upload: `file` alone, or `nifti` (acquisition.nii) with `header`
 * (acquisition.json). Anything else is a 400 naming the part that is missing or too many.
 */
export async function readRawUpload(request: FastifyRequest): Promise<RawUpload> {
  const { file, nifti, header } = await readFileParts(request, ['file', 'nifti', 'header']);
  if (file !== undefined) {
    const extra = nifti !== undefined ? 'nifti' : header !== undefined ? 'header' : undefined;
    if (extra !== undefined) throw wrongParts(extra, `sent with "file"`);
    return { kind: 'ismrmrd', file };
  }
  if (nifti !== undefined && header !== undefined) return { kind: 'bundle', nifti, header };
  if (nifti !== undefined) throw wrongParts('header', 'missing: the bundle’s acquisition.json');
  if (header !== undefined) throw wrongParts('nifti', 'missing: the bundle’s acquisition.nii');
  throw wrongParts('file', 'missing');
}

function wrongParts(field: string, message: string): HttpProblem {
  return new HttpProblem(400, `send ${either} as multipart parts; "${field}": ${message}`, [
    { field, message, allowed: either },
  ]);
}

/** The OpenAPI body of POST /v1/raw (route `config.openapi.multipartBody`). */
export const rawMultipartBody = {
  type: 'object',
  description: 'either `file`, or `nifti` and `header` together',
  properties: {
    file: {
      type: 'string',
      format: 'binary',
      description:
        'ISMRMRD HDF5 file (/dataset/xml and /dataset/data): one fully sampled Cartesian 2D slice, ' +
        'any number of coils, optional noise-scan records',
    },
    nifti: {
      type: 'string',
      format: 'binary',
      description:
        'acquisition.nii of a fully sampled Cartesian result (GET /v1/results/{id}/acquisition.nii: complex64, coil last)',
    },
    header: {
      type: 'string',
      format: 'binary',
      description: 'acquisition.json of the same result (format "kspace-planner acquisition 1")',
    },
  },
};
