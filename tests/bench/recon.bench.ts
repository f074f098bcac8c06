import { generateMask } from '../../sampling/index.ts';
import { acquire } from '../../src/acquisition/acquire.ts';
import { fullKspaceFromPhantom } from '../../src/acquisition/phantom-source.ts';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { type BenchRow, medianMs } from './timing.ts';

/**
 * Reconstruction cost at 256×256 (modified Shepp–Logan, analytic k-space, Poisson-disc R = 4):
 * cs-tv 100 iterations and lowrank-hankel (7×7 window, default rank and weighting) 50 iterations,
 * each also per iteration and as the ratio of one iteration to one fft2c + ifft2c pair — the
 * FFT-bound floor of a method that needs one transform pair per iteration. Tolerance 0 so every
 * iteration runs. Medians of a few runs; timer resolution ≈ 1 µs (performance.now()).
 */
export async function benchRecon(): Promise<BenchRow[]> {
  const n = 256;
  const full = fullKspaceFromPhantom(getPhantom('shepp-logan-modified'), n, n, 'analytic');
  const sampled = generateMask(
    { nx: n, ny: n },
    { pattern: 'poisson-disc', acceleration: 4, acs: 24, seed: 1 },
  );
  const { kspace } = acquire(full, sampled.mask, undefined, 1);
  const input = { kspace, mask: sampled.mask, density: sampled.density };

  const scratch = createComplexImage(n, n);
  scratch.data.set(kspace.data);
  const pair = await medianMs(() => {
    fft2c(scratch, scratch);
    ifft2c(scratch, scratch);
  }, 11);

  const rows: BenchRow[] = [{ name: `fft2c+ifft2c ${n}×${n} (reference pair)`, medianMs: pair }];
  const cases = [
    { label: 'cs-tv', iterations: 100, method: { name: 'cs-tv' as const, iterations: 100, tolerance: 0 } },
    {
      label: 'lowrank-hankel w=7',
      iterations: 50,
      method: { name: 'lowrank-hankel' as const, kernel: 7, iterations: 50, tolerance: 0 },
    },
  ];
  for (const c of cases) {
    const total = await medianMs(() => reconstruct(input, c.method), 3, 1);
    const perIteration = total / c.iterations;
    rows.push({ name: `${c.label} ${n}×${n}, ${c.iterations} iterations`, medianMs: total });
    rows.push({
      name: `${c.label} ${n}×${n}, per iteration`,
      medianMs: perIteration,
      note: `${(perIteration / pair).toFixed(2)}× one fft2c+ifft2c pair (${pair.toFixed(2)} ms)`,
    });
  }
  return rows;
}
