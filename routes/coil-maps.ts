import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { COIL_LIMITS } from '../src/coils/index.ts';
import { type Limits, limitsId } from '../src/core/limits.ts';
import { withinLimit } from '../src/core/zod-problems.ts';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { fileOnlyMultipartBody, readFilePart } from '../src/http/multipart-file.ts';
import { jsonResponse, problemResponses } from '../src/http/problem.ts';
import { perLimits } from '../src/http/schemas.ts';
import { storedInputRoutes } from '../src/http/stored-input-routes.ts';
import { coilMapsInfoSchema } from '../src/services/index.ts';

const coilMapsInfoResponse = coilMapsInfoSchema.meta({
  id: 'CoilMapsInfo',
  description: 'Uploaded coil sensitivity maps (the values are kept as sent; the upload is not)',
});

const plane = (part: string) =>
  z
    .string()
    .describe(
      `${part} part: base64 (RFC 4648 §4, padded) of ny×nx little-endian float32, row-major, row 0 at the top; exactly 4·nx·ny bytes`,
    );

/** The JSON form, with the configured matrix limit on nx and ny and the coil count 1 … 32. */
const coilPlanesBody = perLimits((limits: Limits) => {
  const side = () => withinLimit(z.int().min(1), limits.maxMatrixSide);
  return z
    .strictObject({
      nx: side().describe('columns (readout, x)'),
      ny: side().describe('rows (phase encode, y)'),
      coils: z
        .array(z.strictObject({ re: plane('real'), im: plane('imaginary') }))
        .min(1)
        .max(COIL_LIMITS.maxCoils)
        .describe('one entry per coil, in coil order'),
    })
    .meta({ id: limitsId('CoilMapPlanes', limits, ['maxMatrixSide']) });
});

type CoilPlanesBody = z.infer<ReturnType<typeof coilPlanesBody>>;

/**
 * POST /v1/coil-maps (JSON planes or a multipart NIfTI file), GET and DELETE /v1/coil-maps/{id}
 * (the deletion cascades to what was made with the maps: src/jobs/lifecycle.ts). The maps are
 * stored as sent and never renormalised; file bytes and header strings are dropped.
 */
export async function coilMapRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { coilMaps, limits, tenancy } = app.services;

  r.post(
    '/v1/coil-maps',
    {
      config: {
        openapi: {
          multipartBody: fileOnlyMultipartBody(
            'single-file NIfTI-1/-2 (.nii, .nii.gz), coils along the last dimension: (x, y, coils) or ' +
              '(x, y, 1, coils); complex64 (datatype 32) or float32 (16, real maps); no scaling',
          ),
        },
      },
      schema: {
        summary: 'Upload coil sensitivity maps',
        description:
          'JSON (base64 float32 planes, within the JSON body limit) or multipart/form-data with a ' +
          'NIfTI file (within the upload limit). 1 … 32 coils; every value finite; no coil zero everywhere.',
        tags: ['coil-maps'],
        // Per content type: fastify validates the JSON form; the multipart form is read below.
        body: { content: { 'application/json': { schema: coilPlanesBody(limits) } } },
        response: {
          201: jsonResponse('The stored maps (Location: their URL)', coilMapsInfoResponse),
          ...problemResponses(400, 401, 413, 415, 422, 429),
        },
      },
    },
    async (request, reply) => {
      const caller = tenancy(request);
      const signal = disconnectSignal(request, reply);
      const info = request.isMultipart()
        ? await coilMaps.uploadNifti((await readFilePart(request, 'the NIfTI file')).bytes, caller, signal)
        : // The JSON form was validated against coilPlanesBody before the handler ran.
          await coilMaps.uploadPlanes(request.body as CoilPlanesBody, caller, signal);
      return reply.code(201).header('location', info.url).send(info);
    },
  );

  storedInputRoutes(app, {
    path: '/v1/coil-maps',
    kind: 'coilMaps',
    tag: 'coil-maps',
    noun: 'coil maps',
    infoResponse: coilMapsInfoResponse,
    info: (id, caller) => coilMaps.info(id, caller),
    summaries: {
      get: 'Metadata of uploaded coil maps',
      getResponse: 'The maps’ metadata',
      delete: 'Delete uploaded coil maps and everything made with them',
      deleteDescription:
        'Also deletes the reconstructions and plans that used them (plans cancelled first when ' +
        'queued or running) with their results; the values are overwritten in the database file ' +
        'and its write-ahead log.',
    },
  });
}
