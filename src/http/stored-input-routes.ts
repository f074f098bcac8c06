import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { InputKind } from '../jobs/store.ts';
import { HttpProblem, jsonResponse, problemResponses } from './problem.ts';
import { idParams } from './schemas.ts';
import type { Tenancy } from './tenant.ts';

/** What GET and DELETE of one kind of stored input (an upload) need to know. */
export interface StoredInputRoutes<S extends z.ZodType> {
  /** The collection path, e.g. `/v1/images`; the routes are `${path}/:id`. */
  path: string;
  kind: InputKind;
  tag: string;
  /** How the problems name one entry: `image`, `coil maps`. */
  noun: string;
  infoResponse: S;
  info: (id: string, caller: Tenancy) => z.output<S> | undefined;
  summaries: { get: string; getResponse: string; delete: string; deleteDescription: string };
}

/**
 * GET `${path}/{id}` (metadata the caller may see) and DELETE `${path}/{id}` (the entry and
 * everything made from it, src/jobs/lifecycle.ts); an id unknown to the caller is 404 on `id`.
 */
export function storedInputRoutes<S extends z.ZodType>(
  app: FastifyInstance,
  spec: StoredInputRoutes<S>,
): void {
  const r = app.withTypeProvider<ZodTypeProvider>();
  const { lifecycle, tenancy } = app.services;
  // Widened here: the type provider cannot resolve a reply type from a generic schema.
  const infoResponse: z.ZodType = spec.infoResponse;
  const notFound = (id: string) =>
    new HttpProblem(404, `no uploaded ${spec.noun} ${id}`, [
      { field: 'id', message: `unknown ${spec.noun} id` },
    ]);

  r.get(
    `${spec.path}/:id`,
    {
      schema: {
        summary: spec.summaries.get,
        tags: [spec.tag],
        params: idParams,
        response: {
          200: jsonResponse(spec.summaries.getResponse, infoResponse),
          ...problemResponses(401, 404),
        },
      },
    },
    async (request) => {
      const info = spec.info(request.params.id, tenancy(request));
      if (!info) throw notFound(request.params.id);
      return info;
    },
  );

  r.delete(
    `${spec.path}/:id`,
    {
      schema: {
        summary: spec.summaries.delete,
        description: spec.summaries.deleteDescription,
        tags: [spec.tag],
        params: idParams,
        response: { 204: z.null().describe('Deleted'), ...problemResponses(401, 404) },
      },
    },
    async (request, reply) => {
      if (!lifecycle.delete(spec.kind, request.params.id, tenancy(request).scope)) {
        throw notFound(request.params.id);
      }
      return reply.code(204).send(null);
    },
  );
}
