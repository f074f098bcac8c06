/** The four image-quality metrics a plan reports, in table order. */
export const metricNames = ['nrmse', 'psnr', 'ssim', 'hfen'] as const;
export type MetricName = (typeof metricNames)[number];

/** SSIM and PSNR: higher is better; NRMSE and HFEN: lower is better (docs/design.md §3.6). */
export const higherIsBetter: Readonly<Record<MetricName, boolean>> = Object.freeze({
  nrmse: false,
  psnr: true,
  ssim: true,
  hfen: false,
});

/**
 * Metric values in plan results are `number | null`, null standing for +∞ (a PSNR of an exact
 * reconstruction; JSON has no infinity). This reads them back as numbers.
 */
export function metricValue(value: number | null): number {
  return value === null ? Number.POSITIVE_INFINITY : value;
}

/** Positive when `a` is better than `b` for `metric`, negative when worse, 0 when equal. */
export function compareMetric(metric: MetricName, a: number | null, b: number | null): number {
  const x = metricValue(a);
  const y = metricValue(b);
  if (x === y) return 0;
  return higherIsBetter[metric] === x > y ? 1 : -1;
}

/** Upper-case display name with its unit. */
export function metricDisplayName(metric: MetricName): string {
  return metric === 'psnr' ? 'PSNR (dB)' : metric.toUpperCase();
}

/** JSON-safe number: non-finite values (∞, NaN) become null, read back as +∞ by metricValue. */
export function jsonNumber(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}
