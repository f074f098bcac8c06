// A plan row opened to its images: the reconstruction, error map, zero-filled image and mask of the
// row's seed-1 cell, which the service stored as a result of the plan (row.resultId, row.images),
// with a PNG link for each and the scores of that one cell.

import { getBlob, getJson, pageRelative } from './api.js';
import { byId } from './dom.js';
import { offerResource, withdraw } from './downloads.js';
import { formatNumber, showNumber } from './format.js';
import { showProblem } from './status.js';

/** Image key in row.images → the <img> and the link that show it. */
const shown = [
  ['reconstruction', 'rowImgReconstruction', 'rowDownloadReconstruction'],
  ['errorMap', 'rowImgErrorMap', 'rowDownloadErrorMap'],
  ['zeroFilled', 'rowImgZeroFilled', 'rowDownloadZeroFilled'],
  ['mask', 'rowImgMask', 'rowDownloadMask'],
];

const scoreLabels = { nrmse: 'NRMSE', psnr: 'PSNR (dB)', ssim: 'SSIM', hfen: 'HFEN' };

let wired = false;

export function hideRowImages() {
  const box = byId('rowImages');
  box.hidden = true;
  delete box.dataset.row;
  for (const [, imgId, linkId] of shown) {
    const img = byId(imgId);
    if (img.src.startsWith('blob:')) URL.revokeObjectURL(img.src);
    img.removeAttribute('src');
    img.hidden = true;
    withdraw(byId(linkId));
  }
  byId('rowNumbers').replaceChildren();
}

/** Scores of the seed-1 cell, the reconstruction's beside the zero-filled image's. */
function showCellScores(result) {
  const list = byId('rowNumbers');
  list.replaceChildren();
  for (const [name, label] of Object.entries(scoreLabels)) {
    const dt = document.createElement('dt');
    dt.textContent = `${label}, seed 1`;
    const dd = document.createElement('dd');
    dd.dataset.key = `row.${name}`;
    showNumber(dd, result.metrics?.[name], name);
    const zero = result.zeroFilledMetrics?.[name];
    if (typeof zero === 'number') dd.textContent += ` (zero-filled ${formatNumber(zero, name)})`;
    list.append(dt, dd);
  }
}

export async function showRowImages(row, plan, problems, status) {
  if (!wired) {
    byId('rowImagesClose').addEventListener('click', hideRowImages);
    wired = true;
  }
  hideRowImages();
  const box = byId('rowImages');
  box.dataset.row = row.key;
  const r = row.reference
    ? 'R 1, fully sampled'
    : row.requestedR === null
      ? 'custom mask'
      : `R ${row.requestedR}`;
  byId('rowImagesCaption').textContent =
    `${row.pattern} · ${row.method}, ${r}: the images of seed 1 (the table's numbers are means over ${row.seeds} seed(s)).`;
  box.hidden = false;
  try {
    const [result] = await Promise.all([
      getJson(`v1/reconstructions/${encodeURIComponent(row.resultId)}`),
      ...shown.map(async ([key, imgId, linkId]) => {
        const url = row.images?.[key];
        if (!url) return;
        const img = byId(imgId);
        img.src = URL.createObjectURL(await getBlob(pageRelative(url), 'image/png'));
        await img.decode();
        // The link first: an image on screen always has its download ready (with a key, a fetch).
        await offerResource(byId(linkId), url, 'image/png', `plan-${plan.id}-${row.key}-${key}.png`);
        img.hidden = false;
      }),
    ]);
    showCellScores(result);
    box.scrollIntoView({ block: 'nearest' });
  } catch (error) {
    hideRowImages();
    showProblem(status, problems, error);
  }
}
