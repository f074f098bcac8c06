import { generateMask } from '../../sampling/index.ts';
import { type LesionSpec, phantomLesionSet } from '../../src/fidelity/index.ts';
import { sheppLoganModified } from '../../src/phantoms/index.ts';

/**
 * The lesion study's set-up shared by its checks and its benchmark: lesions on the modified
 * Shepp–Logan phantom (n×n), a random-line mask, and σ = mean object intensity / 30.
 */
export function sheppLoganLesionCase(
  n: number,
  lesions: LesionSpec,
  lines: { acceleration: number; acs: number; seed: number },
) {
  const set = phantomLesionSet(sheppLoganModified(), n, n, lesions);
  const { mask } = generateMask({ nx: n, ny: n }, { pattern: 'cartesian-random', ...lines });
  return { set, mask, sigma: set.meanIntensity / 30 };
}
