/**
 * Task scores a plan target may name beside the image-quality metrics: feature-fidelity scores of
 * a plan with `lesions` (DEVELOPERS.md "Feature fidelity"), each read from a row's `fidelity` group
 * (mean over seeds). Adding a task score: one entry here and its column in the row's fidelity group.
 */
export const taskMetricNames = [
  'contrastRecovery',
  'falseLesions',
  'detectability',
  'resolvedFraction',
] as const;
export type TaskMetricName = (typeof taskMetricNames)[number];

export interface TaskMetric {
  higherIsBetter: boolean;
  /** Display name in statements and columns. */
  label: string;
  decimals: number;
}

export const taskMetrics: Readonly<Record<TaskMetricName, TaskMetric>> = Object.freeze({
  contrastRecovery: { higherIsBetter: true, label: 'contrast recovery', decimals: 3 },
  falseLesions: { higherIsBetter: false, label: 'false lesions', decimals: 2 },
  detectability: { higherIsBetter: true, label: "detectability d'", decimals: 2 },
  resolvedFraction: { higherIsBetter: true, label: 'lesions resolved (fraction)', decimals: 3 },
});

export function isTaskMetric(name: string): name is TaskMetricName {
  return (taskMetricNames as readonly string[]).includes(name);
}
