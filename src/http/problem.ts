import type { FastifyReply } from 'fastify';
import { z } from 'zod';
import { boundEcho, boundFieldProblems, MAX_DETAIL_CHARS } from '../core/echo-bound.ts';
import type { FieldProblem } from '../core/errors.ts';

/** RFC 9457 media type for problem details. */
export const problemMediaType = 'application/problem+json';

export const fieldProblemSchema = z
  .object({
    field: z
      .string()
      .describe('Dotted path of the offending field in the request, e.g. "sampling.acceleration"'),
    message: z.string(),
    allowed: z.string().optional().describe('The allowed range or set, when there is one'),
  })
  .meta({ id: 'FieldProblem' });

/** RFC 9457 problem details, extended with `errors` (one entry per bad field). */
export const problemSchema = z
  .object({
    type: z.string().describe('URI reference naming the problem type'),
    title: z.string().describe('Short summary, the same for every occurrence of the type'),
    status: z.number().int().describe('HTTP status code of this response'),
    detail: z.string().describe('What went wrong this time'),
    instance: z.string().optional(),
    errors: z.array(fieldProblemSchema),
  })
  .meta({ id: 'Problem' });

export type Problem = z.infer<typeof problemSchema>;

interface ProblemKind {
  type: string;
  title: string;
  /** What the type means and what to do about it (served at the type URI). */
  description: string;
}

/** Problem types by status; `type` is a relative URI reference into the API documentation. */
export const problemKinds = {
  400: {
    type: '/problems/malformed-request',
    title: 'Malformed request',
    description:
      'The body is not valid JSON, or fields have the wrong type or are missing. `errors` names each field.',
  },
  401: {
    type: '/problems/unauthorized',
    title: 'Missing or invalid API key',
    description:
      'This server requires a key: send it as `x-api-key: <key>` or `Authorization: Bearer <key>`.',
  },
  404: {
    type: '/problems/not-found',
    title: 'Not found',
    description: 'No such route, or no resource with that id (image, result, plan, phantom).',
  },
  405: {
    type: '/problems/method-not-allowed',
    title: 'Method not allowed',
    description: 'The route exists for other methods.',
  },
  408: {
    type: '/problems/request-timeout',
    title: 'Request timeout',
    description: 'The request was not received completely in time; the connection is closed.',
  },
  409: {
    type: '/problems/conflict',
    title: 'Conflict with the resource state',
    description:
      'The resource is not in a state that allows this (e.g. the table of a plan that is not done yet).',
  },
  413: {
    type: '/problems/too-large',
    title: 'Request too large',
    description: 'The body or the uploaded file is larger than the configured limit.',
  },
  414: {
    type: '/problems/uri-too-long',
    title: 'URI too long',
    description: 'A path segment (an id or a name) is longer than the server accepts.',
  },
  415: {
    type: '/problems/unsupported-media',
    title: 'Unsupported or undecodable media',
    description:
      'The content type is not accepted, or the file is not a readable PNG, JPEG, TIFF, DICOM (native or RLE) or NIfTI image.',
  },
  422: {
    type: '/problems/out-of-range',
    title: 'Values out of range',
    description:
      'Well-formed, but values are outside their allowed range; each entry of `errors` gives `allowed`.',
  },
  429: {
    type: '/problems/queue-full',
    title: 'Too busy',
    description:
      'Too many plans queued or computations in flight; retry after the Retry-After header (seconds).',
  },
  431: {
    type: '/problems/headers-too-large',
    title: 'Request header fields too large',
    description: 'The request line and headers together exceed the size the server accepts (RFC 6585 §5).',
  },
  500: {
    type: '/problems/internal',
    title: 'Internal error',
    description: 'A fault of the service, not of the request; the x-request-id header finds it in the logs.',
  },
  503: {
    type: '/problems/unavailable',
    title: 'Service unavailable',
    description: 'The service is shutting down.',
  },
} satisfies Record<number, ProblemKind>;

export type ProblemStatus = keyof typeof problemKinds;

/** Limit violations share 422 but get their own type so clients can tell them apart. */
export const limitProblemKind: ProblemKind = {
  type: '/problems/limit-exceeded',
  title: 'Beyond configured limits',
  description:
    'Matrix side, iterations, plan cells, image size, k-space points or the decompressed size of an upload exceed the limits this server is configured with (422).',
};

/**
 * A representation the contract names but this server cannot produce (404 with its own type): the
 * acquisition as ISMRMRD HDF5, which no npm HDF5 library without a native build can write
 * (docs/design.md §4.11); the `Link` header points at the bundle that carries the same content.
 */
export const formatUnavailableProblemKind: ProblemKind = {
  type: '/problems/format-not-available',
  title: 'Format not available',
  description:
    'The resource exists but not in the requested file format on this server (404); the Link header and detail name the format that carries the same content.',
};

/** An error the HTTP layer turns into a problem+json response as it is. */
export class HttpProblem extends Error {
  override readonly name = 'HttpProblem';
  readonly status: ProblemStatus;
  readonly errors: FieldProblem[];
  readonly kind: ProblemKind;
  readonly headers: Record<string, string>;
  constructor(
    status: ProblemStatus,
    detail: string,
    errors: FieldProblem[] = [],
    options: { kind?: ProblemKind; headers?: Record<string, string> } = {},
  ) {
    super(detail);
    this.status = status;
    this.errors = errors;
    this.kind = options.kind ?? problemKinds[status];
    this.headers = options.headers ?? {};
  }
}

export function makeProblem(
  status: ProblemStatus,
  detail: string,
  errors: FieldProblem[] = [],
  kind?: ProblemKind,
): Problem {
  const { type, title } = kind ?? problemKinds[status];
  // Details echo request parts (names, ids, keys): bounded so a huge input is not sent back whole.
  return {
    type,
    title,
    status,
    detail: boundEcho(detail, MAX_DETAIL_CHARS),
    errors: boundFieldProblems(errors),
  };
}

export function sendProblem(
  reply: FastifyReply,
  problem: Problem,
  headers: Record<string, string> = {},
): FastifyReply {
  for (const [name, value] of Object.entries(headers)) reply.header(name, value);
  return reply.code(problem.status).type(problemMediaType).send(problem);
}

/** Response-schema entries for the problem statuses a route can answer (for the OpenAPI contract). */
export function problemResponses(...statuses: ProblemStatus[]): Record<number, unknown> {
  const out: Record<number, unknown> = {};
  for (const status of statuses) {
    out[status] = {
      description: problemKinds[status].title,
      content: { [problemMediaType]: { schema: problemSchema } },
    };
  }
  return out;
}

/** A JSON response entry with its own description (a bare schema would be documented as "Default Response"). */
export function jsonResponse<S>(
  description: string,
  schema: S,
): { description: string; content: { 'application/json': { schema: S } } } {
  return { description, content: { 'application/json': { schema } } };
}
