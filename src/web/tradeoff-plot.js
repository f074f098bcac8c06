// The tradeoff plot: one image-error metric against scan time, every table row a point (a scatter:
// rows often share a scan time, e.g. every Poisson-disc row of a 2D plan costs the full scan), one
// series per pattern and method, each point labelled with its R, the plan's Pareto front and its
// recommendation marked on their own rows. Drawn with uPlot (served from node_modules).

import { taskColumns } from './task-scores.js';
import uPlot from './vendor/uplot/uPlot.esm.js';

/** Okabe–Ito colour-blind-safe palette (Okabe & Ito 2008), one colour per pattern+method series. */
const palette = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#D55E00', '#8A7B00', '#444444'];

const metricLabels = {
  nrmse: 'NRMSE (lower is better)',
  psnr: 'PSNR in dB (higher is better)',
  ssim: 'SSIM (higher is better)',
  hfen: 'HFEN (lower is better)',
  ...Object.fromEntries(
    taskColumns.map((c) => [c.metric, `${c.label} (${c.higherIsBetter ? 'higher' : 'lower'} is better)`]),
  ),
};

/** Draws only markers: rows are points, not a curve. */
const noLine = () => null;

/** Hover reach in CSS pixels: the nearest point within it is described. */
const hoverRadius = 14;

/** [min, max] of the values widened by 6 % of their span (or of their size when all are equal). */
function paddedRange(values) {
  const min = Math.min(...values);
  const max = Math.max(...values);
  const pad = (max > min ? max - min : Math.abs(max) || 1) * 0.06;
  return [min - pad, max + pad];
}

function pointLabel(point) {
  return point.reference ? 'R 1 (full)' : point.R === null ? 'custom' : `R ${point.R}`;
}

/**
 * points: [{ key, series, x (scan seconds), y (metric), R, pareto, recommended, reference, describe }];
 * the plan's Pareto front is computed on paretoMetric, which may differ from the plotted metric.
 * `list` (an <ol>) receives one item per point with its data and drawn position. Returns the uPlot
 * instance.
 */
