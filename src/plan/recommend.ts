import { type MetricName, metricDisplayName, metricValue } from './metric-direction.ts';
import type { PlanRow, Recommendation, RowPick } from './plan-table.ts';
import {
  G_FACTOR_MAX,
  type Target,
  type TargetMetric,
  targetBound,
  targetHigherIsBetter,
} from './target-schema.ts';
import { isTaskMetric, taskMetrics } from './task-metrics.ts';

/** Whether a row's mean of the target metric meets the target (null = +∞; undefined = not scored: not met). */
export function meetsTarget(value: number | null | undefined, target: Target): boolean {
  if (value === undefined) return false;
  const { threshold, atLeast } = targetBound(target);
  const x = metricValue(value);
  return atLeast ? x >= threshold : x <= threshold;
}

/** A row's mean of a target's metric: a global metric, or a task score of its fidelity group (undefined without one). */
export function targetValue(
  row: Pick<PlanRow, 'metrics' | 'fidelity' | 'gFactorMax'>,
  metric: TargetMetric,
): number | null | undefined {
  if (metric === G_FACTOR_MAX) return row.gFactorMax ?? undefined;
  return isTaskMetric(metric) ? row.fidelity?.[metric].mean : row.metrics[metric].mean;
}

/** Whether a row meets every target. */
export function meetsTargets(
  row: Pick<PlanRow, 'metrics' | 'fidelity' | 'gFactorMax'>,
  targets: readonly Target[],
): boolean {
  return targets.every((t) => meetsTarget(targetValue(row, t.metric), t));
}

