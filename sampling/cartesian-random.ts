import type { Matrix } from '../src/core/matrix.ts';
import { SeededRandom } from '../src/core/random.ts';
import { checkLineBudget, lineMask } from './cartesian-lines.ts';
import { centredBlockStart, type SampledMask } from './sampled-mask.ts';
import type { CartesianRandomSpec } from './schema.ts';
import { seededPatternSettings } from './seed.ts';
import { inclusionProbabilities, systematicSample } from './unequal-probability-sampling.ts';

export const DEFAULT_DENSITY_POWER = 2;

/**
 * Polynomial variable-density weight of phase-encode row `row` (Lustig, Donoho & Pauly 2007):
 * w = (1 − r)^p with r = |row − ⌊ny/2⌋| / max(⌊ny/2⌋, ny − 1 − ⌊ny/2⌋), so r = 0 on the centre row
 * and r = 1 on the farthest one.
 */
export function lineDensityWeights(ny: number, power: number): Float64Array {
  const centre = Math.floor(ny / 2);
  const reach = Math.max(centre, ny - 1 - centre, 1);
  const w = new Float64Array(ny);
  for (let row = 0; row < ny; row++) w[row] = (1 - Math.abs(row - centre) / reach) ** power;
  return w;
}

/**
 * Random Cartesian undersampling with exactly round(ny / R) whole phase-encode rows, ACS included.
 * The rows outside the ACS block are drawn without replacement; row i is acquired with probability
 * π_i = min(1, s·(1 − r_i)^p), s set so that Σ π equals the rows left after the ACS, by randomised
 * systematic sampling, which honours those probabilities and the exact count together. π (1 inside
 * the ACS) is reported as the mask's density.
 */
export function cartesianRandomMask(matrix: Matrix, spec: CartesianRandomSpec): SampledMask {
  const { nx, ny } = matrix;
  const settings = seededPatternSettings(spec, 'cartesian-random', DEFAULT_DENSITY_POWER);
  const { acceleration: R, acs, seed, power } = settings;
  const budget = checkLineBudget(ny, R, acs, true);
  const toDraw = budget - acs;
  const acsStart = centredBlockStart(ny, acs);
  const weights = lineDensityWeights(ny, power);
  // Outer rows only: the ACS rows take no part in the draw.
  const outer = new Int32Array(ny - acs);
  for (let row = 0, k = 0; row < ny; row++) if (row < acsStart || row >= acsStart + acs) outer[k++] = row;
  const outerWeights = Float64Array.from(outer, (row) => weights[row]);
  const pi = inclusionProbabilities(outerWeights, toDraw);
  const chosen = systematicSample(pi, toDraw, new SeededRandom(seed));

  const rows = new Uint8Array(ny);
  const rowDensity = new Float64Array(ny);
  rows.fill(1, acsStart, acsStart + acs);
  rowDensity.fill(1, acsStart, acsStart + acs);
  for (let k = 0; k < outer.length; k++) {
    rows[outer[k]] = chosen[k];
    rowDensity[outer[k]] = pi[k];
  }
  const result = lineMask(nx, ny, rows, { pattern: 'cartesian-random', requested: R, acs, seed });
  const density = new Float64Array(nx * ny);
  for (let row = 0; row < ny; row++) density.fill(rowDensity[row], row * nx, (row + 1) * nx);
  result.density = density;
  result.details = { densityLaw: 'pi = min(1, s*(1 - r)^p), r = |ky| / max |ky|', densityPower: power };
  return result;
}
