import { coilArrayMaps } from '../../src/coils/coil-array.ts';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { complexFromReal, createComplexImage } from '../../src/core/complex-image.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { CartesianEncoding } from '../../src/encoding/cartesian-encoding.ts';
import { sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import {
  prepareGrappa,
  prepareSense,
  pseudoReplicaGFactor,
  replicaReconstructor,
} from '../../src/recon/index.ts';
import { type BenchRow, median, medianMs } from './timing.ts';

/**
 * Parallel imaging at 256² with 8 loop coils on the modified Shepp–Logan raster (data from the
 * encoding operator itself): CG-SENSE with the true maps, 30 iterations (tolerance 0), against its
 * FFT floor of 2 × coils × iterations centred 2D FFTs; GRAPPA [4, 5] on uniform R = 4 + 24 ACS lines,
 * first fill (calibration of every kernel + application) and a refill with the kernels cached;
 * a 50-replica g map of zero-filled sensitivity-weighted combination (R = 4).
 */
function timed(fn: () => unknown): { wall: number; cpu: number } {
  const w0 = performance.now();
  const c0 = process.cpuUsage();
  fn();
  const c = process.cpuUsage(c0);
  return { wall: performance.now() - w0, cpu: (c.user + c.system) / 1000 };
}

export async function benchParallelImaging(): Promise<BenchRow[]> {
  const n = 256;
  const coils = 8;
  const iterations = 30;
  const maps = coilArrayMaps({ array: 'loops', count: coils, loopRadius: 0.35, ringRadius: 1.25 }, n, n);
  const x = complexFromReal(sheppLoganModified().rasterize(n, n, { supersample: 4 }).data, n, n);
  const mask = new Uint8Array(n * n);
  for (let v = 0; v < n; v++) if (v % 4 === 0 || Math.abs(v - n / 2) < 12) mask.fill(1, v * n, (v + 1) * n);
  const y = new CartesianEncoding(n, n, mask, maps).forward(x);
  const plane = { nx: n, ny: n, data: y.data.subarray(0, 2 * n * n) };
  const input = { kspace: plane, mask, coils: { kspace: y, maps } };
  const limits = { ...defaultLimits, maxIterations: 1000 };

  const sense = prepareSense(input, { name: 'sense', iterations }, limits);
  const image = createComplexImage(n, n);
  image.data.set(x.data);
  const pairs = (): void => {
    for (let i = 0; i < 10; i++) {
      fft2c(image, image);
      ifft2c(image, image);
    }
  };
  // Wall and CPU time of each SENSE run against 10 FFT pairs measured just before it: on a shared
  // machine the CPU-time ratio is the steadier one.
  const wallRatios: number[] = [];
  const cpuRatios: number[] = [];
  const senseRuns: number[] = [];
  pairs();
  sense.solve(y, mask, { iterations: 2, tolerance: 0 });
  for (let run = 0; run < 3; run++) {
    const pair = timed(pairs);
    const solve = timed(() => sense.solve(y, mask, { iterations, tolerance: 0 }));
    const floorScale = (coils * iterations) / 10;
    wallRatios.push(solve.wall / (pair.wall * floorScale));
    cpuRatios.push(solve.cpu / (pair.cpu * floorScale));
    senseRuns.push(solve.wall);
  }
  const senseMs = median(senseRuns);

  const firstFillMs = await medianMs(() => prepareGrappa(input, { name: 'grappa' }).fill(y, mask), 3, 0);
  const grappa = prepareGrappa(input, { name: 'grappa' });
  grappa.fill(y, mask);
  const refillMs = await medianMs(() => grappa.fill(y, mask), 3, 1);

  const full = new CartesianEncoding(n, n, new Uint8Array(n * n).fill(1), maps).forward(x);
  const support = new Uint8Array(n * n).fill(1);
  const reconstruct = replicaReconstructor(input, { name: 'zero-filled' }, {}, limits);
  const replicaMs = await medianMs(
    () =>
      pseudoReplicaGFactor({
        acquired: y,
        mask,
        full,
        reconstruct,
        sigma: 0.01,
        replicas: 50,
        seed: 1,
        support,
      }),
    1,
    0,
  );
  return [
    {
      name: `CG-SENSE ${coils} coils ${n}², ${iterations} iterations`,
      medianMs: senseMs,
      note: `${median(wallRatios).toFixed(2)}× its FFT floor of 2·${coils}·${iterations} fft2c in wall time, ${median(cpuRatios).toFixed(2)}× in CPU time (medians of 3)`,
    },
    { name: `GRAPPA [4, 5] ${coils} coils ${n}², R = 4 + 24 ACS: calibrate + fill`, medianMs: firstFillMs },
    { name: 'GRAPPA: fill with the kernels calibrated', medianMs: refillMs },
    {
      name: `g map, 50 pseudo-replicas, zero-filled ${coils} coils ${n}²`,
      medianMs: replicaMs,
      note: '100 reconstructions (accelerated + full)',
    },
  ];
}
