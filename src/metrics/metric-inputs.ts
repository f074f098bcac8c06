import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';

/**
 * Checks shared by every metric: the reference is a well-formed ny×nx image, the estimate has the
 * same shape, and both hold finite numbers only (a NaN would silently poison every sum).
 * Returns the pixel count nx·ny.
 */
export function checkImagePair(estimate: RealImage, reference: RealImage): number {
  checkImage(reference, 'reference');
  const { nx, ny } = reference;
  if (estimate.nx !== nx || estimate.ny !== ny) {
    throw new ValidationError({
      field: 'estimate',
      message: `is ${estimate.ny}×${estimate.nx} but the reference is ${ny}×${nx}`,
      allowed: `ny×nx = ${ny}×${nx}, the reference's shape`,
    });
  }
  checkImage(estimate, 'estimate');
  return nx * ny;
}

function checkImage(image: RealImage, field: string): void {
  const { nx, ny, data } = image;
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1) {
    throw new ValidationError({
      field,
      message: `has size ${ny}×${nx}`,
      allowed: 'nx and ny positive integers',
    });
  }
  if (data.length !== nx * ny) {
    throw new ValidationError({
      field: `${field}.data`,
      message: `holds ${data.length} values for a ${ny}×${nx} image`,
      allowed: `exactly nx·ny = ${nx * ny} values`,
    });
  }
  for (let i = 0; i < data.length; i++) {
    if (!Number.isFinite(data[i])) {
      throw new ValidationError({
        field: `${field}.data`,
        message: `holds ${data[i]} at index ${i}`,
        allowed: 'finite numbers',
      });
    }
  }
}

/**
 * A region mask must cover the image pixel for pixel (row-major, length ny·nx); a non-zero entry
 * selects the pixel. Returns the number of selected pixels; an empty selection is refused because
 * every metric would divide by zero on it.
 */
export function checkMask(mask: Uint8Array, pixels: number): number {
  if (!(mask instanceof Uint8Array) || mask.length !== pixels) {
    throw new ValidationError({
      field: 'mask',
      message: `has length ${mask?.length}`,
      allowed: `a Uint8Array of length ny·nx = ${pixels}`,
    });
  }
  let count = 0;
  for (let i = 0; i < pixels; i++) if (mask[i] !== 0) count++;
  if (count === 0) {
    throw new ValidationError({
      field: 'mask',
      message: 'selects no pixel',
      allowed: 'at least one non-zero entry',
    });
  }
  return count;
}
