import { ValidationError } from '../core/errors.ts';

export type LesionShape = 'disc' | 'gaussian';

/** A lesion request (the `lesions` piece): count, size in pixels, contrast, shape and placement seed. */
export interface LesionSpec {
  count: number;
  /** Diameter in pixels: the disc's diameter, or the Gaussian's full width at half maximum. */
  diameter: number;
  /** Amplitude relative to the object's mean intensity, positive (bright) or negative (dark). */
  contrast: number;
  shape: LesionShape;
  seed: number;
}

/**
 * One placed lesion. Centres sit on pixel centres (row, col); `amplitude` is the absolute
 * intensity added (contrast × the object's mean intensity), the disc's height or the Gaussian's peak.
 */
export interface Lesion {
  row: number;
  col: number;
  diameter: number;
  amplitude: number;
  shape: LesionShape;
}

export const MAX_LESIONS = 64;
export const MIN_LESION_DIAMETER = 1;
export const MAX_LESION_DIAMETER = 64;
export const MAX_LESION_CONTRAST = 10;

/** Checks a lesion request; ValidationError naming `lesions.<field>` and the allowed range. */
export function checkLesionSpec(spec: LesionSpec): void {
  const problem = (field: string, value: unknown, allowed: string) =>
    new ValidationError({
      field: `lesions.${field}`,
      message: `got ${JSON.stringify(value)}`,
      allowed,
    });
  if (!Number.isInteger(spec.count) || spec.count < 1 || spec.count > MAX_LESIONS) {
    throw problem('count', spec.count, `integer 1 ≤ count ≤ ${MAX_LESIONS}`);
  }
  if (
    !Number.isFinite(spec.diameter) ||
    spec.diameter < MIN_LESION_DIAMETER ||
    spec.diameter > MAX_LESION_DIAMETER
  ) {
    throw problem(
      'diameter',
      spec.diameter,
      `${MIN_LESION_DIAMETER} ≤ diameter ≤ ${MAX_LESION_DIAMETER} pixels`,
    );
  }
  if (
    !Number.isFinite(spec.contrast) ||
    spec.contrast === 0 ||
    Math.abs(spec.contrast) > MAX_LESION_CONTRAST
  ) {
    throw problem('contrast', spec.contrast, `0 < |contrast| ≤ ${MAX_LESION_CONTRAST}`);
  }
  if (spec.shape !== 'disc' && spec.shape !== 'gaussian') {
    throw problem('shape', spec.shape, 'disc | gaussian');
  }
  if (!Number.isInteger(spec.seed)) throw problem('seed', spec.seed, 'an integer');
}

/** Standard deviation of a Gaussian whose full width at half maximum is `fwhm`: fwhm / (2√(2 ln 2)). */
export function gaussianSigma(fwhm: number): number {
  return fwhm / (2 * Math.sqrt(2 * Math.LN2));
}

/**
 * The lesion's disc: pixel offsets (dr, dc) whose centres lie within diameter/2 of the lesion
 * centre, the region contrast recovery and CNR are taken over (for a Gaussian, its FWHM disc).
 * A 5-pixel disc covers 21 pixel centres.
 */
export function discOffsets(diameter: number): Int32Array {
  const r = diameter / 2;
  const reach = Math.floor(r);
  const out: number[] = [];
  for (let dr = -reach; dr <= reach; dr++) {
    for (let dc = -reach; dc <= reach; dc++) if (dr * dr + dc * dc <= r * r) out.push(dr, dc);
  }
  return Int32Array.from(out);
}

/** Row-major pixel indices of a lesion's disc that fall inside the ny×nx image. */
export function lesionDiscPixels(lesion: Lesion, nx: number, ny: number): Int32Array {
  const offsets = discOffsets(lesion.diameter);
  const out: number[] = [];
  for (let k = 0; k < offsets.length; k += 2) {
    const row = lesion.row + offsets[k];
    const col = lesion.col + offsets[k + 1];
    if (row >= 0 && row < ny && col >= 0 && col < nx) out.push(row * nx + col);
  }
  return Int32Array.from(out);
}
