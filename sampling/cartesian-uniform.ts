import type { Matrix } from '../src/core/matrix.ts';
import { checkLineBudget, lineMask } from './cartesian-lines.ts';
import { centredBlockStart, type SampledMask } from './sampled-mask.ts';
import type { CartesianUniformSpec } from './schema.ts';

/**
 * Regular Cartesian undersampling: whole phase-encode rows (every kx) at offsets
 * ⌊|j|·R + ½⌋ above and below the centre row ⌊ny/2⌋ (j = 0, ±1, ±2, …), so the pattern is
 * symmetric about the centre and, for integer R, every R-th row. A fractional R gives a regular
 * pattern whose gaps are ⌊R⌋ or ⌈R⌉ rows, with mean gap R. The `acs` central rows are added on top
 * and counted in the total, so the actual R (ny / acquired rows) is reported next to the requested one.
 */
export function cartesianUniformMask(matrix: Matrix, spec: CartesianUniformSpec): SampledMask {
  const { nx, ny } = matrix;
  const R = spec.acceleration;
  const acs = spec.acs ?? 0;
  checkLineBudget(ny, R, acs, false);
  const rows = new Uint8Array(ny);
  const centre = Math.floor(ny / 2);
  const reach = Math.max(centre, ny - 1 - centre);
  for (let j = 0; ; j++) {
    const offset = Math.floor(j * R + 0.5);
    if (offset > reach) break;
    if (centre + offset < ny) rows[centre + offset] = 1;
    if (centre - offset >= 0) rows[centre - offset] = 1;
  }
  const acsStart = centredBlockStart(ny, acs);
  rows.fill(1, acsStart, acsStart + acs);
  return lineMask(nx, ny, rows, { pattern: 'cartesian-uniform', requested: R, acs, seed: null });
}
