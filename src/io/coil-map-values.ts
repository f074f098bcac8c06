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
    for (let p = 0; p < plane; p++) {
      for (const [part, offset] of [
        ['re', 0],
        ['im', 1],
      ] as const) {
        const value = data[2 * (c * plane + p) + offset];
        if (!Number.isFinite(value)) {
          throw new ValidationError({
            field: fieldOf(c, part),
            message: `coil ${c}, row ${Math.floor(p / nx)}, column ${p % nx} is ${value}`,
            allowed: 'finite numbers only',
          });
        }
        if (value !== 0) nonZero = true;
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
