import type { ScanTime } from '../protocol/scan-time.ts';
import type { MetricName } from './metric-direction.ts';
import type { GridPosition } from './row-key.ts';
import type { Summary } from './statistics.ts';
import type { Target } from './target-schema.ts';

/**
 * One row of the tradeoff table: one pattern × R × method, aggregated over the plan's seeds.
 * Means are arithmetic means over seeds; `sd` is the sample standard deviation (n − 1), 0 for one
 * seed. A null mean stands for +∞ (PSNR of an exact reconstruction), its sd is then null (undefined).
 */
export interface PlanRow extends GridPosition {
  /** Stable id: 'reference', 'p0-r2-m1', 'p3-m0' (custom mask). */
  key: string;
  /** Pattern label ('fully sampled' for the reference row), see labels.ts. */
  pattern: string;
  method: string;
  /** Requested R (1 for the reference row, null for a custom mask). */
  requestedR: number | null;
  /** Mean over seeds of the mask's actual R. */
  actualR: number;
  /** Mean over seeds of the count that costs scan time (random patterns draw a different count per seed). */
  acquired: number;
  acquiredUnit: 'lines' | 'points' | 'spokes';
  /** Mean over seeds of the scan time, and that mean as m:ss. */
  scanSeconds: number;
  scanFormatted: string;
  /** 100 · (1 − scanSeconds / fully sampled scan seconds). */
  timeSavedPct: number;
  metrics: Record<MetricName, Summary>;
  /** Mean reconstruction wall time in ms (the one quantity that varies between runs). */
  reconMs: number;
  /** Seeds aggregated in this row. */
  seeds: number;
  /** On the Pareto front of scan time vs the target metric (NRMSE without a target). */
  pareto: boolean;
  /** Whether the mean target metric meets the target; null without a target. */
  meetsTarget: boolean | null;
}

/** A row picked by the recommendation. */
export interface RowPick {
  rowIndex: number;
  key: string;
  pattern: string;
  method: string;
  requestedR: number | null;
  scanSeconds: number;
  scanFormatted: string;
  timeSavedPct: number;
  /** Mean of the target metric. */
  value: number | null;
}

export interface MethodRecommendation {
  methodIndex: number;
  method: string;
  /** Shortest scan with this method that meets the target, or null. */
  pick: RowPick | null;
  /** When none does: the row of this method closest to the target. */
  closest: RowPick | null;
}

export interface Recommendation {
  target: Target | null;
  /** Some undersampled row meets the target. */
  met: boolean;
  /** Shortest scan meeting the target over all methods. */
  overall: RowPick | null;
  /** When nothing meets the target: the row closest to it. */
  closest: RowPick | null;
  perMethod: MethodRecommendation[];
  /** The recommendation in one or two plain sentences. */
  statement: string;
}

export interface PlanTable {
  /** rows[0] is the fully sampled reference row (R = 1, zero-filled); the others follow plan order. */
  rows: PlanRow[];
  fullySampled: ScanTime;
  /** Metric of the Pareto front: the target's metric, NRMSE without a target. */
  paretoMetric: MetricName;
  recommendation: Recommendation;
  cells: { done: number; total: number };
  notes: string[];
}
