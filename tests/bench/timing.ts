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
  return (await medianWallAndCpuMs(fn, runs, warmup)).wallMs;
}

/** Median of `values` (the mean of the middle two for an even count). */
export function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** This process's CPU time in ms (user + system, all threads). */
export function cpuMs(): number {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1000;
}

/**
 * Medians of wall time and of the process's CPU time (user + system over all its threads) in ms of
 * `runs` calls after `warmup` untimed calls. On a shared machine the CPU time is the steadier cost:
 * other processes stretch the wall time, not this process's CPU time.
 */
export async function medianWallAndCpuMs(
  fn: () => unknown | Promise<unknown>,
  runs = 7,
  warmup = 2,
): Promise<{ wallMs: number; cpuMs: number }> {
  for (let i = 0; i < warmup; i++) await fn();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    await fn();
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  return { wallMs: median(wall), cpuMs: median(cpu) };
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
