import { type FieldProblem, LimitError, ValidationError } from './errors.ts';
import { defaultLimits, type Limits } from './limits.ts';

export interface Matrix {
  nx: number;
  ny: number;
}

/**
 * Checks the matrix of a request: integer sides from 1 to limits.maxMatrixSide. Non-integers and
 * non-numbers give a ValidationError; sides beyond the configured limit a LimitError.
 */
export function validateMatrix(matrix: unknown, limits: Limits = defaultLimits): Matrix {
  const max = limits.maxMatrixSide;
  if (typeof matrix !== 'object' || matrix === null) {
    throw new ValidationError({ field: 'matrix', message: 'must be an object { nx, ny }' });
  }
  const record = matrix as Record<string, unknown>;
  const invalid: FieldProblem[] = [];
  const tooLarge: FieldProblem[] = [];
  for (const side of ['nx', 'ny'] as const) {
    const value = record[side];
    const allowed = `integer, 1 ≤ ${side} ≤ ${max}`;
    if (typeof value !== 'number' || !Number.isInteger(value) || value < 1) {
      invalid.push({
        field: `matrix.${side}`,
        message: `must be a positive integer, got ${String(value)}`,
        allowed,
      });
    } else if (value > max) {
      tooLarge.push({
        field: `matrix.${side}`,
        message: `${value} exceeds the configured limit ${max}`,
        allowed,
      });
    }
  }
  if (invalid.length > 0) throw new ValidationError([...invalid, ...tooLarge]);
  if (tooLarge.length > 0) throw new LimitError(tooLarge);
  return { nx: record.nx as number, ny: record.ny as number };
}
