import type { FastifyDynamicSwaggerOptions } from '@fastify/swagger';
import type { FastifySwaggerUiOptions } from '@fastify/swagger-ui';
import { jsonSchemaTransform, jsonSchemaTransformObject } from 'fastify-type-provider-zod';

/** What a route adds to its OpenAPI entry beyond its zod schemas (non-JSON bodies). */
export interface OpenApiExtras {
  /** A multipart/form-data request body described as plain JSON Schema. */
  multipartBody?: Record<string, unknown>;
}

declare module 'fastify' {
  interface FastifyContextConfig {
    openapi?: OpenApiExtras;
  }
}

const pageResponse = {
  200: { description: 'The planner web page', content: { 'text/html': { schema: { type: 'string' } } } },
};

type TransformInput = Parameters<NonNullable<FastifyDynamicSwaggerOptions['transform']>>[0];

/**
 * zod → JSON Schema for every route (fastify-type-provider-zod), plus the few things zod cannot
 * say: multipart upload bodies and the web page (which the web plugin registers without a schema).
 */
function transform(input: TransformInput) {
  const { route, url } = input;
  const methods = Array.isArray(route.method) ? route.method : [route.method];
  if (url === '/' && methods.includes('GET')) {
    return { schema: { summary: 'The planner web page', tags: ['web'], response: pageResponse }, url };
  }
  const extras = route.config?.openapi;
  const jsonBody = jsonContentSchema(input.schema?.body);
  if (jsonBody !== undefined && extras?.multipartBody) {
    // A route taking JSON or multipart: fastify validates the JSON form only (a per-type body schema).
    const result = jsonSchemaTransform({ ...input, schema: { ...input.schema, body: jsonBody } });
    const content = {
      'application/json': { schema: result.schema.body },
      'multipart/form-data': { schema: extras.multipartBody },
    };
    return { schema: { ...result.schema, body: { content } }, url: result.url };
  }
  const result = jsonSchemaTransform(input);
  if (!extras?.multipartBody) return result;
  return {
    schema: { ...result.schema, body: extras.multipartBody, consumes: ['multipart/form-data'] },
    url: result.url,
  };
}

/** The application/json schema of a body given per content type (`{ content: { … } }`), if any. */
function jsonContentSchema(body: unknown): unknown {
  if (typeof body !== 'object' || body === null || !('content' in body)) return undefined;
  const { content } = body as { content: Record<string, { schema?: unknown } | undefined> };
  return content['application/json']?.schema;
}

export const swaggerOptions: FastifyDynamicSwaggerOptions = {
  openapi: {
    openapi: '3.1.0',
    info: {
      title: 'k-space planner',
      version: '1.0.0',
      description:
        'Plan undersampled MRI acquisitions: sampling masks, simulated reconstructions and their image ' +
        'error, scan time, and sweeps that trade one against the other. A research simulation tool, not ' +
        'for clinical use. Errors are RFC 9457 problem details (application/problem+json) with an ' +
        '`errors` list naming each bad field.',
      license: { name: 'MIT', identifier: 'MIT' },
    },
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    components: {
      securitySchemes: {
        apiKey: {
          type: 'apiKey',
          in: 'header',
          name: 'x-api-key',
          description: 'Needed when the server sets API_KEYS',
        },
        bearer: { type: 'http', scheme: 'bearer', description: 'The same key as a bearer token' },
      },
    },
    // Keys are optional on a loopback server (the empty requirement) and required otherwise.
    security: [{}, { apiKey: [] }, { bearer: [] }],
  },
  transform,
  transformObject: jsonSchemaTransformObject,
};

/** The interactive view at /docs: served from this server, under the project's own page title. */
export const swaggerUiOptions: FastifySwaggerUiOptions = {
  routePrefix: '/docs',
  staticCSP: true,
  theme: { title: 'k-space planner API' },
};
