import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import type { ComplexImage } from '../../src/core/complex-image.ts';

/** Small timing helpers for the benchmark harness: medians from one run, never assertions. */
export interface BenchRow {
  name: string;
  medianMs: number;
  note?: string;
}

/** Median wall time in ms of `runs` calls after `warmup` untimed calls. */
export async function medianMs(fn: () => unknown | Promise<unknown>, runs = 7, warmup = 2): Promise<number> {
  for (let i = 0; i < warmup; i++) await fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const mid = times.length >> 1;
  return times.length % 2 ? times[mid] : (times[mid - 1] + times[mid]) / 2;
}

/**
 * The reference the benchmarks compare against: median ms of one fft2c + ifft2c pair on `image`
 * (in place, 11 runs).
 */
export function fftPairMs(image: ComplexImage): Promise<number> {
  return medianMs(() => {
    fft2c(image, image);
    ifft2c(image, image);
  }, 11);
}
