import { generateMask, maskDiagnostics } from '../../sampling/index.ts';
import { type BenchRow, median } from './timing.ts';

/** Median wall time of `runs` calls after one warm-up call. */
function medianMs(runs: number, fn: () => unknown): number {
  fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  return median(times);
}

/** Sampling benchmarks for `npm run bench`: mask generation and the PSF diagnostics. */
export async function benchSampling(): Promise<BenchRow[]> {
  const results: BenchRow[] = [];
  let seed = 0;

  const poisson = generateMask({ nx: 256, ny: 256 }, { pattern: 'poisson-disc', acceleration: 6, seed: 1 });
  results.push({
    name: 'sampling: poisson-disc 256×256 R=6',
    medianMs: medianMs(7, () =>
      generateMask({ nx: 256, ny: 256 }, { pattern: 'poisson-disc', acceleration: 6, seed: ++seed }),
    ),
    note: `actual R ${poisson.acceleration.actual.toFixed(3)}, dart-throwing runs in the scale search: ${poisson.details?.scaleSearchSteps} (seed 1)`,
  });

  results.push({
    name: 'sampling: cartesian-random 320×320 R=4 acs=24',
    medianMs: medianMs(15, () =>
      generateMask(
        { nx: 320, ny: 320 },
        { pattern: 'cartesian-random', acceleration: 4, acs: 24, seed: ++seed },
      ),
    ),
  });

  const mask = generateMask({ nx: 256, ny: 256 }, { pattern: 'cartesian-random', acceleration: 4, seed: 1 });
  results.push({
    name: 'sampling: PSF diagnostics of a 256×256 mask',
    medianMs: medianMs(15, () => maskDiagnostics(mask)),
    note: 'ifft2c, side lobe and radial profile',
  });
  return results;
}

// Run directly: npx tsx tests/bench/sampling.bench.ts
if (process.argv[1] && import.meta.url === new URL(`file://${process.argv[1]}`).href) {
  for (const r of await benchSampling())
    console.log(`${r.name.padEnd(48)} ${r.medianMs.toFixed(1).padStart(8)} ms  ${r.note ?? ''}`);
}
