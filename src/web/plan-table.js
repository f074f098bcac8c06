// The plan's tradeoff table as the service computed it (GET /v1/plans/{id} → table), and the points
// of the tradeoff plot taken from the same rows. Every number cell keeps the API's value in data-value.

import { formatMeanSd, formatNumber } from './format.js';

const metricColumns = [
  { metric: 'nrmse', label: 'NRMSE', kind: 'nrmse' },
  { metric: 'psnr', label: 'PSNR (dB)', kind: 'psnr' },
  { metric: 'ssim', label: 'SSIM', kind: 'ssim' },
  { metric: 'hfen', label: 'HFEN', kind: 'hfen' },
];

/** Column: header, the row field shown (dotted path), its number kind, or a text renderer. */
const columns = [
  { label: 'Pattern', text: (row) => row.pattern },
  { label: 'Method', text: (row) => row.method },
  { label: 'R requested', path: 'requestedR', kind: 'acceleration', missing: 'custom' },
  { label: 'R actual', path: 'actualR', kind: 'acceleration' },
  { label: 'Acquired', path: 'acquired', kind: 'count', suffix: (row) => ` ${row.acquiredUnit}` },
  { label: 'Scan (s)', path: 'scanSeconds', kind: 'seconds' },
  { label: 'Scan m:ss', text: (row) => row.scanFormatted },
  { label: 'Saved %', path: 'timeSavedPct', kind: 'percent' },
  ...metricColumns.map(({ metric, label, kind }) => ({
    label: `${label} mean ± sd`,
    path: `metrics.${metric}.mean`,
    kind,
    render: (row) => formatMeanSd(row.metrics[metric].mean, row.metrics[metric].sd, kind),
    missing: '∞',
  })),
  { label: 'Recon (ms)', path: 'reconMs', kind: 'ms' },
  { label: 'Pareto', text: (row) => (row.reference ? '' : row.pareto ? 'yes' : '') },
  { label: 'Meets target', text: (row) => (row.meetsTarget === null ? '' : row.meetsTarget ? 'yes' : 'no') },
];

const at = (row, path) => path.split('.').reduce((value, key) => value?.[key], row);

function formatCount(value) {
  return Number.isInteger(value) ? String(value) : value.toFixed(1);
}

function cell(row, column) {
  const td = document.createElement('td');
  if (column.text) {
    td.className = 'text';
    td.textContent = column.text(row) ?? '';
    return td;
  }
  const value = at(row, column.path);
  td.dataset.col = column.path;
  if (typeof value !== 'number') {
    td.textContent = value === null ? (column.missing ?? '–') : '–';
    return td;
  }
  td.dataset.value = String(value);
  const text = column.render
    ? column.render(row)
    : column.kind === 'count'
      ? formatCount(value)
      : formatNumber(value, column.kind);
  td.textContent = `${text}${column.suffix ? column.suffix(row) : ''}`;
  return td;
}

export function recommendedKey(plan) {
  const recommendation = plan.table?.recommendation ?? plan.recommendation;
  return recommendation?.overall?.key ?? null;
}

export function renderPlanTable(table, plan) {
  const head = document.createElement('tr');
  for (const column of columns) {
    const th = document.createElement('th');
    th.scope = 'col';
    th.textContent = column.label;
    if (column.text) th.className = 'text';
    head.append(th);
  }
  table.tHead.replaceChildren(head);
  const picked = recommendedKey(plan);
  const rows = plan.table?.rows ?? [];
  table.tBodies[0].replaceChildren(
    ...rows.map((row) => {
      const tr = document.createElement('tr');
      tr.dataset.row = row.key;
      tr.classList.toggle('reference', Boolean(row.reference));
      tr.classList.toggle('pareto', Boolean(row.pareto) && !row.reference);
      tr.classList.toggle('recommended', row.key === picked);
      tr.append(...columns.map((column) => cell(row, column)));
      return tr;
    }),
  );
  const caption = table.createCaption();
  caption.textContent = `Means over ${rows[0]?.seeds ?? '?'} seed(s); Pareto front on ${String(
    plan.table?.paretoMetric ?? 'nrmse',
  ).toUpperCase()} against scan time; highlighted: the recommendation.`;
}

/** One point per undersampled row (and the fully sampled reference), as the plot wants them. */
export function planPoints(plan, metric) {
  const picked = recommendedKey(plan);
  const points = [];
  for (const row of plan.table?.rows ?? []) {
    const y = row.metrics?.[metric]?.mean;
    if (typeof y !== 'number') continue; // +∞ (exact PSNR) has no place on the axis
    points.push({
      series: row.reference ? 'fully sampled' : `${row.pattern} · ${row.method}`,
      x: row.scanSeconds,
      y,
      pareto: Boolean(row.pareto) && !row.reference,
      recommended: row.key === picked,
    });
  }
  return points;
}
