// The tradeoff plot: one image-error metric against scan time, one series per pattern and method,
// with the plan's Pareto front and its recommendation marked. Drawn with uPlot (served from node_modules).

import uPlot from './vendor/uplot/uPlot.esm.js';

/** Okabe–Ito colour-blind-safe palette (Okabe & Ito 2008), one colour per pattern+method series. */
const palette = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#D55E00', '#8A7B00', '#444444'];

const metricLabels = {
  nrmse: 'NRMSE (lower is better)',
  psnr: 'PSNR in dB (higher is better)',
  ssim: 'SSIM (higher is better)',
  hfen: 'HFEN (lower is better)',
};

/** Draws only markers: the recommendation is a point, not a line. */
const noLine = () => null;

/**
 * points: [{ series, x (scan seconds), y (metric), pareto, recommended }]; the plan's Pareto front is
 * computed on paretoMetric, which may differ from the plotted metric. Returns the uPlot instance.
 */
export function drawTradeoffPlot(container, points, metric, paretoMetric) {
  container.replaceChildren();
  const xs = [...new Set(points.map((p) => p.x))].sort((a, b) => a - b);
  const xIndex = new Map(xs.map((x, i) => [x, i]));
  const names = [...new Set(points.map((p) => p.series))];

  const columns = names.map((name) => {
    const ys = new Array(xs.length).fill(null);
    for (const p of points) if (p.series === name) ys[xIndex.get(p.x)] = p.y;
    return ys;
  });
  const front = new Array(xs.length).fill(null);
  const recommended = new Array(xs.length).fill(null);
  for (const p of points) {
    if (p.pareto) front[xIndex.get(p.x)] = p.y;
    if (p.recommended) recommended[xIndex.get(p.x)] = p.y;
  }

  const series = [
    { label: 'scan time (s)', value: (_u, v) => (v == null ? '–' : `${v.toFixed(1)} s`) },
    ...names.map((name, i) => ({
      label: name,
      stroke: palette[i % palette.length],
      width: 1.5,
      spanGaps: true,
      points: { show: true, size: 7, fill: palette[i % palette.length] },
      value: (_u, v) => (v == null ? '–' : v.toFixed(4)),
    })),
    {
      label: `Pareto front (${String(paretoMetric).toUpperCase()})`,
      stroke: '#1d2b2f',
      width: 1.5,
      dash: [6, 4],
      spanGaps: true,
      points: { show: true, size: 11, stroke: '#1d2b2f', fill: 'rgba(0,0,0,0)', width: 1.5 },
      value: (_u, v) => (v == null ? '–' : v.toFixed(4)),
    },
    {
      label: 'recommended',
      stroke: '#a4262c',
      width: 2.5,
      paths: noLine,
      points: { show: true, size: 17, stroke: '#a4262c', fill: 'rgba(164,38,44,0.18)', width: 2.5 },
      value: (_u, v) => (v == null ? '–' : v.toFixed(4)),
    },
  ];

  const width = Math.max(280, container.clientWidth - 10);
  const plot = new uPlot(
    {
      width,
      height: 300,
      series,
      scales: { x: { time: false } },
      axes: [
        { label: 'scan time (s)', stroke: '#55656a', grid: { stroke: '#ece8dd' } },
        { label: metricLabels[metric] ?? metric, stroke: '#55656a', grid: { stroke: '#ece8dd' }, size: 60 },
      ],
      legend: { live: false },
      cursor: { drag: { x: false, y: false } },
    },
    [xs, ...columns, front, recommended],
    container,
  );
  let lastWidth = width;
  const resize = new ResizeObserver(() => {
    const next = Math.max(280, container.clientWidth - 10);
    if (next === lastWidth) return;
    lastWidth = next;
    plot.setSize({ width: next, height: 300 });
  });
  resize.observe(container);
  plot.stopResizing = () => resize.disconnect();
  return plot;
}
