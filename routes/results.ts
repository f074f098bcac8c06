import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { sendBytes, sendPng } from '../src/http/png-reply.ts';
import { formatUnavailableProblemKind, HttpProblem, problemResponses } from '../src/http/problem.ts';
import { idParams } from '../src/http/schemas.ts';
import { niftiFloat32Volumes } from '../src/io/nifti-writer.ts';
import type { ResultArray } from '../src/jobs/store.ts';
import { greyPng } from '../src/render/png.ts';
import {
  acquisitionJson,
  acquisitionNifti,
  acquisitionUrls,
  resultImageNames,
} from '../src/services/index.ts';

const names = Object.values(resultImageNames);

/** Images kept at full precision (result-arrays.ts), in the order images.nii stacks them. */
const fullPrecision = [
  resultImageNames.reconstruction,
  resultImageNames.zeroFilled,
  resultImageNames.reference,
  resultImageNames.errorMap,
  resultImageNames.gFactor,
];

const depthQuery = z.strictObject({
  depth: z
    .enum(['8', '16'])
    .optional()
    .describe(
      `bits per grey level (default 8); 16 for ${fullPrecision.join(', ')} of reconstructions: round(65535·v/white)`,
    ),
});

const imageParams = z.object({
  id: z.string().min(1).max(200).describe('Result id (a reconstruction or a mask)'),
  image: z
    .string()
    .min(1)
    .max(40)
    .describe(`One of ${names.join(', ')}`),
});

/** The plane a PNG shows of a stored array: the image, or a volume's central z-slice as its PNGs show it. */
function pngPlane(array: ResultArray): { nx: number; ny: number; data: Float64Array } {
  const { nx, ny, nz = 1 } = array;
  const start = Math.floor(nz / 2) * nx * ny;
  return { nx, ny, data: Float64Array.from(array.data.subarray(start, start + nx * ny)) };
}

function notFound(id: string): HttpProblem {
  return new HttpProblem(404, `no result ${id}`, [{ field: 'id', message: 'unknown result id' }]);
}

/**
 * GET /v1/results/{id}/{image}.png: images stored with a result (SQLite, so they survive restarts).
 * Reconstructions have all six (receive arrays add coil-maps, and g-factor where it applies); masks have
 * mask and psf. DELETE /v1/results/{id} removes a result.
 */
