import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { coilInput, lineMask, loopCoilProblem } from '../recon/coil-problem.ts';
import { type BenchRow, median, medianMs } from './timing.ts';

/**
 * The multi-coil iterative reconstructions at 128² with the 8 loop coils, one iteration against the
 * FFT floor of C = 8 fft2c + ifft2c pairs (one pair per coil, what any method touching every coil's
 * k-space once per iteration needs): cs-tv with the given maps (random lines R = 4; each iteration
 * 1 + CG steps EᴴE products) and lowrank-hankel without maps (uniform R = 3, 8 ACS lines; defaults
 * 3×3, rank 18, and a 5×5 window at rank 35). Tolerance 0 so every iteration runs.
 */
export async function benchCoilRecon(): Promise<BenchRow[]> {
  const n = 128;
  const coils = 8;
  const image = createComplexImage(n, n);
  for (let i = 0; i < image.data.length; i++) image.data[i] = Math.sin(i);
  const floorOnce = () =>
    medianMs(() => {
      for (let c = 0; c < coils; c++) {
        fft2c(image, image);
        ifft2c(image, image);
      }
    }, 5);
  const floors: number[] = [];
  const random = lineMask(n, 'cartesian-random', 4, 0);
  const sense = loopCoilProblem(n, random);
  const uniform = lineMask(n, 'cartesian-uniform', 3, 8);
  const calibrationless = loopCoilProblem(n, uniform);
  const cases = [
    {
      label: 'cs-tv, maps given, R = 4 random lines',
      iterations: 20,
      run: (iterations: number) =>
        reconstruct(coilInput(random, sense.kspace, sense.maps), { name: 'cs-tv', iterations, tolerance: 0 }),
    },
    {
      label: 'lowrank-hankel 3×3 rank 18, no maps, R = 3 uniform',
      iterations: 10,
      run: (iterations: number) =>
        reconstruct(coilInput(uniform, calibrationless.kspace), {
          name: 'lowrank-hankel',
          iterations,
          tolerance: 0,
        }),
    },
    {
      label: 'lowrank-hankel 5×5 rank 35, no maps, R = 3 uniform',
      iterations: 5,
      run: (iterations: number) =>
        reconstruct(coilInput(uniform, calibrationless.kspace), {
          name: 'lowrank-hankel',
          kernel: 5,
          rank: 35,
          iterations,
          tolerance: 0,
        }),
    },
  ];
  const rows: BenchRow[] = [];
  for (const c of cases) {
    let info: Record<string, unknown> = c.run(1).info;
    const perIteration: number[] = [];
    const ratios: number[] = [];
    // The floor is re-measured just before each run (the machine's load drifts); medians of 3.
    for (let run = 0; run < 3; run++) {
      const floor = await floorOnce();
      floors.push(floor);
      const t0 = performance.now();
      info = c.run(c.iterations).info;
      const ms = (performance.now() - t0) / c.iterations;
      perIteration.push(ms);
      ratios.push(ms / floor);
    }
    const steps =
      info.meanProxSteps === undefined ? '' : `, ${Number(info.meanProxSteps).toFixed(1)} CG steps`;
    rows.push({
      name: `${c.label}, ${coils} coils ${n}², per iteration`,
      medianMs: median(perIteration),
      note: `${median(ratios).toFixed(1)}× the floor (median of 3 runs, floor re-measured before each)${steps}`,
    });
  }
  return [{ name: `${coils}×(fft2c+ifft2c) ${n}² (floor per iteration)`, medianMs: median(floors) }, ...rows];
}
