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
