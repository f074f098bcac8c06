// Number formatting for display. Every shown number keeps the API's full value in data-value, so the
// text is only a rounding of it (the browser test checks both).

const decimalsByKind = {
  nrmse: 4,
  ssim: 4,
  hfen: 4,
  psnr: 2,
  acceleration: 2,
  fraction: 3,
  sidelobe: 3,
  ms: 0,
  seconds: 1,
  percent: 1,
  count: 0,
  g: 3,
};

export function formatNumber(value, kind) {
  if (value === null || value === undefined || Number.isNaN(value)) return '–';
  if (typeof value !== 'number') return String(value);
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞';
  const decimals = decimalsByKind[kind] ?? 3;
  return value.toFixed(decimals);
}

/** Fills an element with a formatted number and keeps the exact value beside it. */
export function showNumber(element, value, kind, suffix = '') {
  if (!element) return;
  if (typeof value === 'number') {
    element.dataset.value = String(value);
    element.textContent = `${formatNumber(value, kind)}${suffix}`;
  } else {
    delete element.dataset.value;
    element.textContent = value === null || value === undefined ? '–' : String(value);
  }
}

export function formatMeanSd(mean, sd, kind) {
  if (typeof mean !== 'number') return '–';
  if (typeof sd !== 'number' || sd === 0) return formatNumber(mean, kind);
  return `${formatNumber(mean, kind)} ± ${formatNumber(sd, kind)}`;
}
