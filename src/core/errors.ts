/**
 * Every error class the service knows, each carrying what the HTTP layer answers for it (status,
 * problem detail and field problems), so a bad request is an RFC 9457 problem+json naming the field
 * instead of a 500. How they cross a worker thread is in error-transport.ts; the problem+json
 * envelope (type URI, title, bounds) in src/http/problem.ts.
 */
export interface FieldProblem {
  /** JSON-pointer-like dotted path of the offending field, e.g. "sampling.acceleration". */
  field: string;
  message: string;
  /** Human-readable allowed range or set, e.g. "1 ≤ acceleration ≤ 64". */
  allowed?: string;
}

/** What a known error answers over HTTP: the body's detail and errors, plus response headers. */
export interface ProblemParts {
  detail: string;
  errors: FieldProblem[];
  headers?: Record<string, string>;
}

/** Wire name of each known error: worker transport and stored plan failures use it. */
export type ErrorKind =
  | 'validation'
  | 'limit'
  | 'not-found'
  | 'cancelled'
  | 'decode'
  | 'queue-full'
  | 'workers-busy';

/** An error with a defined HTTP answer (anything else is a 500). */
export abstract class KnownError extends Error {
  abstract readonly kind: ErrorKind;
  abstract readonly status: 404 | 409 | 415 | 422 | 429;
  abstract problem(): ProblemParts;
}

/** Values out of range or inconsistent with each other (HTTP 422). */
export class ValidationError extends KnownError {
  readonly kind: 'validation' | 'limit' = 'validation';
  readonly status = 422;
  readonly problems: FieldProblem[];
  constructor(problems: FieldProblem | FieldProblem[]) {
    const list = Array.isArray(problems) ? problems : [problems];
    super(list.map((p) => `${p.field}: ${p.message}`).join('; '));
    this.name = 'ValidationError';
    this.problems = list;
  }
  problem(): ProblemParts {
    return { detail: this.message, errors: this.problems };
  }
}

/** Work beyond the configured limits (HTTP 422 as well; the problem type differs). */
export class LimitError extends ValidationError {
  override readonly name = 'LimitError';
  override readonly kind = 'limit';
}

/** A stored input the request names does not exist for this caller (HTTP 404), named by its field. */
export class NotFoundError extends KnownError {
  override readonly name = 'NotFoundError';
  readonly kind = 'not-found';
  readonly status = 404;
  readonly problems: FieldProblem[];
  constructor(problem: FieldProblem) {
    super(`${problem.field}: ${problem.message}`);
    this.problems = [problem];
  }
  problem(): ProblemParts {
    return { detail: this.message, errors: this.problems };
  }
}

/** Raised when a long computation is cancelled through an AbortSignal (HTTP 409). */
export class CancelledError extends KnownError {
  override readonly name = 'CancelledError';
  readonly kind = 'cancelled';
  readonly status = 409;
  constructor() {
    super('cancelled');
  }
  problem(): ProblemParts {
    return { detail: 'the computation was cancelled', errors: [] };
  }
}

export function throwIfAborted(signal: AbortSignal | undefined): void {
  if (signal?.aborted) throw new CancelledError();
}

/**
 * A file we cannot turn into an image: unsupported format or encoding (415) or a damaged file.
 * Messages never quote header contents, so they are safe to return and to log.
 */
export class DecodeError extends KnownError {
  override readonly name = 'DecodeError';
  readonly kind = 'decode';
  readonly status = 415;
  readonly field: string;
  constructor(message: string, field = 'file') {
    super(message);
    this.field = field;
  }
  problem(): ProblemParts {
    return { detail: this.message, errors: [{ field: this.field, message: this.message }] };
  }
}

/** 429 with a Retry-After header: `busy` says what is busy, `reason` why. */
function retryLater(retryAfterSeconds: number, busy: string, reason: string): ProblemParts {
  const retry = String(retryAfterSeconds);
  return {
    detail: `${busy}; retry in about ${retry} s`,
    errors: [{ field: 'body', message: reason, allowed: 'retry after the Retry-After delay' }],
    headers: { 'retry-after': retry },
  };
}

/** The plan queue cannot take another plan now (HTTP 429). */
export class QueueFullError extends KnownError {
  override readonly name = 'QueueFullError';
  readonly kind = 'queue-full';
  readonly status = 429;
  readonly retryAfterSeconds: number;
  constructor(retryAfterSeconds: number) {
    super('the plan queue is full');
    this.retryAfterSeconds = retryAfterSeconds;
  }
  problem(): ProblemParts {
    return retryLater(this.retryAfterSeconds, 'the plan queue is full', 'too many plans queued or running');
  }
}

/** Too many request-driven tasks waiting for a thread (HTTP 429): a burst cannot pile up without bound. */
export class WorkersBusyError extends KnownError {
  override readonly name = 'WorkersBusyError';
  readonly kind = 'workers-busy';
  readonly status = 429;
  readonly retryAfterSeconds = 2;
  constructor() {
    super('all worker threads are busy');
  }
  problem(): ProblemParts {
    return retryLater(
      this.retryAfterSeconds,
      'every worker thread is busy',
      'too many computations in flight',
    );
  }
}

/** A worker thread failed in a way no known error describes (a fault of the service: HTTP 500). */
export class WorkerError extends Error {
  override readonly name = 'WorkerError';
}
