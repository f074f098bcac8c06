import { LimitError, ValidationError } from '../core/errors.ts';

/** Rejects images outside 2 ≤ side ≤ maxSide before any pixel buffer is allocated. */
export function checkImageSize(nx: number, ny: number, maxSide: number | undefined): void {
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 2 || ny < 2) {
    throw new ValidationError({
      field: 'file',
      message: `image is ${nx}×${ny} pixels`,
      allowed: 'at least 2×2',
    });
  }
  if (maxSide !== undefined && (nx > maxSide || ny > maxSide)) {
    throw new LimitError({
      field: 'file',
      message: `image is ${nx}×${ny} pixels`,
      allowed: `≤ ${maxSide} per side`,
    });
  }
}

/** Checks a 0-based index option such as frame or slice against the count available. */
export function checkIndex(field: string, value: number, count: number): void {
  if (!Number.isInteger(value) || value < 0 || value >= count) {
    throw new ValidationError({
      field,
      message: `${field} ${value} does not exist`,
      allowed: `0 ≤ ${field} ≤ ${count - 1}`,
    });
  }
}
