import { acquiredFraction } from './cs-tv.ts';

/**
 * Where a lowrank-hankel run's rank came from (info.rankRule): the request's rank or energy, the
 * acquired-fraction rule of one coil, or the coil-array default (HANKEL_COIL_DEFAULTS).
 */
export type HankelRankRule = 'explicit' | 'energy' | 'fraction-default' | 'coil-default';

export const HANKEL_RANK_RULE = {
  /** Acquired fraction from which the larger rank is used. */
  fractionForLargerRank: 0.3,
  largerRankFraction: 0.65,
  rankFraction: 0.5,
};

/**
 * Default truncation rank of single-coil lowrank-hankel (no rank or energy in the request), from
 * the window area and the acquired fraction f: 0.65 × area when f ≥ 0.3, else half the area
 * (7×7: 32 or 25). Measured on the anatomy tuning set (docs/design.md §3.12,
 * docs/tuning/lowrank-hankel-ranks.csv; INIA19 slice 72 and example4d slice 12 at 96², lines,
 * Poisson-disc and rasterised golden-angle radial, R 2, 4, 8, ranks 18 / 25 / 32 / 38): with
 * f ≥ 0.3 (every R 2 mask and radial R 4) rank 32 gave higher SSIM than 25 in 8 of 8 cases
 * (0.875 → 0.960 and 0.891 → 0.950 on radial R 4, where the loss lay in the background) and
 * lower NRMSE in 5 of 8; with less data rank 32 fitted aliasing (Poisson-disc R 8: NRMSE 0.22 →
 * 0.37), so half the area stays. Fixed steps, not a rule of the spectrum: energy thresholds of
 * the spectrum were unstable here (see HANKEL_DEFAULTS).
 */
export function defaultHankelRank(area: number, mask: Uint8Array): number {
  const fraction = acquiredFraction(mask);
  const share =
    fraction >= HANKEL_RANK_RULE.fractionForLargerRank
      ? HANKEL_RANK_RULE.largerRankFraction
      : HANKEL_RANK_RULE.rankFraction;
  return Math.min(area, Math.max(1, Math.round(share * area)));
}