export function drawTradeoffPlot(container, points, metric, paretoMetric, list) {
  container.replaceChildren();
  // One x entry per point (sorted, duplicates kept): each row keeps its own index and y value.
  const ordered = [...points].sort((a, b) => a.x - b.x);
  const xs = ordered.map((p) => p.x);
  // Series in table order (the reference first), whatever their scan times.
  const names = [...new Set(points.map((p) => p.series))];
  const columns = names.map((name) => ordered.map((p) => (p.series === name ? p.y : null)));
  const front = ordered.map((p) => (p.pareto ? p.y : null));
  const recommended = ordered.map((p) => (p.recommended ? p.y : null));
  const colourOf = new Map(names.map((name, i) => [name, palette[i % palette.length]]));

  const series = [
    { label: 'scan time (s)' },
    ...names.map((name) => ({
      label: name,
      stroke: colourOf.get(name),
      paths: noLine,
      points: { show: true, size: 8, fill: colourOf.get(name), stroke: colourOf.get(name) },
    })),
    {
      label: `Pareto front (${String(paretoMetric).toUpperCase()})`,
      stroke: '#1d2b2f',
      width: 1.25,
      dash: [6, 4],
      spanGaps: true,
      points: { show: true, size: 14, stroke: '#1d2b2f', fill: 'rgba(0,0,0,0)', width: 1.5 },
    },
    {
      label: 'recommended',
      stroke: '#a4262c',
      width: 2.5,
      paths: noLine,
      points: { show: true, size: 20, stroke: '#a4262c', fill: 'rgba(164,38,44,0.12)', width: 2.5 },
    },
  ];
  const frontIndex = series.length - 2;
  const recommendedIndex = series.length - 1;

  const tooltip = document.createElement('div');
  tooltip.className = 'plot-tooltip';
  tooltip.hidden = true;
  tooltip.setAttribute('role', 'status');

  /** R labels beside the points, and each point's drawn position written onto its list item. */
  const drawLabels = (u) => {
    const ctx = u.ctx;
    const ratio = devicePixelRatio || 1;
    ctx.save();
    ctx.font = `${11 * ratio}px system-ui, sans-serif`;
    ctx.fillStyle = '#1d2b2f';
    ctx.textBaseline = 'bottom';
    const items = list ? list.children : [];
    const lineHeight = 12 * ratio;
    const placed = []; // label boxes drawn so far: rows sharing a spot get their labels stacked
    ordered.forEach((p, i) => {
      const cx = u.valToPos(p.x, 'x', true);
      const cy = u.valToPos(p.y, 'y', true);
      const text = pointLabel(p);
      const w = ctx.measureText(text).width;
      const x = cx + 6 * ratio;
      let y = cy - 5 * ratio;
      const overlaps = (b) => x < b.x + b.w && b.x < x + w && y - lineHeight < b.y && b.y - lineHeight < y;
      for (let tries = 0; tries < 8 && placed.some(overlaps); tries++) y -= lineHeight;
      placed.push({ x, y, w });
      ctx.fillText(text, x, y);
      const item = items[i];
      if (item) {
        item.dataset.canvasX = String(Math.round(cx));
        item.dataset.canvasY = String(Math.round(cy));
        item.dataset.paretoMarker = String(u.data[frontIndex][i] != null);
        item.dataset.recommendedMarker = String(u.data[recommendedIndex][i] != null);
      }
    });
    ctx.restore();
  };

  // The list first: the draw hook writes each point's drawn position onto its item.
  list?.replaceChildren(
    ...ordered.map((p) => {
      const li = document.createElement('li');
      li.dataset.row = p.key;
      li.dataset.x = String(p.x);
      li.dataset.y = String(p.y);
      li.dataset.series = p.series;
      li.textContent = p.describe;
      return li;
    }),
  );

  const width = Math.max(280, container.clientWidth - 10);
  const plot = new uPlot(
    {
      width,
      height: 320,
      series,
      // Fixed ranges over every point: uPlot's automatic ranges stop at the first of several equal
      // x values, which would leave rows sharing the longest scan time off the plot.
      scales: {
        x: { time: false, range: () => paddedRange(xs) },
        y: { range: () => paddedRange(ordered.map((p) => p.y)) },
      },
      axes: [
        {
          label: 'scan time (s)',
          stroke: '#55656a',
          grid: { stroke: '#ece8dd' },
          values: (_u, splits) => splits.map((v) => `${v} s`),
        },
        { label: metricLabels[metric] ?? metric, stroke: '#55656a', grid: { stroke: '#ece8dd' }, size: 60 },
      ],
      legend: { live: false },
      cursor: { drag: { x: false, y: false }, points: { show: false } },
      hooks: { draw: [drawLabels] },
    },
    [xs, ...columns, front, recommended],
    container,
  );

  // Hover: the nearest point (in pixels) within reach is described in full.
  plot.over.append(tooltip);
  plot.over.addEventListener('mousemove', (event) => {
    const rect = plot.over.getBoundingClientRect();
    const mx = event.clientX - rect.left;
    const my = event.clientY - rect.top;
    let best = null;
    let bestDistance = hoverRadius;
    for (const p of ordered) {
      const d = Math.hypot(plot.valToPos(p.x, 'x') - mx, plot.valToPos(p.y, 'y') - my);
      if (d <= bestDistance) {
        best = p;
        bestDistance = d;
      }
    }
    if (!best) {
      tooltip.hidden = true;
      return;
    }
    tooltip.textContent = best.describe;
    tooltip.dataset.row = best.key;
    tooltip.hidden = false;
    // Keep the box inside the plotting area.
    const left = Math.min(plot.valToPos(best.x, 'x') + 12, Math.max(0, rect.width - tooltip.offsetWidth));
    const top = Math.max(0, plot.valToPos(best.y, 'y') - tooltip.offsetHeight - 10);
    tooltip.style.left = `${left}px`;
    tooltip.style.top = `${top}px`;
  });
  plot.over.addEventListener('mouseleave', () => {
    tooltip.hidden = true;
  });

  let lastWidth = width;
  const resize = new ResizeObserver(() => {
    const next = Math.max(280, container.clientWidth - 10);
    if (next === lastWidth) return;
    lastWidth = next;
    plot.setSize({ width: next, height: 320 });
  });
  resize.observe(container);
  plot.stopResizing = () => resize.disconnect();
  return plot;
}
