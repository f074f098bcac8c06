import { rankForEnergy } from '../../src/recon/hankel-iterations.ts';
import { defaultHankelRank } from '../../src/recon/hankel-rank.ts';
import { acquiredHankelSpectrum, hardThresholdRank } from './rank-spectrum.ts';

/**
 * The rank rules compared for lowrank-hankel (7×7, 'gradient'), evaluated without reconstructing:
 *   fraction-default  the acquired-fraction rule (defaultHankelRank)
 *   gd-complete   optimal hard threshold (Gavish & Donoho 2014) on the rows of complete windows
 *   gd-zerofilled the same threshold on every window of the zero-filled k-space
 *   e90 … e999    smallest rank keeping 90 / 95 / 99 / 99.9 % of Σσ² of the complete windows
 */
export const KERNEL: [number, number] = [7, 7];
const ENERGIES = [0.9, 0.95, 0.99, 0.999];
export const RULES = ['fraction-default', 'gd-complete', 'gd-zerofilled', ...ENERGIES.map(energyLabel)];

function energyLabel(energy: number): string {
  return `e${String(energy).slice(2).padEnd(2, '0')}`;
}

/** The rank every rule picks for the acquired samples of `full` (n×n k-space) under `mask`; null where a rule has too few complete windows. */
export function ruleRanks(full: Float64Array, mask: Uint8Array, n: number): Record<string, number | null> {
  const zeroFilled = full.map((v, i) => (mask[i >> 1] ? v : 0));
  const complete = acquiredHankelSpectrum(full, mask, n, n, KERNEL, 'gradient');
  const everyWindow = acquiredHankelSpectrum(
    zeroFilled,
    new Uint8Array(n * n).fill(1),
    n,
    n,
    KERNEL,
    'gradient',
  );
  const power = complete.singularValues.map((s) => s * s);
  return {
    'fraction-default': defaultHankelRank(KERNEL[0] * KERNEL[1], mask),
    'gd-complete': hardThresholdRank(complete),
    'gd-zerofilled': hardThresholdRank(everyWindow),
    ...Object.fromEntries(
      ENERGIES.map((e) => [energyLabel(e), complete.rows > 0 ? rankForEnergy(power, e) : null]),
    ),
  };
}

export function completeWindowCount(mask: Uint8Array, n: number): number {
  return acquiredHankelSpectrum(new Float64Array(2 * n * n), mask, n, n, KERNEL, 'none').rows;
}
