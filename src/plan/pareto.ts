import { compareMetric, type MetricName } from './metric-direction.ts';

/** A row as the Pareto front sees it: scan time (shorter is better) and one metric's mean. */
export interface TradeoffPoint {
  scanSeconds: number;
  value: number | null;
}

/**
 * Flags the rows no other row beats on both scan time and `metric`: row i is dominated when some row
 * j is at least as short and at least as good, and strictly better in one of the two. Equal points
 * are both on the front. O(n²), plans have at most a few hundred rows.
 */
export function paretoFront(points: readonly TradeoffPoint[], metric: MetricName): boolean[] {
  return points.map((a, i) => {
    for (let j = 0; j < points.length; j++) {
      if (j === i) continue;
      const b = points[j];
      const metricOrder = compareMetric(metric, b.value, a.value);
      if (
        b.scanSeconds <= a.scanSeconds &&
        metricOrder >= 0 &&
        (b.scanSeconds < a.scanSeconds || metricOrder > 0)
      ) {
        return false;
      }
    }
    return true;
  });
}
