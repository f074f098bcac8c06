import { ValidationError } from '../core/errors.ts';
import { type CoilMaps, scalePixels, sumOfSquaresOverCoils } from '../encoding/index.ts';

/**
 * Scales the maps in place so that Σ_c |S_c|² = 1 at every pixel: S_c ← S_c / √(Σ_c′ |S_c′|²).
 * The scaling field is applied on the whole grid, inside the object and outside alike, so the
 * condition holds on any object mask and the maps stay as smooth as the coil fields themselves
 * (the root-sum-of-squares is smooth and positive). Then the sensitivity-weighted combination of the
 * fully sampled coil images returns the object itself (common practice).
 */
export function normaliseSumOfSquares(maps: CoilMaps): CoilMaps {
  const power = sumOfSquaresOverCoils(maps);
  const scale = new Float64Array(power.length);
  for (let i = 0; i < power.length; i++) {
    const sum = power[i];
    if (!(sum > 0) || !Number.isFinite(sum)) {
      throw new ValidationError({
        field: 'coils',
        message: `the coils' combined sensitivity is ${sum} at pixel ${i} (row ${Math.floor(i / maps.nx)}, column ${i % maps.nx}), so it cannot be normalised`,
        allowed: 'arrays whose coils together see every pixel of the field of view',
      });
    }
    scale[i] = 1 / Math.sqrt(sum);
  }
  scalePixels(maps, scale);
  return maps;
}