export async function resultRoutes(app: FastifyInstance): Promise<void> {
  const { store, lifecycle, tenancy } = app.services;
  const r = app.withTypeProvider<ZodTypeProvider>();

  r.delete(
    '/v1/results/:id',
    {
      schema: {
        summary: 'Delete a result (a reconstruction or a mask) with its images',
        tags: ['results'],
        params: idParams,
        response: { 204: z.null().describe('Deleted'), ...problemResponses(401, 404) },
      },
    },
    async (request, reply) => {
      if (!lifecycle.delete('result', request.params.id, tenancy(request).scope)) {
        throw notFound(request.params.id);
      }
      return reply.code(204).send(null);
    },
  );

  r.get(
    '/v1/results/:id/:image.png',
    {
      schema: {
        summary: 'A result image as PNG: reconstruction, zero-filled, reference, error-map, mask or psf',
        description:
          'Magnitude images are 8-bit grey scaled to the reference maximum (the error map to its own ' +
          'maximum); the PSF on a log scale over 3 decades; the mask 255 = acquired. A reconstruction ' +
          'with lesions also has lesions (the reconstruction of the data with the lesions, on the same grey scale).',
        tags: ['results'],
        params: imageParams,
        querystring: depthQuery,
        response: {
          200: {
            description:
              'PNG image. With depth=16: 16-bit grey, level round(65535·min(max(v, 0), white)/white) on the ' +
              'same scale as the 8-bit image (white: the reference maximum for magnitudes, its own ' +
              'maximum for the error map), stated in the X-Grey-White header (the value shown white, in the ' +
              "reconstruction's units) and X-Grey-Scale (linear)",
            headers: {
              'x-grey-white': {
                schema: { type: 'number' },
                description: 'depth=16: the value shown as 65535',
              },
              'x-grey-scale': { schema: { type: 'string' }, description: 'depth=16: linear' },
            },
            content: { 'image/png': { schema: z.string().describe('PNG bytes') } },
          },
          ...problemResponses(401, 404, 422),
        },
      },
    },
    async (request, reply) => {
      const { id, image } = request.params;
      const { scope } = tenancy(request);
      if (request.query.depth === '16') {
        const array = store.getResultArrays(id, scope).get(image);
        if (!array) {
          if (store.getResult(id, scope) === undefined) throw notFound(id);
          throw new HttpProblem(422, `result ${id} has no 16-bit ${image} image`, [
            {
              field: 'depth',
              message: `16 bits are kept for reconstructions' ${fullPrecision.join(', ')}`,
              allowed: '8',
            },
          ]);
        }
        const png = await greyPng(pngPlane(array), { bits: 16, max: array.white });
        reply.header('x-grey-white', String(array.white)).header('x-grey-scale', 'linear');
        return sendPng(reply.header('cache-control', 'private, max-age=86400, immutable'), png);
      }
      const png = (names as readonly string[]).includes(image)
        ? store.getResultImage(id, image, scope)
        : undefined;
      if (!png) {
        if (store.getResult(id, scope) === undefined) throw notFound(id);
        throw new HttpProblem(404, `result ${id} has no image ${image}`, [
          { field: 'image', message: 'unknown image', allowed: names.join(', ') },
        ]);
      }
      return sendPng(reply.header('cache-control', 'private, max-age=86400, immutable'), png);
    },
  );

  r.get(
    '/v1/results/:id/images.nii',
    {
      schema: {
        summary: 'A reconstruction’s images at full precision as one float32 NIfTI-1 file',
        description:
          `Single-file NIfTI-1 (.nii), float32, dim = [4, nx, ny, nz, volumes] (nz = 1 for 2D results; a ` +
          'volume result, matrix.nz > 1, has its whole nx × ny × nz volumes, k the slice index z): the volumes along the 4th ' +
          `dimension in the order ${fullPrecision.join(', ')} (g-factor only where one applies; the order is ` +
          'also in the X-Volumes header and the descrip field). Values in the reconstruction’s own units ' +
          '(magnitudes, no scaling: scl_slope 0); voxel (i, j) is image column i, row ny − 1 − j (j upward); ' +
          'unit voxel sizes, no orientation (qform_code = sform_code = 0).',
        tags: ['results'],
        params: idParams,
        response: {
          200: {
            description: 'NIfTI-1 bytes',
            headers: {
              'x-volumes': {
                schema: { type: 'string' },
                description: 'volume names in order, comma separated',
              },
            },
            content: { 'application/octet-stream': { schema: z.string().describe('NIfTI-1 bytes') } },
          },
          ...problemResponses(401, 404),
        },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      const arrays = store.getResultArrays(id, tenancy(request).scope);
      if (arrays.size === 0) {
        if (store.getResult(id, tenancy(request).scope) === undefined) throw notFound(id);
        throw new HttpProblem(404, `result ${id} has no full-precision images`, [
          {
            field: 'id',
            message: 'only reconstructions stored since full-precision images were added have them',
          },
        ]);
      }
      const order = fullPrecision.filter((name) => arrays.has(name));
      const nifti = niftiFloat32Volumes(
        order.map((name) => arrays.get(name)!),
        `kspace-planner: ${order.join(',')}`,
      );
      reply
        .header('x-volumes', order.join(','))
        .header('content-disposition', `attachment; filename="${id}-images.nii"`)
        .header('cache-control', 'private, max-age=86400, immutable');
      return sendBytes(reply, 'application/octet-stream', nifti);
    },
  );

  /** The stored acquisition of a reconstruction the caller may see, or the 404 that says why not. */
  const acquisitionOf = (id: string, scope: ReturnType<typeof tenancy>['scope']) => {
    const stored = store.getResultAcquisition(id, scope);
    if (stored) return stored;
    if (store.getResult(id, scope) === undefined) throw notFound(id);
    throw new HttpProblem(404, `result ${id} has no stored acquisition`, [
      {
        field: 'id',
        message: 'only reconstructions stored since acquisitions were kept have one (masks never do)',
      },
    ]);
  };

  r.get(
    '/v1/results/:id/acquisition.nii',
    {
      schema: {
        summary: 'The acquired k-space of a reconstruction as a complex64 NIfTI-1 file',
        description:
          'What the reconstruction method was given (after noise and prewhitening), coil as the last ' +
          'dimension. Cartesian: dim = [4, nx, ny, 1, coils], voxel (u, v, 0, c) = k-space column u ' +
          '(kx = u − ⌊nx/2⌋), row v (ky = ⌊ny/2⌋ − v), zeros where not acquired; non-Cartesian: ' +
          'dim = [4, samples per readout, readouts, 1, coils] in acquisition order. Volumes (one coil): ' +
          'dim = [4, nx, ny, nz, 1], 3D k-space (kz = w − ⌊nz/2⌋) or the k-space of every z-slice (multi-slice). ' +
          'acquisition.json carries the header (mask table or trajectory, noise, seed, scaling).',
        tags: ['results'],
        params: idParams,
        response: {
          200: {
            description: 'NIfTI-1 bytes (datatype 32, complex64)',
            content: { 'application/octet-stream': { schema: z.string().describe('NIfTI-1 bytes') } },
          },
          ...problemResponses(401, 404),
        },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      const nifti = acquisitionNifti(acquisitionOf(id, tenancy(request).scope));
      reply
        .header('content-disposition', `attachment; filename="${id}-acquisition.nii"`)
        .header('link', `<${acquisitionUrls(id).json}>; rel="describedby"; type="application/json"`)
        .header('cache-control', 'private, max-age=86400, immutable');
      return sendBytes(reply, 'application/octet-stream', nifti);
    },
  );

  r.get(
    '/v1/results/:id/acquisition.json',
    {
      schema: {
        summary: 'The header of a reconstruction’s acquisition bundle',
        description:
          'Matrix, field of view, coils, the layout of acquisition.nii, noise (prewhitened, variance ' +
          'per complex sample, covariance form, seed), the sampling summary, the ordering and the ' +
          'sample table (Cartesian: order,ky,kx grid indices relative to the centre; non-Cartesian: ' +
          'order,kx,ky in cycles per FOV), the scaling and how the zero-filled image is formed. ' +
          'Format: docs/design.md §4.11.',
        tags: ['results'],
        params: idParams,
        response: {
          200: {
            description: 'The acquisition header',
            content: { 'application/json': { schema: z.looseObject({}).describe('acquisition header') } },
          },
          ...problemResponses(401, 404),
        },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      const body = acquisitionJson(id, acquisitionOf(id, tenancy(request).scope));
      return reply
        .header('cache-control', 'private, max-age=86400, immutable')
        .type('application/json')
        .send(body);
    },
  );

  r.get(
    '/v1/results/:id/acquisition.h5',
    {
      schema: {
        summary: 'The acquisition as ISMRMRD HDF5: not available on this server (404 with a Link)',
        description:
          'ISMRMRD stores each readout as a compound record holding variable-length arrays, which ' +
          'h5wasm 0.10.3 cannot write (no npm HDF5 library without a native build can). The answer is ' +
          `a 404 of type ${formatUnavailableProblemKind.type} whose Link header names acquisition.nii ` +
          'and acquisition.json, which carry the same content (docs/design.md §4.11).',
        tags: ['results'],
        params: idParams,
        response: { ...problemResponses(401, 404) },
      },
    },
    async (request) => {
      const { id } = request.params;
      acquisitionOf(id, tenancy(request).scope);
      const urls = acquisitionUrls(id);
      throw new HttpProblem(
        404,
        `the acquisition of ${id} is not available as ISMRMRD HDF5 on this server; ` +
          `the same content is at ${urls.nifti} (samples) and ${urls.json} (header)`,
        [{ field: 'id', message: 'ISMRMRD export is not available', allowed: `${urls.nifti}, ${urls.json}` }],
        {
          kind: formatUnavailableProblemKind,
          headers: {
            link: `<${urls.nifti}>; rel="alternate"; type="application/octet-stream", <${urls.json}>; rel="describedby"; type="application/json"`,
          },
        },
      );
    },
  );
}
