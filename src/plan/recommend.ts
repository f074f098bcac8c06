import { compareMetric, type MetricName, metricDisplayName, metricValue } from './metric-direction.ts';
import type { PlanRow, Recommendation, RowPick } from './plan-table.ts';
import { isMetricTarget, type PlanTarget } from './plan-targets.ts';
import { type Target, targetBound } from './target-schema.ts';

/** Whether a row's mean of the target metric meets the target (null = +∞). */
export function meetsTarget(value: number | null, target: Target): boolean {
  const { threshold, atLeast } = targetBound(target);
  const x = metricValue(value);
  return atLeast ? x >= threshold : x <= threshold;
}

/** Whether a row meets one target: a metric's mean, or its mean largest g (a row without a g-factor does not). */
export function meetsPlanTarget(row: PlanRow, target: PlanTarget): boolean {
  if (isMetricTarget(target)) return meetsTarget(row.metrics[target.metric].mean, target);
  return row.gFactorMax !== null && row.gFactorMax <= target.atMost;
}

/** Whether a row meets every target of the plan. */
export function meetsAllTargets(row: PlanRow, targets: readonly PlanTarget[]): boolean {
  return targets.every((target) => meetsPlanTarget(row, target));
}

/** Scan times closer than this (relative) count as equal, so float noise in means cannot break a tie. */
const SAME_TIME = 1e-9;

function compareScan(a: number, b: number): number {
  return Math.abs(a - b) <= SAME_TIME * Math.max(Math.abs(a), Math.abs(b)) ? 0 : a - b;
}

/**
 * The recommendation over the undersampled rows (the fully sampled reference row is the baseline,
 * not a candidate; a plan that lists R = 1 has its own candidate rows). Judged on the mean over seeds.
 *
 * - Shortest scan meeting every target, overall and per method. Ties: the shorter mean scan, then
 *   the better mean ranking metric (`paretoMetric`: the first image-quality target's), then the
 *   earlier row in plan order (pattern, R as listed, method, coil array).
 * - Nothing meets them all: the closest row, i.e. the one meeting the most targets, then the best
 *   mean ranking metric; ties: shorter scan, then plan order. With one target this is the best mean
 *   of its metric.
 */
export function recommend(
  rows: readonly PlanRow[],
  targets: readonly PlanTarget[],
  methods: readonly string[],
  paretoMetric: MetricName,
): Recommendation {
  const candidates = rows.map((row, rowIndex) => ({ row, rowIndex })).filter(({ row }) => !row.reference);
  const target = targets[0] ?? null;
  if (target === null) {
    return {
      target: null,
      targets: [],
      met: false,
      overall: null,
      closest: null,
      perMethod: methods.map((method, methodIndex) => ({ methodIndex, method, pick: null, closest: null })),
      statement:
        `No target given: the rows on the Pareto front of scan time versus ${metricDisplayName(paretoMetric)} ` +
        'are flagged; add a target ({ metric, atLeast | atMost }) for a recommendation.',
    };
  }
  const metric = paretoMetric;
  const met = (row: PlanRow) => targets.filter((t) => meetsPlanTarget(row, t)).length;
  const shortestFirst = (a: Candidate, b: Candidate) =>
    compareScan(a.row.scanSeconds, b.row.scanSeconds) ||
    compareMetric(metric, b.row.metrics[metric].mean, a.row.metrics[metric].mean) ||
    a.rowIndex - b.rowIndex;
  const closestFirst = (a: Candidate, b: Candidate) =>
    met(b.row) - met(a.row) ||
    compareMetric(metric, b.row.metrics[metric].mean, a.row.metrics[metric].mean) ||
    compareScan(a.row.scanSeconds, b.row.scanSeconds) ||
    a.rowIndex - b.rowIndex;
  const pickFrom = (list: Candidate[]) => {
    const meeting = list.filter(({ row }) => meetsAllTargets(row, targets));
    if (meeting.length > 0)
      return { pick: toPick([...meeting].sort(shortestFirst)[0], metric), closest: null };
    return { pick: null, closest: list.length > 0 ? toPick([...list].sort(closestFirst)[0], metric) : null };
  };

  const overall = pickFrom(candidates);
  const perMethod = methods.map((method, methodIndex) => ({
    methodIndex,
    method,
    ...pickFrom(candidates.filter(({ row }) => row.methodIndex === methodIndex)),
  }));
  return {
    target,
    targets: [...targets],
    met: overall.pick !== null,
    overall: overall.pick,
    closest: overall.closest,
    perMethod,
    statement: statementFor(targets, metric, overall.pick, overall.closest),
  };
}

interface Candidate {
  row: PlanRow;
  rowIndex: number;
}

function toPick({ row, rowIndex }: Candidate, metric: MetricName): RowPick {
  return {
    rowIndex,
    key: row.key,
    pattern: row.pattern,
    method: row.method,
    requestedR: row.requestedR,
    scanSeconds: row.scanSeconds,
    scanFormatted: row.scanFormatted,
    timeSavedPct: row.timeSavedPct,
    value: row.metrics[metric].mean,
  };
}

export function describeTarget(target: PlanTarget): string {
  if (!isMetricTarget(target)) return `largest g-factor ≤ ${target.atMost}`;
  const { threshold, atLeast } = targetBound(target);
  return `${metricDisplayName(target.metric)} ${atLeast ? '≥' : '≤'} ${threshold}`;
}

function formatValue(metric: MetricName, value: number | null): string {
  if (value === null) return '∞';
  return metric === 'psnr' ? value.toFixed(2) : value.toFixed(4);
}

function describePick(pick: RowPick, metric: MetricName): string {
  const r = pick.requestedR === null ? 'custom mask' : `R = ${pick.requestedR}`;
  return (
    `${pick.pattern}, ${r}, ${pick.method}: ${pick.scanFormatted} ` +
    `(${pick.timeSavedPct.toFixed(1)} % shorter than fully sampled), ` +
    `${metricDisplayName(metric)} ${formatValue(metric, pick.value)}`
  );
}

function statementFor(
  targets: readonly PlanTarget[],
  metric: MetricName,
  pick: RowPick | null,
  closest: RowPick | null,
): string {
  const wanted = targets.map(describeTarget).join(' and ');
  if (pick) return `Shortest scan meeting ${wanted}: ${describePick(pick, metric)}.`;
  if (closest) {
    return `Nothing in this plan meets ${wanted}. Closest: ${describePick(closest, metric)}.`;
  }
  return `Nothing in this plan meets ${wanted}: no undersampled row has results yet.`;
}
