import type { FastifyError, FastifyInstance, FastifySchemaValidationError } from 'fastify';
import { hasZodFastifySchemaValidationErrors } from 'fastify-type-provider-zod';
import type { z } from 'zod';
import { type FieldProblem, KnownError } from '../core/errors.ts';
import { allowedText, isLimitIssue } from '../core/zod-problems.ts';
import {
  HttpProblem,
  limitProblemKind,
  makeProblem,
  type ProblemStatus,
  problemKinds,
  sendProblem,
} from './problem.ts';

/** zod issue codes that mean "wrong shape or type" (400); every other code is a bad value (422). */
const shapeIssueCodes = new Set([
  'invalid_type',
  'unrecognized_keys',
  'invalid_key',
  'invalid_element',
  'invalid_union',
]);

/** One issue as the zod type provider reports it (ajv's shape: keyword, instancePath, params). */
type ValidationIssue = FastifySchemaValidationError;

/** JSON-pointer path → the request's notation: keys dotted, array indices in brackets (`patterns[0].acs`). */
function dottedPath(instancePath: string, context: string | undefined): string {
  const path = instancePath.split('/').filter((part) => part.length > 0);
  if (path.length === 0) return context ?? 'body';
  let out = '';
  for (const part of path) out += /^\d+$/.test(part) ? `[${part}]` : out === '' ? part : `.${part}`;
  return out;
}

/** The type provider's issue back in zod's own form, for the one converter (src/core/zod-problems.ts). */
function zodIssueOf(issue: ValidationIssue): z.core.$ZodIssue {
  const fields: object = {
    ...issue.params,
    code: issue.keyword,
    message: issue.message,
    path: [],
  };
  return fields as z.core.$ZodIssue;
}

/** Maps the type provider's zod issues to field problems and picks 400 (shape) or 422 (values). */
export function classifyValidation(
  issues: readonly ValidationIssue[],
  context: string | undefined,
): { status: 400 | 422; errors: FieldProblem[]; limit: boolean } {
  let shape = false;
  // Only configured limits (matrix side, iterations, plan cells) broken: /problems/limit-exceeded.
  const limit = issues.length > 0 && issues.every((issue) => isLimitIssue(zodIssueOf(issue)));
  const errors: FieldProblem[] = [];
  for (const issue of issues) {
    // An unknown key is named by its own path (`sampling.density.powr`), one entry per key.
    if (issue.keyword === 'unrecognized_keys' && Array.isArray(issue.params.keys)) {
      shape = true;
      for (const key of issue.params.keys) {
        errors.push({
          field: dottedPath(`${issue.instancePath}/${String(key)}`, context),
          message: 'unknown field',
          allowed: 'the documented fields only',
        });
      }
      continue;
    }
    let field = dottedPath(issue.instancePath, context);
    let isShape = shapeIssueCodes.has(issue.keyword);
    // A discriminated union that meets an unknown tag is a bad value, not a bad shape.
    if (issue.keyword === 'invalid_union' && typeof issue.params.discriminator === 'string') {
      const tag = issue.params.discriminator;
      if (field === (context ?? 'body')) field = tag;
      else if (!field.endsWith(`.${tag}`) && field !== tag) field = `${field}.${tag}`;
      isShape = false;
    }
    shape ||= isShape;
    const allowed = allowedText(zodIssueOf(issue));
    // zod gives every issue a message; the fallback only satisfies fastify's optional field.
    const message = issue.message ?? 'invalid value';
    errors.push(allowed === undefined ? { field, message } : { field, message, allowed });
  }
  return { status: shape ? 400 : 422, errors, limit };
}

const fastifyStatusByCode: Record<string, ProblemStatus> = {
  FST_INVALID_MULTIPART_CONTENT_TYPE: 415,
  FST_ERR_CTP_INVALID_MEDIA_TYPE: 415,
  FST_ERR_CTP_INVALID_CONTENT_LENGTH: 400,
  FST_ERR_CTP_BODY_TOO_LARGE: 413,
  FST_REQ_FILE_TOO_LARGE: 413,
  FST_FILES_LIMIT: 413,
  FST_PARTS_LIMIT: 413,
  FST_FIELDS_LIMIT: 413,
  FST_PROTO_VIOLATION: 400,
  FST_ERR_CTP_EMPTY_JSON_BODY: 400,
  FST_ERR_CTP_INVALID_JSON_BODY: 400,
};

/** Installs the RFC 9457 error and not-found handlers: a bad request never becomes a 500. */
export function installErrorHandling(app: FastifyInstance): void {
  app.setErrorHandler((error: FastifyError | Error, request, reply) => {
    if (error instanceof HttpProblem) {
      return sendProblem(
        reply,
        makeProblem(error.status, error.message, error.errors, error.kind),
        error.headers,
      );
    }
    if (error instanceof KnownError) {
      // Each known error carries its answer (src/core/errors.ts); limits get their own problem type.
      const { detail, errors, headers } = error.problem();
      const kind = error.kind === 'limit' ? limitProblemKind : undefined;
      return sendProblem(reply, makeProblem(error.status, detail, errors, kind), headers);
    }
    if (hasZodFastifySchemaValidationErrors(error)) {
      const context = error.validationContext;
      const { status, errors, limit } = classifyValidation(error.validation, context);
      if (limit) {
        const message = errors.map((p) => `${p.field}: ${p.message}`).join('; ');
        return sendProblem(reply, makeProblem(422, message, errors, limitProblemKind));
      }
      const detail =
        status === 400
          ? `the ${context ?? 'request'} does not have the expected shape or types`
          : `the ${context ?? 'request'} has values out of range`;
      return sendProblem(reply, makeProblem(status, detail, errors));
    }
    const code = (error as FastifyError).code;
    const mapped = code ? fastifyStatusByCode[code] : undefined;
    const statusCode = (error as FastifyError).statusCode;
    const status: number = mapped ?? (statusCode && statusCode >= 400 && statusCode < 500 ? statusCode : 500);
    if (status >= 500) {
      request.log.error({ err: error }, 'unhandled error');
      return sendProblem(
        reply,
        makeProblem(500, 'an internal error occurred; the request id is in the logs'),
      );
    }
    const known = status in problemKinds ? (status as ProblemStatus) : 400;
    const field = known === 413 || known === 415 ? 'file' : 'body';
    const message =
      error instanceof SyntaxError || code === 'FST_ERR_CTP_INVALID_JSON_BODY'
        ? 'malformed JSON'
        : error.message;
    return sendProblem(reply, makeProblem(known, message, [{ field, message }]));
  });

  app.setNotFoundHandler((request, reply) => {
    sendProblem(
      reply,
      makeProblem(404, `no route ${request.method} ${request.url.split('?')[0]}`, [
        { field: 'url', message: 'unknown route' },
      ]),
    );
  });
}
