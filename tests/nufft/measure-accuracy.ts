/**
 * Measures the table in src/nufft/accuracy-table.ts: the relative 2-norm error of the type-2 NUFFT
 * against the direct sum (tests/nufft/direct-ndft.ts) for a 64×64 complex Gaussian image and 2000
 * uniformly random points over the whole periodic k-space, the worst of three seeds.
 * Run: npx tsx tests/nufft/measure-accuracy.ts
 */
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { createNufftPlan } from '../../src/nufft/nufft-plan.ts';
import { relativeError } from '../error-measures.ts';
import { directNdft } from './direct-ndft.ts';
import { uniformPoints } from './random-points.ts';

const side = 64;
const points = 2000;
const widths = [2, 3, 4, 5, 6, 7, 8];
const ratios = [1.25, 1.5, 2];
const worst = new Map<string, number>();
for (const seed of [1, 2, 3]) {
  const rng = new SeededRandom(seed);
  const image = createComplexImage(side, side);
  for (let i = 0; i < image.data.length; i++) image.data[i] = rng.normal();
  const { kx, ky } = uniformPoints(points, side, side, rng);
  const exact = directNdft(image, kx, ky);
  for (const oversampling of ratios) {
    for (const width of widths) {
      const plan = createNufftPlan(side, side, kx, ky, { width, oversampling });
      const key = `${width}|${oversampling}`;
      worst.set(key, Math.max(worst.get(key) ?? 0, relativeError(plan.forward(image), exact)));
    }
  }
}
console.log(`| W | ${ratios.map((a) => `α = ${a}`).join(' | ')} |`);
for (const width of widths) {
  console.log(
    `| ${width} | ${ratios.map((a) => worst.get(`${width}|${a}`)!.toExponential(2)).join(' | ')} |`,
  );
}
