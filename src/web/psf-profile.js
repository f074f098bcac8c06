// The mask's PSF radial profile (mean |PSF| per integer radius, as the service computed it), drawn
// small beside the sampling numbers with the same charting library as the tradeoff plot.

import uPlot from './vendor/uplot/uPlot.esm.js';

let current = null;

export function drawPsfProfile(container, profile) {
  current?.destroy();
  current = null;
  container.replaceChildren();
  if (!Array.isArray(profile) || profile.length === 0) return;
  const radii = profile.map((_, r) => r);
  // Log axis like the PSF image; a zero mean has no place on it.
  const values = profile.map((v) => (v > 0 ? v : null));
  const width = Math.max(200, container.clientWidth);
  current = new uPlot(
    {
      width,
      height: 130,
      legend: { show: false },
      cursor: { show: false },
      scales: { x: { time: false }, y: { distr: 3, log: 10, range: [1e-3, 1] } },
      axes: [
        { label: 'radius (pixels)', labelSize: 18, size: 30, stroke: '#55656a', grid: { stroke: '#ece8dd' } },
        {
          label: 'mean |PSF|',
          labelSize: 18,
          size: 44,
          stroke: '#55656a',
          grid: { stroke: '#f1eee6', width: 1 },
          ticks: { show: false },
          // Label the decades only.
          values: (_u, splits) => splits.map((v) => (Number.isInteger(Math.log10(v)) ? String(v) : '')),
        },
      ],
      series: [{}, { label: 'mean |PSF|', stroke: '#14545c', width: 1.5, spanGaps: true }],
    },
    [radii, values],
    container,
  );
  return current;
}
