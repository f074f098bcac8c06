import { ValidationError } from '../core/errors.ts';
import type { CoilMaps } from '../encoding/index.ts';

/** Which request field holds a value of coil `coil` (part 're' or 'im'), or the whole coil (null). */
export type CoilMapField = (coil: number, part: 're' | 'im' | null) => string;

/**
 * Checks uploaded maps as they will be used (never rescaled): every value finite, and no coil
 * whose map is zero everywhere (it would receive nothing). The first offence is named by its field,
 * coil, row and column.
 */
export function checkCoilMapValues(maps: CoilMaps, fieldOf: CoilMapField): void {
  const { coils, nx, ny, data } = maps;
  const plane = nx * ny;
  for (let c = 0; c < coils; c++) {
    let nonZero = false;
    const end = 2 * (c + 1) * plane;
    for (let k = 2 * c * plane; k < end; k++) {
      const value = data[k];
      if (value !== 0) nonZero = true;
      // NaN and ±∞ give NaN here; the subtraction is cheaper than Number.isFinite in this loop.
      if (value - value !== 0) {
        const pixel = (k >> 1) - c * plane;
        throw new ValidationError({
          field: fieldOf(c, k % 2 === 0 ? 're' : 'im'),
          message: `coil ${c}, row ${Math.floor(pixel / nx)}, column ${pixel % nx} is ${value}`,
          allowed: 'finite numbers only',
        });
      }
    }
    if (!nonZero) {
      throw new ValidationError({
        field: fieldOf(c, null),
        message: `the map of coil ${c} is zero everywhere`,
        allowed: 'a map with at least one non-zero value',
      });
    }
  }
}
