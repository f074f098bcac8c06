// The feature-fidelity part of one reconstruction: the reconstruction with lesions, true positions
// circled; the summary and per-lesion scores; the contrast–detail plot. Every number keeps the
// service's exact value in data-value.

import { getBlob, pageRelative } from './api.js';
import { drawContrastDetail } from './contrast-detail-plot.js';
import { byId } from './dom.js';
import { formatNumber, showNumber } from './format.js';
import { markedPng } from './lesion-marks.js';

const numberCell = (key) => document.querySelector(`[data-key="${key}"]`);

function cellWith(value, kind) {
  const td = document.createElement('td');
  if (typeof value === 'number') {
    td.dataset.value = String(value);
    td.textContent = formatNumber(value, kind);
  } else {
    td.textContent = value === null ? '∞' : String(value);
  }
  return td;
}

/** The marks the error map carries too (true lesions and false lesions), or null without lesions. */
export function lesionMarks(outcome) {
  const f = outcome?.fidelity;
  if (!f) return null;
  return {
    lesions: f.lesions.map(({ row, col }) => ({ row, col })),
    diameter: f.diameter,
    falseLesions: f.falseLesions.positions,
  };
}

export function hideFidelity() {
  const section = byId('fidelity');
  section.hidden = true;
  const img = byId('imgLesions');
  if (img.src.startsWith('blob:')) URL.revokeObjectURL(img.src);
  img.removeAttribute('src');
  img.hidden = true;
  delete img.dataset.circles;
  byId('lesionTable').tBodies[0].replaceChildren();
  byId('contrastDetailFigure').hidden = true;
}

export async function showFidelity(outcome) {
  const f = outcome.fidelity;
  if (!f) return hideFidelity();
  const marks = lesionMarks(outcome);
  const blob = await getBlob(pageRelative(outcome.images.lesions), 'image/png');
  const { png, drawn } = await markedPng(blob, { ...marks, falseLesions: [] });
  const img = byId('imgLesions');
  const previous = img.src;
  img.src = URL.createObjectURL(png);
  if (previous.startsWith('blob:')) URL.revokeObjectURL(previous);
  await img.decode();
  img.hidden = false;
  img.dataset.circles = JSON.stringify(drawn);

  const recovery = numberCell('fidelity.contrastRecovery');
  showNumber(recovery, f.contrastRecovery.mean, 'fraction');
  recovery.textContent = `${formatNumber(f.contrastRecovery.mean, 'fraction')} / ${formatNumber(f.contrastRecovery.min, 'fraction')}`;
  const resolved = numberCell('fidelity.resolved');
  showNumber(resolved, f.resolved, 'count');
  resolved.textContent = `${f.resolved} of ${f.lesions.length} (k = ${f.roseK})`;
  const d = numberCell('fidelity.detectability');
  if (f.detectability.mean === null) {
    delete d.dataset.value;
    d.textContent = '∞ (noiseless)';
  } else {
    showNumber(d, f.detectability.mean, 'psnr');
    d.textContent +=
      f.detectability.method === 'replicas' ? ` (${f.detectability.replicas} replicas)` : ' (known σ)';
  }
  const falseCell = numberCell('fidelity.falseLesions');
  showNumber(falseCell, f.falseLesions.count, 'count');
  falseCell.textContent = String(f.falseLesions.count);

  byId('lesionTable').tBodies[0].replaceChildren(
    ...f.lesions.map((lesion, i) => {
      const tr = document.createElement('tr');
      tr.append(
        cellWith(String(i + 1)),
        cellWith(`${lesion.row}, ${lesion.col}`),
        cellWith(lesion.contrastRecovery, 'fraction'),
        cellWith(lesion.cnr, 'psnr'),
        cellWith(lesion.resolved ? 'yes' : 'no'),
        cellWith(lesion.detectability, 'psnr'),
      );
      return tr;
    }),
  );
  const cd = f.contrastDetail;
  byId('contrastDetailFigure').hidden = !cd;
  if (cd) drawContrastDetail(byId('contrastDetailPlot'), cd.curve, cd.fullySampled);
  byId('fidelity').hidden = false;
}
