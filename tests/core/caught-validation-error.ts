import { ValidationError } from '../../src/core/errors.ts';

/** The ValidationError `fn` throws; any other error is rethrown, and no error at all fails the test. */
export function caughtValidationError(fn: () => unknown): ValidationError {
  try {
    fn();
  } catch (error) {
    if (error instanceof ValidationError) return error;
    throw error;
  }
  throw new Error('expected a ValidationError');
}

/** The field the first problem of `fn`'s ValidationError names, or 'no error' when `fn` returns. */
export function validationFieldOf(fn: () => unknown): string {
  try {
    fn();
  } catch (error) {
    if (error instanceof ValidationError) return error.problems[0].field;
    throw error;
  }
  return 'no error';
}
