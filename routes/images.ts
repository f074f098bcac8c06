import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { ValidationError } from '../src/core/errors.ts';
import { cursorAfter, listLimit, listQuery, pageSchema } from '../src/http/list-query.ts';
import { readFilePart } from '../src/http/multipart-file.ts';
import { jsonResponse, problemResponses } from '../src/http/problem.ts';
import { storedInputRoutes } from '../src/http/stored-input-routes.ts';
import { imageInfoSchema } from '../src/services/index.ts';

const imageInfoResponse = imageInfoSchema.meta({
  id: 'ImageInfo',
  description: 'An uploaded image (decoded pixels only; the original file is not kept)',
});

const imageListResponse = pageSchema(imageInfoResponse).meta({ id: 'ImageList' });

const uploadQuery = z.object({
  frame: z.coerce
    .number()
    .int()
    .min(0)
    .optional()
    .describe('DICOM multi-frame frame or TIFF page (0-based, default 0)'),
  slice: z.coerce
    .number()
    .int()
    .min(0)
    .optional()
    .describe('NIfTI slice along the 3rd axis (0-based, default the middle)'),
  volume: z.coerce
    .number()
    .int()
    .min(0)
    .optional()
    .describe('NIfTI volume along the 4th axis (0-based, default 0)'),
  slices: z
    .enum(['one', 'all'])
    .optional()
    .describe(
      "NIfTI: 'all' also keeps every slice of the chosen volume, a source for volume requests (matrix.nz); " +
        "default 'one'",
    ),
});

/**
 * POST /v1/images (multipart, one part named `file`), GET and DELETE /v1/images/{id} (the deletion
 * cascades to what was made from the image: src/jobs/lifecycle.ts).
 * Only decoded pixels and whitelisted format facts are stored; the uploaded bytes, the file name
 * and every header string are dropped, so no patient identifier is ever stored, logged or returned.
 */
export async function imageRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { uploads, tenancy } = app.services;

  r.post(
    '/v1/images',
    {
      config: {
        openapi: {
          multipartBody: {
            type: 'object',
            required: ['file'],
            properties: {
              frame: {
                type: 'integer',
                minimum: 0,
                description: 'as the query parameter; must precede the file part',
              },
              slice: {
                type: 'integer',
                minimum: 0,
                description: 'as the query parameter; must precede the file part',
              },
              volume: {
                type: 'integer',
                minimum: 0,
                description: 'as the query parameter; must precede the file part',
              },
              slices: {
                type: 'string',
                enum: ['one', 'all'],
                description: 'as the query parameter; must precede the file part',
              },
              file: {
                type: 'string',
                format: 'binary',
                description:
                  'PNG, JPEG, TIFF (8/16-bit; colour → luminance), DICOM Part 10, NIfTI-1/-2 (.nii, .nii.gz)',
              },
            },
          },
        },
      },
      schema: {
        summary: 'Upload an image to use as a source',
        tags: ['images'],
        querystring: uploadQuery,
        response: {
          201: jsonResponse('The decoded image (Location: its URL)', imageInfoResponse),
          ...problemResponses(400, 401, 413, 415, 422, 429),
        },
      },
    },
    async (request, reply) => {
      const { bytes, fields } = await readFilePart(request, 'the image');
      const choice = { ...request.query, ...formChoices(fields) };
      const info = await uploads.upload(bytes, choice, tenancy(request));
      return reply.code(201).header('location', info.url).send(info);
    },
  );

  r.get(
    '/v1/images',
    {
      schema: {
        summary: "The caller's uploads, newest first, a page at a time (metadata only)",
        description:
          'Each item is what GET /v1/images/{id} answers: size, format facts and statistics, never pixels ' +
          'or patient data. Pages follow `next` (an opaque cursor); uploads made meanwhile do not shift them.',
        tags: ['images'],
        querystring: listQuery,
        response: {
          200: jsonResponse('One page of uploads', imageListResponse),
          ...problemResponses(401, 422),
        },
      },
    },
    async (request) => {
      const { limit, cursor } = request.query;
      const page = uploads.list(tenancy(request), {
        limit: limit ?? listLimit.default,
        ...(cursor === undefined ? {} : { after: cursor }),
      });
      return { items: page.items, next: cursorAfter(page.after) };
    },
  );

  storedInputRoutes(app, {
    path: '/v1/images',
    kind: 'image',
    tag: 'images',
    noun: 'image',
    infoResponse: imageInfoResponse,
    info: (id, caller) => uploads.info(id, caller),
    summaries: {
      get: 'Metadata of an uploaded image',
      getResponse: 'The image metadata',
      delete: 'Delete an uploaded image and everything made from it',
      deleteDescription:
        'Also deletes the reconstructions made from it and the plans using it as their source ' +
        '(cancelled first when queued or running) with their results; the pixels are overwritten ' +
        'in the database file and its write-ahead log.',
    },
  });
}

/**
 * frame / slice / volume may also come as form fields placed before the file part
 * (`curl -F slice=3 -F file=@brain.nii`); they are checked by the same schema as the query.
 */
function formChoices(fields: Record<string, unknown>): z.infer<typeof uploadQuery> {
  const raw: Record<string, unknown> = {};
  for (const name of ['frame', 'slice', 'volume', 'slices'] as const) {
    const field = fields[name] as { type?: string; value?: unknown } | undefined;
    if (field?.type === 'field') raw[name] = field.value;
  }
  const parsed = uploadQuery.safeParse(raw);
  if (!parsed.success) {
    throw new ValidationError(
      parsed.error.issues.map((issue) => ({
        field: issue.path.join('.'),
        message: issue.message,
        allowed: issue.path[0] === 'slices' ? "'one' | 'all'" : 'an integer ≥ 0',
      })),
    );
  }
  return Object.fromEntries(Object.entries(parsed.data).filter(([, v]) => v !== undefined));
}
