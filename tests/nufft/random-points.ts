import type { SeededRandom } from '../../src/core/random.ts';

/** `count` k-space points, uniform over [−spanX/2, spanX/2) × [−spanY/2, spanY/2), drawn from `rng` in turn. */
export function uniformPoints(count: number, spanX: number, spanY: number, rng: SeededRandom) {
  const kx = new Float64Array(count);
  const ky = new Float64Array(count);
  for (let p = 0; p < count; p++) {
    kx[p] = (rng.uniform() - 0.5) * spanX;
    ky[p] = (rng.uniform() - 0.5) * spanY;
  }
  return { kx, ky };
}
