import type { FastifyReply } from 'fastify';
import { z } from 'zod';
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
}

/** Problem types by status; `type` is a relative URI reference into the API documentation. */
export const problemKinds = {
  400: { type: '/problems/malformed-request', title: 'Malformed request' },
  401: { type: '/problems/unauthorized', title: 'Missing or invalid API key' },
  404: { type: '/problems/not-found', title: 'Not found' },
  405: { type: '/problems/method-not-allowed', title: 'Method not allowed' },
  409: { type: '/problems/conflict', title: 'Conflict with the resource state' },
  413: { type: '/problems/too-large', title: 'Request too large' },
  415: { type: '/problems/unsupported-media', title: 'Unsupported or undecodable media' },
  422: { type: '/problems/out-of-range', title: 'Values out of range' },
  429: { type: '/problems/queue-full', title: 'Too many plans queued' },
  500: { type: '/problems/internal', title: 'Internal error' },
  503: { type: '/problems/unavailable', title: 'Service unavailable' },
} satisfies Record<number, ProblemKind>;

export type ProblemStatus = keyof typeof problemKinds;

/** Limit violations share 422 but get their own type so clients can tell them apart. */
export const limitProblemKind: ProblemKind = {
  type: '/problems/limit-exceeded',
  title: 'Beyond configured limits',
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
  return { type, title, status, detail, errors };
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
