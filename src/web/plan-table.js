// The plan's tradeoff table as the service computed it (GET /v1/plans/{id} → table), and the points
// of the tradeoff plot taken from the same rows. Every number cell keeps the API's value in data-value.
// Key columns (what the row is, its scan time, the target metric, Pareto, meets target) come first
// and always show; the others are secondary and hidden until "All columns" is ticked, so the table
// needs no sideways scroll on a laptop screen.

import { formatMeanSd, formatNumber } from './format.js';
import { rowSummary, taskColumns, taskLabel, taskTableColumns } from './task-scores.js';

export const metricColumns = [
  { metric: 'nrmse', label: 'NRMSE', kind: 'nrmse' },
  { metric: 'psnr', label: 'PSNR (dB)', kind: 'psnr' },
  { metric: 'ssim', label: 'SSIM', kind: 'ssim' },
  { metric: 'hfen', label: 'HFEN', kind: 'hfen' },
];

const metricLabel = (metric) =>
  metricColumns.find((c) => c.metric === metric)?.label ?? taskLabel(metric) ?? metric;

function metricColumn({ metric, label, kind }, secondary) {
  return {
    label: `${label} mean ± sd`,
    title: `${label}: mean over the seeds ± sample standard deviation (n − 1)`,
    path: `metrics.${metric}.mean`,
    kind,
    render: (row) => formatMeanSd(row.metrics[metric].mean, row.metrics[metric].sd, kind),
    missing: '∞',
    secondary,
    metric,
  };
}

/**
 * Columns: header, hover definition, the row field shown (dotted path), its number kind or a text
 * renderer, and whether it is secondary. The target metric's column sits beside the scan time.
 */
function columnsFor(targetMetric, rows = []) {
  const target = metricColumns.find((c) => c.metric === targetMetric) ?? metricColumns[0];
  // The array and g columns are key columns only when the plan has a receive array or a g-factor.
  const arrays = !rows.every((row) => (row.coils ?? 'uniform') === 'uniform');
  const withG = rows.some((row) => typeof row.gFactorMax === 'number');
  // Volume plans only: how the row acquired the volume (3D or multi-slice); 2D tables keep their columns.
  const volume = rows.some((row) => row.acquisition !== undefined);
  return [
    { label: 'Pattern', title: 'Sampling pattern', text: (row) => row.pattern, sticky: true },
    { label: 'Method', title: 'Reconstruction method', text: (row) => row.method },
    ...(volume
      ? [
          {
            label: 'Acquisition',
            title: 'How the volume was acquired: 3D (ky–kz undersampling) or multi-slice 2D',
            text: (row) => row.acquisition,
          },
        ]
      : []),
    {
      label: 'Coils',
      title: 'Receive array of the row (its label and coil count)',
      text: (row) => row.coils ?? '',
      secondary: !arrays,
    },
    {
      label: 'R',
      title: 'Requested acceleration R (fully sampled count ÷ acquired count)',
      path: 'requestedR',
      kind: 'acceleration',
      missing: 'custom',
    },
    {
      label: 'Scan (s)',
      title: 'Scan time in seconds, then as m:ss',
      path: 'scanSeconds',
      kind: 'seconds',
      suffix: (row) => ` · ${row.scanFormatted}`,
    },
    {
      label: 'Saved (%)',
      title: 'Time saved against the fully sampled scan, in per cent',
      path: 'timeSavedPct',
      kind: 'percent',
    },
    { ...metricColumn(target, false), target: true },
    ...taskTableColumns(rows),
    {
      label: 'Pareto',
      title: `On the Pareto front of scan time against ${target.label}`,
      text: (row) => (row.reference ? '' : row.pareto ? 'yes' : ''),
    },
    {
      label: 'Meets target',
      title: 'The means meet every target (the metric target and any task-score targets)',
      text: (row) => (row.meetsTarget === null ? '' : row.meetsTarget ? 'yes' : 'no'),
    },
    {
      label: 'g max',
      title:
        'Largest g-factor over the object, mean over seeds (blank: no g-factor for this method and mask)',
      path: 'gFactorMax',
      kind: 'g',
      secondary: !withG,
    },
    {
      label: 'g mean',
      title: 'Mean g-factor over the object, mean over seeds',
      path: 'gFactorMean',
      kind: 'g',
      secondary: true,
    },
    {
      label: 'g method',
      title: 'How g was found: analytic (SENSE on a uniform lattice) or pseudo-replica',
      text: (row) => row.gFactorMethod ?? '',
      secondary: true,
    },
    {
      label: 'TE eff (ms)',
      title:
        'Effective TE: time of the echo acquiring the k-space centre (mean over seeds; needs an echo spacing or a TE)',
      path: 'effectiveTeMs',
      kind: 'ms',
      secondary: true,
    },
    {
      label: 'Images',
      title: "The row's seed-1 reconstruction, error map and mask",
      action: (row) => (row.resultId ? 'View' : null),
    },
    {
      label: 'R actual',
      title: 'Acceleration the mask reached (mean over seeds)',
      path: 'actualR',
      kind: 'acceleration',
      secondary: true,
    },
    {
      label: 'Acquired',
      title: 'Lines, points or spokes that cost scan time (mean over seeds)',
      path: 'acquired',
      kind: 'count',
      suffix: (row) => ` ${row.acquiredUnit}`,
      secondary: true,
    },
    ...metricColumns.filter((c) => c !== target).map((c) => metricColumn(c, true)),
    {
      label: 'Recon (ms)',
      title: 'Mean reconstruction wall time in milliseconds (varies between runs)',
      path: 'reconMs',
      kind: 'ms',
      secondary: true,
    },
  ];
}

