import type { FastifyInstance } from 'fastify';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { jsonResponse, problemResponses } from '../src/http/problem.ts';
import { rawMultipartBody, readRawUpload } from '../src/http/raw-upload-parts.ts';
import { storedInputRoutes } from '../src/http/stored-input-routes.ts';
import { rawInfoSchema } from '../src/services/index.ts';

const rawInfoResponse = rawInfoSchema.meta({
  id: 'RawInfo',
  description:
    'Imported raw k-space: the fully sampled coil k-space and noise covariance are kept, the files and every header text are not',
});

/**
 * POST /v1/raw (multipart ISMRMRD file or acquisition bundle), GET and DELETE /v1/raw/{id} (the
 * deletion cascades to what was made from the data: src/jobs/lifecycle.ts). Only numbers are read
 * from the XML header and the bundle's JSON header.
 */
export async function rawRoutes(app: FastifyInstance): Promise<void> {
  const { raw, tenancy } = app.services;

  app.post(
    '/v1/raw',
    {
      config: {
        openapi: {
          multipartBody: rawMultipartBody,
        },
      },
      schema: {
        summary: 'Import raw multi-coil k-space (ISMRMRD or acquisition bundle)',
        description:
          'multipart/form-data (within the upload limit) with either an ISMRMRD file in the part `file`, or an ' +
          'acquisition bundle as exported by GET /v1/results/{id}/acquisition.nii and .json in the parts `nifti` ' +
          'and `header`. Refused (422, naming the field) when non-Cartesian, not fully sampled (a bundle: ' +
          '`header.samples.count` with the acquired fraction; a 3D bundle: the ky–kz points acquired), a ' +
          'multi-slice volume’s bundle (`header.volume.acquisition`: its slices are separate 2D acquisitions), ' +
          'or with several slices, contrasts or repetitions, or when the bundle’s NIfTI contradicts its header. ' +
          'A 3D acquisition (an ISMRMRD file or a 3D volume’s bundle) is stored with its partitions (nz > 1). ' +
          'Subject, study and free text of a ' +
          'header are never read, stored, logged or returned.',
        tags: ['raw'],
        response: {
          201: jsonResponse('The imported data (Location: its URL)', rawInfoResponse),
          ...problemResponses(400, 401, 413, 422, 429),
        },
      },
    },
    async (request, reply) => {
      const caller = tenancy(request);
      const signal = disconnectSignal(request, reply);
      const upload = await readRawUpload(request);
      const info =
        upload.kind === 'ismrmrd'
          ? await raw.upload(upload.file, caller, signal)
          : await raw.uploadBundle(upload.nifti, upload.header, caller, signal);
      return reply.code(201).header('location', info.url).send(info);
    },
  );

  storedInputRoutes(app, {
    path: '/v1/raw',
    kind: 'raw',
    tag: 'raw',
    noun: 'raw data',
    infoResponse: rawInfoResponse,
    info: (id, caller) => raw.info(id, caller),
    summaries: {
      get: 'Metadata of imported raw k-space',
      getResponse: 'The raw data’s numeric facts',
      delete: 'Delete imported raw k-space and everything made from it',
      deleteDescription:
        'Also deletes the reconstructions and plans that used it (plans cancelled first when queued ' +
        'or running) with their results; the samples are overwritten in the database file and its write-ahead log.',
    },
  });
}
