import { SeededRandom } from '../../src/core/random.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { hfen, nrmse, psnr, scoreAll, ssim } from '../../src/metrics/index.ts';
import { type BenchRow, medianMs } from './timing.ts';

/** The metric suite on a seeded 256×256 pair (a smooth image and a noisy copy). */
export async function benchMetrics(): Promise<BenchRow[]> {
  const n = 256;
  const rng = new SeededRandom(7);
  const reference: RealImage = { nx: n, ny: n, data: new Float64Array(n * n) };
  const estimate: RealImage = { nx: n, ny: n, data: new Float64Array(n * n) };
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      const v =
        Math.exp(-((r - 128) ** 2 + (c - 110) ** 2) / 3000) +
        (r > 90 && r < 150 && c > 60 && c < 100 ? 0.5 : 0);
      reference.data[r * n + c] = v;
      estimate.data[r * n + c] = v + 0.02 * rng.normal();
    }
  }
  const rows: BenchRow[] = [];
  const all = await medianMs(() => scoreAll(estimate, reference), 21);
  rows.push({ name: 'scoreAll 256×256 (NRMSE, PSNR, SSIM, HFEN)', medianMs: all });
  for (const [name, fn] of [
    ['nrmse', () => nrmse(estimate, reference)],
    ['psnr', () => psnr(estimate, reference)],
    ['ssim', () => ssim(estimate, reference)],
    ['hfen', () => hfen(estimate, reference)],
  ] as const) {
    rows.push({ name: `${name} 256×256`, medianMs: await medianMs(fn, 21) });
  }
  return rows;
}
