import type { z } from 'zod';
import { type FieldProblem, LimitError, ValidationError } from './errors.ts';

/**
 * The one converter from zod issues to field problems, used by the HTTP error handler and by every
 * engine-side parse: a dotted/bracketed path under the request's names (`protocol.trMs`,
 * `accelerations[2]`) and, where zod knows it, the allowed range or set. Refinements pass their
 * allowed range through `params.allowed`; a configured limit (withinLimit) also sets `params.limit`,
 * so that the answer is a LimitError (422 /problems/limit-exceeded) rather than a plain bad value.
 */
export function problemsFromIssues(issues: readonly z.core.$ZodIssue[], prefix: string): FieldProblem[] {
  return issues.flatMap((issue) => {
    // An unknown key is named by its own path, one problem per key.
    if (issue.code === 'unrecognized_keys') {
      return issue.keys.map((key) => ({
        field: fieldPath(prefix, [...issue.path, key]),
        message: 'unknown field',
        allowed: 'the documented fields only',
      }));
    }
    const field = fieldPath(prefix, issue.path) || '(body)';
    const allowed = allowedText(issue);
    return allowed === undefined
      ? { field, message: issue.message }
      : { field, message: issue.message, allowed };
  });
}

/** True for the issue of a configured limit (matrix side, iterations, …) made by withinLimit. */
export function isLimitIssue(issue: { code: string; params?: unknown }): boolean {
  return issue.code === 'custom' && (issue.params as { limit?: unknown } | undefined)?.limit === true;
}

/**
 * Parses `value` with `schema` or throws naming each bad field under `prefix`: a LimitError when
 * every issue is a configured limit, a ValidationError otherwise.
 */
export function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown, prefix: string): z.output<S> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const problems = problemsFromIssues(result.error.issues, prefix);
  if (result.error.issues.every(isLimitIssue)) throw new LimitError(problems);
  throw new ValidationError(problems);
}

/**
 * `schema` (a number) refused above the configured `max`, as a limit: the issue carries
 * `params.limit` and the allowed range, and the OpenAPI shows `maximum: max`.
 */
export function withinLimit<S extends z.ZodNumber>(
  schema: S,
  max: number,
  what = '',
  allowed = `≤ ${max}`,
): S {
  return schema
    .refine((value) => value <= max, {
      error: (issue) => `${String(issue.input)}${what} is larger than the configured limit`,
      params: { limit: true, allowed },
    })
    .meta({ maximum: max }) as S;
}

/** `prefix` + path in the request's notation: object keys dotted, array indices in brackets. */
export function fieldPath(prefix: string, path: readonly PropertyKey[]): string {
  let out = prefix;
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out;
}

/** The allowed range or set an issue implies, in words, where zod knows it. */
export function allowedText(issue: z.core.$ZodIssue): string | undefined {
  switch (issue.code) {
    case 'too_small':
      if (issue.origin === 'array') return `at least ${issue.minimum} item(s)`;
      return `${issue.inclusive === false ? '>' : '≥'} ${issue.minimum}`;
    case 'too_big':
      if (issue.origin === 'array') return `at most ${issue.maximum} item(s)`;
      return `${issue.inclusive === false ? '<' : '≤'} ${issue.maximum}`;
    case 'invalid_type':
      return issue.expected === 'int' ? 'an integer' : `a value of type ${issue.expected}`;
    case 'invalid_value':
      return `one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`;
    case 'unrecognized_keys':
      return `the documented fields only (not ${issue.keys.join(', ')})`;
    case 'invalid_union': {
      const options = (issue as { options?: unknown[] }).options;
      return options ? `one of ${options.map((o) => JSON.stringify(o)).join(', ')}` : undefined;
    }
    case 'not_multiple_of':
      return `a multiple of ${String(issue.divisor)}`;
    case 'custom': {
      const allowed = (issue.params as { allowed?: unknown } | undefined)?.allowed;
      return typeof allowed === 'string' ? allowed : undefined;
    }
    default:
      return undefined;
  }
}
