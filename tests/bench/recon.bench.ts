import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { poissonDiscAcquisition } from '../recon/helpers.ts';
import { type BenchRow, cpuMs, median } from './timing.ts';

/**
 * Reconstruction cost at 256×256 (modified Shepp–Logan, analytic k-space, Poisson-disc R = 4):
 * cs-tv 100 iterations and lowrank-hankel (7×7 window, default rank and weighting) 50 iterations,
 * each also per iteration and as the ratio of one iteration to one fft2c + ifft2c pair — the
 * FFT-bound floor of a method that needs one transform pair per iteration. Tolerance 0 so every
 * iteration runs. The reference pair is re-measured (mean of a batch of 10) just before each of the
 * 3 runs and the ratio is the median of the 3 per-run ratios, in wall time and in this process's
 * CPU time (steadier on a shared machine, where a long run is preempted more often than short
 * ones). Wall timer resolution ≈ 1 µs; CPU time is accounted by the kernel in ticks of a few ms.
 */
export async function benchRecon(): Promise<BenchRow[]> {
  const n = 256;
  const { kspace, sampled } = poissonDiscAcquisition('shepp-logan-modified', n, 24, 1);
  const input = { kspace, mask: sampled.mask, density: sampled.density };

  const scratch = createComplexImage(n, n);
  scratch.data.set(kspace.data);
  // One batch of 10 pairs: long enough for CPU-time accounting (kernel ticks of a few ms).
  const pair = (): { wall: number; cpu: number } => {
    const w0 = performance.now();
    const c0 = cpuMs();
    for (let i = 0; i < 10; i++) {
      fft2c(scratch, scratch);
      ifft2c(scratch, scratch);
    }
    return { wall: (performance.now() - w0) / 10, cpu: (cpuMs() - c0) / 10 };
  };
  pair();
  const rows: BenchRow[] = [];
  const pairWalls: number[] = [];
  const cases = [
    { label: 'cs-tv', iterations: 100, method: { name: 'cs-tv' as const, iterations: 100, tolerance: 0 } },
    {
      label: 'lowrank-hankel w=7',
      iterations: 50,
      method: { name: 'lowrank-hankel' as const, kernel: 7, iterations: 50, tolerance: 0 },
    },
  ];
  const caseRows: BenchRow[] = [];
  for (const c of cases) {
    reconstruct(input, { ...c.method, iterations: 2 });
    const totals: number[] = [];
    const wallRatios: number[] = [];
    const cpuRatios: number[] = [];
    for (let run = 0; run < 3; run++) {
      const reference = pair();
      pairWalls.push(reference.wall);
      const w0 = performance.now();
      const c0 = cpuMs();
      reconstruct(input, c.method);
      const cpu = (cpuMs() - c0) / c.iterations;
      const wall = performance.now() - w0;
      totals.push(wall);
      wallRatios.push(wall / c.iterations / reference.wall);
      cpuRatios.push(cpu / reference.cpu);
    }
    const total = median(totals);
    caseRows.push({ name: `${c.label} ${n}×${n}, ${c.iterations} iterations`, medianMs: total });
    caseRows.push({
      name: `${c.label} ${n}×${n}, per iteration`,
      medianMs: total / c.iterations,
      note:
        `${median(wallRatios).toFixed(2)}× one fft2c+ifft2c pair in wall time, ` +
        `${median(cpuRatios).toFixed(2)}× in CPU time (medians of 3 runs, pair re-measured before each)`,
    });
  }
  rows.push({ name: `fft2c+ifft2c ${n}×${n} (reference pair)`, medianMs: median(pairWalls) });
  return [...rows, ...caseRows];
}
