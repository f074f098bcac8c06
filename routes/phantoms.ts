import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { LimitError } from '../src/core/errors.ts';
import type { Limits } from '../src/core/limits.ts';
import { validateMatrix } from '../src/core/matrix.ts';
import { preferredType } from '../src/http/accept.ts';
import { disconnectSignal } from '../src/http/disconnect-signal.ts';
import { sendPng } from '../src/http/png-reply.ts';
import { HttpProblem, jsonResponse, problemResponses } from '../src/http/problem.ts';
import { listPhantoms } from '../src/phantoms/index.ts';

const phantomInfoSchema = z.object({ name: z.string(), description: z.string() }).meta({ id: 'PhantomInfo' });
const phantomListSchema = z.object({ phantoms: z.array(phantomInfoSchema) }).meta({ id: 'PhantomList' });

const nameParams = z.object({
  name: z.string().min(1).max(100).describe('Phantom name, from GET /v1/phantoms'),
});

// Strict like the bodies: a misspelt `supersampl` is refused, not silently left at its default.
const rasterQuery = z.strictObject({
  nx: z.coerce.number().int().min(2).max(65_536).default(256).describe('columns (default 256)'),
  ny: z.coerce.number().int().min(2).max(65_536).default(256).describe('rows (default 256)'),
  supersample: z.coerce
    .number()
    .int()
    .min(1)
    .max(8)
    .default(1)
    .describe('ss×ss box average per pixel (default 1: pixel centres)'),
});

const rasterJsonSchema = z
  .object({
    name: z.string(),
    nx: z.int(),
    ny: z.int(),
    data: z.array(z.number()).describe('ny·nx intensities, row-major, row 0 at the top (largest y)'),
  })
  .meta({ id: 'PhantomRaster' });

const kspaceBodies = new Map<number, z.ZodType>();

/** The body schema with the configured points limit as maxItems, so the contract shows it. */
function kspaceBody(maxPoints: number) {
  const cached = kspaceBodies.get(maxPoints);
  if (cached) return cached as ReturnType<typeof buildKspaceBody>;
  const schema = buildKspaceBody(maxPoints);
  kspaceBodies.set(maxPoints, schema);
  return schema;
}

function buildKspaceBody(maxPoints: number) {
  return z
    .strictObject({
      points: z
        .array(z.tuple([z.number(), z.number()]))
        .min(1)
        .max(maxPoints)
        .describe(
          `[kx, ky] in cycles per unit of the phantom frame ([−1, 1]², y up); at most ${maxPoints} ` +
            '(MAX_KSPACE_POINTS), more is a 422 of type /problems/limit-exceeded',
        ),
    })
    .meta({ id: 'KspacePoints' });
}

/** Refuses too many points before the body is validated point by point (that alone is real work). */
function checkKspacePoints(body: unknown, limits: Limits): void {
  const points = (body as { points?: unknown } | null)?.points;
  if (Array.isArray(points) && points.length > limits.maxKspacePoints) {
    throw new LimitError({
      field: 'points',
      message: `${points.length} points is more than the configured limit`,
      allowed: `at most ${limits.maxKspacePoints} points`,
    });
  }
}

const kspaceResponse = z
  .object({
    values: z.array(z.tuple([z.number(), z.number()])).describe('[re, im] of the exact transform per point'),
  })
  .meta({ id: 'KspaceValues' });

function known(name: string): void {
  if (!listPhantoms().some((p) => p.name === name)) {
    throw new HttpProblem(404, `no phantom ${JSON.stringify(name)}`, [
      {
        field: 'name',
        message: 'unknown phantom',
        allowed: listPhantoms()
          .map((p) => p.name)
          .join(', '),
      },
    ]);
  }
}

/** GET /v1/phantoms, GET /v1/phantoms/{name} (PNG or JSON), POST /v1/phantoms/{name}/kspace. */
export async function phantomRoutes(app: FastifyInstance): Promise<void> {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { limits, phantoms } = app.services;

  r.get(
    '/v1/phantoms',
    {
      schema: {
        summary: 'The analytic phantoms',
        tags: ['phantoms'],
        response: { 200: jsonResponse('The phantoms', phantomListSchema), ...problemResponses(401) },
      },
    },
    async () => ({ phantoms: listPhantoms() }),
  );

  r.get(
    '/v1/phantoms/:name',
    {
      schema: {
        summary: 'A phantom rasterised on ny×nx: 16-bit grey PNG, or JSON with Accept: application/json',
        tags: ['phantoms'],
        params: nameParams,
        querystring: rasterQuery,
        response: {
          200: {
            description: 'The raster',
            content: {
              'image/png': { schema: z.string().describe('16-bit grey PNG, scaled to the raster peak') },
              'application/json': { schema: rasterJsonSchema },
            },
          },
          ...problemResponses(400, 401, 404, 422, 429),
        },
      },
    },
    async (request, reply) => {
      const { name } = request.params;
      known(name);
      const { nx, ny, supersample } = request.query;
      validateMatrix({ nx, ny }, limits);
      const raster = { name, nx, ny, supersample };
      const signal = disconnectSignal(request, reply);
      if (preferredType(request, ['image/png', 'application/json']) === 'application/json') {
        const image = await phantoms.raster(raster, signal);
        return reply.type('application/json').send({ name, nx, ny, data: Array.from(image.data) });
      }
      return sendPng(reply, await phantoms.rasterPng(raster, signal));
    },
  );

  r.post(
    '/v1/phantoms/:name/kspace',
    {
      schema: {
        summary: 'Exact analytic k-space of a phantom at arbitrary points',
        tags: ['phantoms'],
        params: nameParams,
        body: kspaceBody(limits.maxKspacePoints),
        response: {
          200: jsonResponse('Exact transform values, one per point', kspaceResponse),
          ...problemResponses(400, 401, 404, 413, 422, 429),
        },
      },
      preValidation: async (request) => checkKspacePoints(request.body, limits),
    },
    async (request, reply) => {
      const { name } = request.params;
      known(name);
      const { points } = request.body;
      const kx = new Float64Array(points.length);
      const ky = new Float64Array(points.length);
      points.forEach(([x, y], i) => {
        kx[i] = x;
        ky[i] = y;
      });
      // Up to MAX_KSPACE_POINTS points × every shape: on a worker, not the event loop.
      const values = await phantoms.kspace(name, kx, ky, disconnectSignal(request, reply));
      return { values: points.map((_, i) => [values[2 * i], values[2 * i + 1]] as [number, number]) };
    },
  );
}
