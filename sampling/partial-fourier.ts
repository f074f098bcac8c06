import { z } from 'zod';
import { countSampled, type SampledMask } from './sampled-mask.ts';

/**
 * Partial Fourier as part of the sampling: a fraction p (0.5…1) of the phase-encode rows is kept,
 * the ⌈p·ny⌉ rows `ny − ⌈p·ny⌉ … ny − 1` — one half of ky, the centre row ⌊ny/2⌋ and the extra rows
 * beyond it (docs/design.md §2.2). The same band the scan-time model has always counted for the
 * protocol's `partialFourier`, so both fields mean the same rows.
 */
export const partialFourierFraction = z
  .number()
  .min(0.5)
  .max(1)
  .optional()
  .describe(
    'partial Fourier: fraction p of the phase-encode rows kept, 0.5…1 (default 1); keeps the ⌈p·ny⌉ rows ' +
      'ny − ⌈p·ny⌉ … ny − 1, which hold the centre row ⌊ny/2⌋. Cartesian patterns only',
  );

/**
 * The field on non-Cartesian patterns: only 1 (full ky) is accepted, anything else a 422 naming
 * `sampling.partialFourier` (a spoke through the centre has no half to leave out).
 */
export const noPartialFourier = z
  .number()
  .refine((p) => p === 1, {
    message: 'partial Fourier applies to Cartesian patterns only',
    params: { allowed: '1 or omitted for non-Cartesian patterns' },
  })
  .optional()
  .describe('not available for non-Cartesian sampling: 1 or omitted');

/** The kept band of a partial-Fourier acquisition: rows [firstRow, ny). */
export interface PartialFourierBand {
  /** The requested fraction p. */
  fraction: number;
  /** First kept row, ny − ⌈p·ny⌉; rows before it are not acquired. */
  firstRow: number;
}

/** ⌈p·ny⌉ kept rows (the small offset keeps p·ny that is an integer in exact arithmetic from rounding up). */
export function keptRowCount(ny: number, fraction: number): number {
  return Math.ceil(fraction * ny - 1e-9);
}

export function partialFourierBand(ny: number, fraction: number): PartialFourierBand {
  return { fraction, firstRow: ny - keptRowCount(ny, fraction) };
}

/**
 * The mask with the rows before the kept band removed, recounted in its own unit (lines or points)
 * so that the actual R includes the partial-Fourier saving. p = 1 (or none) returns the mask as it is.
 */
export function applyPartialFourier(sampled: SampledMask, fraction: number | undefined): SampledMask {
  if (fraction === undefined || fraction >= 1) return sampled;
  const { nx, ny } = sampled;
  const band = partialFourierBand(ny, fraction);
  const mask = sampled.mask.slice();
  mask.fill(0, 0, band.firstRow * nx);
  const points = countSampled(mask);
  const count = sampled.acquired.unit === 'lines' ? occupiedRows(mask, nx, 0, ny) : points;
  return {
    ...sampled,
    mask,
    acceleration: { requested: sampled.acceleration.requested, actual: sampled.total / count },
    acquired: { count, unit: sampled.acquired.unit },
    fraction: points / (nx * ny),
    partialFourier: band,
  };
}

/** Rows in [firstRow, lastRow) with at least one sampled point (a 2D line costs its whole row). */
export function occupiedRows(mask: Uint8Array, nx: number, firstRow: number, lastRow: number): number {
  let rows = 0;
  for (let row = firstRow; row < lastRow; row++) {
    const start = row * nx;
    for (let col = 0; col < nx; col++) {
      if (mask[start + col] !== 0) {
        rows++;
        break;
      }
    }
  }
  return rows;
}
