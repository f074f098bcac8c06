/**
 * Typed errors every engine throws for bad input, so the HTTP layer can answer with an
 * RFC 9457 problem+json that names the field instead of a 500.
 */
export interface FieldProblem {
  /** JSON-pointer-like dotted path of the offending field, e.g. "sampling.acceleration". */
  field: string;
  message: string;
  /** Human-readable allowed range or set, e.g. "1 ≤ acceleration ≤ 64". */
  allowed?: string;
}

/** Values out of range or inconsistent with each other (HTTP 422). */
export class ValidationError extends Error {
  readonly status = 422;
  readonly problems: FieldProblem[];
  constructor(problems: FieldProblem | FieldProblem[]) {
    const list = Array.isArray(problems) ? problems : [problems];
    super(list.map((p) => `${p.field}: ${p.message}`).join('; '));
    this.name = 'ValidationError';
    this.problems = list;
  }
}

/** Work beyond the configured limits (HTTP 422 as well; the problem type differs). */
export class LimitError extends ValidationError {
  override readonly name = 'LimitError';
}

/** Raised when a long computation is cancelled through an AbortSignal. */
export class CancelledError extends Error {
  override readonly name = 'CancelledError';
  constructor() {
    super('cancelled');
  }
}

export function throwIfAborted(signal: AbortSignal | undefined): void {
  if (signal?.aborted) throw new CancelledError();
}
