import {
  CancelledError,
  DecodeError,
  type ErrorKind,
  type FieldProblem,
  KnownError,
  LimitError,
  NotFoundError,
  QueueFullError,
  ValidationError,
  WorkerError,
  WorkersBusyError,
} from './errors.ts';

/**
 * An error as data: classes cannot cross a thread boundary (structured clone keeps neither the
 * prototype nor own fields such as `problems`), so a worker sends this and the pool rebuilds the
 * same class. `internal` is any error that is not a KnownError; it comes back as a WorkerError.
 */
export interface WorkerFailure {
  kind: ErrorKind | 'internal';
  message: string;
  problems: FieldProblem[];
  retryAfterSeconds?: number;
}

/** The data form of an error thrown in a worker. */
export function toWorkerFailure(error: unknown): WorkerFailure {
  if (error instanceof ValidationError) {
    return { kind: error.kind, message: error.message, problems: error.problems };
  }
  if (error instanceof NotFoundError) {
    return { kind: error.kind, message: error.message, problems: error.problems };
  }
  if (error instanceof DecodeError) {
    return {
      kind: error.kind,
      message: error.message,
      problems: [{ field: error.field, message: error.message }],
    };
  }
  if (error instanceof QueueFullError || error instanceof WorkersBusyError) {
    return {
      kind: error.kind,
      message: error.message,
      problems: [],
      retryAfterSeconds: error.retryAfterSeconds,
    };
  }
  if (error instanceof KnownError) return { kind: error.kind, message: error.message, problems: [] };
  const message = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
  return { kind: 'internal', message, problems: [] };
}

/** Rebuilds the class a worker threw from its data form. */
export function fromWorkerFailure(failure: WorkerFailure): Error {
  const { kind, message, problems } = failure;
  switch (kind) {
    case 'limit':
      return new LimitError(problems);
    case 'validation':
      return new ValidationError(problems);
    case 'not-found':
      return new NotFoundError(problems[0] ?? { field: 'id', message });
    case 'cancelled':
      return new CancelledError();
    case 'decode':
      return new DecodeError(message, problems[0]?.field);
    case 'queue-full':
      return new QueueFullError(failure.retryAfterSeconds ?? 1);
    case 'workers-busy':
      return new WorkersBusyError();
    case 'internal':
      return new WorkerError(message);
  }
}
