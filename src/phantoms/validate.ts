import { type FieldProblem, ValidationError } from '../core/errors.ts';

/** Largest raster side the phantom engine accepts by itself (the service applies tighter limits). */
export const MAX_PHANTOM_SIDE = 4096;
/** Largest supersampling factor per axis (ss×ss samples per pixel). */
export const MAX_SUPERSAMPLE = 16;

function integerProblem(value: unknown, field: string, max: number): FieldProblem | null {
  if (typeof value === 'number' && Number.isInteger(value) && value >= 1 && value <= max) return null;
  return {
    field,
    message: `must be an integer from 1 to ${max}, got ${String(value)}`,
    allowed: `1 … ${max}`,
  };
}

/** Throws a ValidationError naming matrix.nx and/or matrix.ny when either is not an integer 1 … 4096. */
export function checkMatrix(nx: unknown, ny: unknown): void {
  const problems = [
    integerProblem(nx, 'matrix.nx', MAX_PHANTOM_SIDE),
    integerProblem(ny, 'matrix.ny', MAX_PHANTOM_SIDE),
  ].filter((p): p is FieldProblem => p !== null);
  if (problems.length > 0) throw new ValidationError(problems);
}

/** Throws a ValidationError naming `supersample` when it is not an integer 1 … 16. */
export function checkSupersample(ss: unknown): void {
  const problem = integerProblem(ss, 'supersample', MAX_SUPERSAMPLE);
  if (problem) throw new ValidationError(problem);
}

/** Throws a ValidationError naming `field` unless value is a finite number (and positive when asked). */
export function checkFinite(value: unknown, field: string, positive = false): void {
  if (typeof value === 'number' && Number.isFinite(value) && (!positive || value > 0)) return;
  const allowed = positive ? 'finite number > 0' : 'finite number';
  throw new ValidationError({ field, message: `must be a ${allowed}, got ${String(value)}`, allowed });
}
