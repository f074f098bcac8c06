// Task scores of plans with lesions (the rows' `fidelity` group): their labels, table columns and
// plot values beside the image-quality metrics.

import { formatMeanSd } from './format.js';

export const taskColumns = [
  {
    metric: 'contrastRecovery',
    label: 'Contrast recovery',
    short: 'Recovery',
    kind: 'fraction',
    higherIsBetter: true,
  },
  { metric: 'falseLesions', label: 'False lesions', kind: 'percent', higherIsBetter: false },
  // Secondary (shown with "All columns"), so the key columns still fit a laptop screen.
  { metric: 'detectability', label: 'Detectability d′', kind: 'psnr', higherIsBetter: true, secondary: true },
  {
    metric: 'resolvedFraction',
    label: 'Resolved (fraction)',
    kind: 'fraction',
    higherIsBetter: true,
    secondary: true,
  },
];

export const taskLabel = (metric) => taskColumns.find((c) => c.metric === metric)?.label;
export const isTaskScore = (metric) => taskColumns.some((c) => c.metric === metric);

/** A row's summary { mean, sd } of a metric or task score (undefined when the row has none). */
export function rowSummary(row, metric) {
  return row.metrics?.[metric] ?? row.fidelity?.[metric];
}

/** Table columns for the task scores, shown (not secondary) when the plan had lesions. */
export function taskTableColumns(rows) {
  if (!rows.some((row) => row.fidelity)) return [];
  return taskColumns.map(({ metric, label, short, kind, secondary }) => ({
    // A short header without "mean ± sd" (the cells show both; the title says so), so the key columns fit.
    label: short ?? label,
    title: `${label}: mean over the seeds ± sample standard deviation (n − 1), from the inserted lesions`,
    path: `fidelity.${metric}.mean`,
    kind,
    render: (row) => formatMeanSd(row.fidelity[metric].mean, row.fidelity[metric].sd, kind),
    missing: '∞',
    secondary: Boolean(secondary),
    metric,
  }));
}

/** The plot's task-score choices are offered only when the plan's rows carry them. */
export function offerTaskScores(select, rows) {
  const scored = rows.some((row) => row.fidelity);
  for (const option of select.options) {
    if (isTaskScore(option.value)) option.disabled = !scored;
  }
}