/** Positive when `a` is better than `b` for `metric` (undefined: worst), negative when worse, 0 when equal. */
function compareTarget(
  metric: TargetMetric,
  a: number | null | undefined,
  b: number | null | undefined,
): number {
  if (a === undefined || b === undefined) return a === b ? 0 : a === undefined ? -1 : 1;
  const x = metricValue(a);
  const y = metricValue(b);
  if (x === y) return 0;
  return targetHigherIsBetter(metric) === x > y ? 1 : -1;
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
 * - Shortest scan meeting the target, overall and per method. Ties: the shorter mean scan, then the
 *   better mean target metric, then the earlier row in plan order (pattern, R as listed, method).
 * - Nothing meets it: the closest row, i.e. the best mean target metric; ties: shorter scan, then
 *   plan order.
 */
export function recommend(
  rows: readonly PlanRow[],
  targetOrTargets: Target | readonly Target[] | null,
  methods: readonly string[],
  paretoMetric: MetricName,
): Recommendation {
  const targets: readonly Target[] =
    targetOrTargets === null
      ? []
      : Array.isArray(targetOrTargets)
        ? targetOrTargets
        : [targetOrTargets as Target];
  const target = targets[0] ?? null;
  const candidates = rows.map((row, rowIndex) => ({ row, rowIndex })).filter(({ row }) => !row.reference);
  if (target === null) {
    return {
      target: null,
      targets: [],
      decidedBy: null,
      met: false,
      overall: null,
      closest: null,
      perMethod: methods.map((method, methodIndex) => ({ methodIndex, method, pick: null, closest: null })),
      statement:
        `No target given: the rows on the Pareto front of scan time versus ${metricDisplayName(paretoMetric)} ` +
        'are flagged; add a target ({ metric, atLeast | atMost }) for a recommendation.',
    };
  }
  const metric = target.metric;
  const value = (c: Candidate) => targetValue(c.row, metric);
  const shortestFirst = (a: Candidate, b: Candidate) =>
    compareScan(a.row.scanSeconds, b.row.scanSeconds) ||
    compareTarget(metric, value(b), value(a)) ||
    a.rowIndex - b.rowIndex;
  // Closest: most targets met, then the best value of the first target, the shorter scan, plan order.
  const metCount = (c: Candidate) =>
    targets.filter((t) => meetsTarget(targetValue(c.row, t.metric), t)).length;
  const closestFirst = (a: Candidate, b: Candidate) =>
    metCount(b) - metCount(a) ||
    compareTarget(metric, value(b), value(a)) ||
    compareScan(a.row.scanSeconds, b.row.scanSeconds) ||
    a.rowIndex - b.rowIndex;
  const shortestMeeting = (list: readonly Candidate[], wanted: readonly Target[]) =>
    [...list.filter(({ row }) => meetsTargets(row, wanted))].sort(shortestFirst)[0];
  const pickFrom = (list: Candidate[]) => {
    const best = shortestMeeting(list, targets);
    if (best) return { pick: toPick(best, metric), closest: null };
    return { pick: null, closest: list.length > 0 ? toPick([...list].sort(closestFirst)[0], metric) : null };
  };

  const overall = pickFrom(candidates);
  const perMethod = methods.map((method, methodIndex) => ({
    methodIndex,
    method,
    ...pickFrom(candidates.filter(({ row }) => row.methodIndex === methodIndex)),
  }));
  const chosen = overall.pick ? candidates.find((c) => c.rowIndex === overall.pick?.rowIndex) : undefined;
  const decision = chosen ? decidingTarget(candidates, targets, chosen, shortestMeeting) : null;
  return {
    target,
    targets: [...targets],
    decidedBy: decision?.target ?? null,
    met: overall.pick !== null,
    overall: overall.pick,
    closest: overall.closest,
    perMethod,
    statement:
      targets.length === 1 && !isTaskMetric(metric) && metric !== G_FACTOR_MAX
        ? statementFor(target, overall.pick, overall.closest)
        : statementForTargets(targets, overall.pick, overall.closest, decision),
  };
}

interface Decision {
  target: Target;
  /** The shorter scan this target rules out (the pick without it), when one target alone does. */
  without: RowPick | null;
}

/**
 * The target that decided the pick: the one whose removal would let the shortest scan in (a
 * shorter row meets all the others). When no single target does (a shorter row fails two), the first
 * target, in the plan's order, that the shortest rejected row fails. None when the shortest
 * candidate meets every target.
 */
function decidingTarget(
  candidates: readonly Candidate[],
  targets: readonly Target[],
  chosen: Candidate,
  shortestMeeting: (list: readonly Candidate[], wanted: readonly Target[]) => Candidate | undefined,
): Decision | null {
  const shorter = candidates.filter((c) => compareScan(c.row.scanSeconds, chosen.row.scanSeconds) < 0);
  if (shorter.length === 0) return null;
  let best: { target: Target; alternative: Candidate } | null = null;
  for (const t of targets) {
    const alternative = shortestMeeting(
      shorter,
      targets.filter((other) => other !== t),
    );
    if (
      alternative &&
      (!best || compareScan(alternative.row.scanSeconds, best.alternative.row.scanSeconds) < 0)
    ) {
      best = { target: t, alternative };
    }
  }
  if (best) return { target: best.target, without: toPick(best.alternative, best.target.metric) };
  const fastest = [...shorter].sort(
    (a, b) => compareScan(a.row.scanSeconds, b.row.scanSeconds) || a.rowIndex - b.rowIndex,
  )[0];
  const failed = targets.find((t) => !meetsTarget(targetValue(fastest.row, t.metric), t));
  return failed ? { target: failed, without: null } : null;
}

interface Candidate {
  row: PlanRow;
  rowIndex: number;
}

function toPick({ row, rowIndex }: Candidate, metric: TargetMetric): RowPick {
  return {
    rowIndex,
    key: row.key,
    pattern: row.pattern,
    method: row.method,
    requestedR: row.requestedR,
    scanSeconds: row.scanSeconds,
    scanFormatted: row.scanFormatted,
    timeSavedPct: row.timeSavedPct,
    value: targetValue(row, metric) ?? null,
  };
}

function targetDisplayName(metric: TargetMetric): string {
  if (metric === G_FACTOR_MAX) return 'largest g-factor';
  return isTaskMetric(metric) ? taskMetrics[metric].label : metricDisplayName(metric);
}

export function describeTarget(target: Target): string {
  const { threshold, atLeast } = targetBound(target);
  return `${targetDisplayName(target.metric)} ${atLeast ? '≥' : '≤'} ${threshold}`;
}

function formatValue(metric: TargetMetric, value: number | null): string {
  if (value === null) return '∞';
  if (metric === G_FACTOR_MAX) return value.toFixed(3);
  if (isTaskMetric(metric)) return value.toFixed(taskMetrics[metric].decimals);
  return metric === 'psnr' ? value.toFixed(2) : value.toFixed(4);
}

function describePick(pick: RowPick, metric: TargetMetric): string {
  const r = pick.requestedR === null ? 'custom mask' : `R = ${pick.requestedR}`;
  return (
    `${pick.pattern}, ${r}, ${pick.method}: ${pick.scanFormatted} ` +
    `(${pick.timeSavedPct.toFixed(1)} % shorter than fully sampled), ` +
    `${targetDisplayName(metric)} ${formatValue(metric, pick.value)}`
  );
}

function statementForTargets(
  targets: readonly Target[],
  pick: RowPick | null,
  closest: RowPick | null,
  decision: Decision | null,
): string {
  const wanted = targets.map(describeTarget).join(' and ');
  const metric = targets[0].metric;
  if (pick) {
    const decided = decision
      ? ` Decided by ${describeTarget(decision.target)}` +
        (decision.without
          ? `: without it, ${describePick(decision.without, decision.target.metric)} would be chosen.`
          : ': the shorter scans fail it (and another target).')
      : ' The shortest scan in the plan meets every target.';
    return `Shortest scan meeting ${wanted}: ${describePick(pick, metric)}.${decided}`;
  }
  if (closest) return `Nothing in this plan meets ${wanted}. Closest: ${describePick(closest, metric)}.`;
  return `Nothing in this plan meets ${wanted}: no undersampled row has results yet.`;
}

function statementFor(target: Target, pick: RowPick | null, closest: RowPick | null): string {
  const wanted = describeTarget(target);
  if (pick) return `Shortest scan meeting ${wanted}: ${describePick(pick, target.metric)}.`;
  if (closest) {
    return `Nothing in this plan meets ${wanted}. Closest: ${describePick(closest, target.metric)}.`;
  }
  return `Nothing in this plan meets ${wanted}: no undersampled row has results yet.`;
}
