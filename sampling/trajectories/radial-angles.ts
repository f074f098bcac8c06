import { GOLDEN_RATIO } from '../radial.ts';

/** Spoke orderings over 180° for full spokes through the centre. */
export type RadialOrdering = 'uniform' | 'golden' | 'tiny-golden';

/**
 * Tiny golden angle ψ_N = π/(φ + N − 1) in radians (Wundrak et al. 2016); N = 1 gives the golden
 * angle π/φ ≈ 111.246° of Winkelmann et al. 2007.
 */
export function tinyGoldenAngle(n: number): number {
  return Math.PI / (GOLDEN_RATIO + n - 1);
}

/**
 * Spoke angles in [0, π), radians: uniform j·π/count, or j·ψ mod π with ψ the golden angle
 * (Winkelmann et al. 2007) or the N-th tiny golden angle (Wundrak et al. 2016), computed as
 * π·frac(j/(φ + N − 1)) so the rounding stays at one ulp of π for any j.
 */
export function radialAngles(count: number, ordering: RadialOrdering, tinyGoldenIndex = 7): Float64Array {
  const theta = new Float64Array(count);
  const turnsPerSpoke = ordering === 'golden' ? 1 / GOLDEN_RATIO : 1 / (GOLDEN_RATIO + tinyGoldenIndex - 1);
  for (let j = 0; j < count; j++) {
    if (ordering === 'uniform') {
      theta[j] = (j * Math.PI) / count;
    } else {
      const turns = j * turnsPerSpoke;
      theta[j] = Math.PI * (turns - Math.floor(turns));
    }
  }
  return theta;
}