const at = (row, path) => path.split('.').reduce((value, key) => value?.[key], row);

function formatCount(value) {
  return Number.isInteger(value) ? String(value) : value.toFixed(1);
}

function cell(row, column) {
  const td = document.createElement('td');
  if (column.secondary) td.classList.add('secondary');
  if (column.sticky) td.classList.add('sticky');
  if (column.target) td.classList.add('target');
  if (column.action) {
    td.classList.add('text');
    const label = column.action(row);
    if (label) {
      const button = document.createElement('button');
      button.type = 'button';
      button.className = 'secondary small';
      button.textContent = label;
      button.dataset.openRow = row.key;
      button.setAttribute('aria-label', `${label} the images of ${row.pattern} · ${row.method}`);
      td.append(button);
    }
    return td;
  }
  if (column.text) {
    td.classList.add('text');
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
  const columns = columnsFor(plan.table?.paretoMetric, plan.table?.rows ?? []);
  const head = document.createElement('tr');
  for (const column of columns) {
    const th = document.createElement('th');
    th.scope = 'col';
    th.textContent = column.label;
    th.title = column.title;
    if (column.text || column.action) th.classList.add('text');
    if (column.secondary) th.classList.add('secondary');
    if (column.sticky) th.classList.add('sticky');
    if (column.target) th.classList.add('target');
    if (column.metric) th.dataset.metric = column.metric;
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
  caption.textContent = `Means over ${rows[0]?.seeds ?? '?'} seed(s); Pareto front on ${metricLabel(
    plan.table?.paretoMetric ?? 'nrmse',
  )} against scan time; highlighted: the recommendation.`;
}

/** One sentence per row for the plot's hover box and its list of points. */
/** A row's name in the plot: pattern and method, its array when the plan sweeps several, a volume's acquisition. */
function seriesName(row, arrays) {
  return `${row.pattern} · ${row.method}${arrays ? ` · ${row.coils}` : ''}${row.acquisition ? ` · ${row.acquisition}` : ''}`;
}

function describeRow(row, metric, picked, arrays) {
  const value = rowSummary(row, metric);
  const kind = [...metricColumns, ...taskColumns].find((c) => c.metric === metric)?.kind;
  const r = row.reference
    ? 'R 1, fully sampled'
    : row.requestedR === null
      ? `custom mask, R ${formatNumber(row.actualR, 'acceleration')}`
      : `R ${row.requestedR} (actual ${formatNumber(row.actualR, 'acceleration')})`;
  const flags = [
    row.pareto && !row.reference ? 'Pareto front' : '',
    row.key === picked ? 'recommended' : '',
  ].filter(Boolean);
  return (
    `${seriesName(row, arrays)}, ${r}: scan ${row.scanFormatted} (${formatNumber(row.scanSeconds, 'seconds')} s), ` +
    `saved ${formatNumber(row.timeSavedPct, 'percent')} %, ${metricLabel(metric)} ${formatMeanSd(value?.mean, value?.sd, kind)}` +
    (flags.length ? `; ${flags.join(', ')}` : '')
  );
}

/**
 * Every row of the table as a plot point (the reference included); rows whose plotted value is +∞
 * (PSNR of an exact reconstruction) have no place on the axis and come back in `offAxis`.
 */
export function planPoints(plan, metric) {
  const picked = recommendedKey(plan);
  const points = [];
  const offAxis = [];
  const arrays = new Set((plan.table?.rows ?? []).map((row) => row.coils ?? 'uniform')).size > 1;
  for (const row of plan.table?.rows ?? []) {
    const y = rowSummary(row, metric)?.mean;
    if (typeof y !== 'number') {
      offAxis.push(row);
      continue;
    }
    points.push({
      key: row.key,
      series: row.reference ? 'fully sampled' : seriesName(row, arrays),
      x: row.scanSeconds,
      y,
      R: row.reference ? 1 : row.requestedR,
      reference: Boolean(row.reference),
      pareto: Boolean(row.pareto) && !row.reference,
      recommended: row.key === picked,
      describe: describeRow(row, metric, picked, arrays),
    });
  }
  return { points, offAxis };
}
