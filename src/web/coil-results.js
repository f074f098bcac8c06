// What a reconstruction answers about its receive array (docs/design.md §3.8): the sensitivity montage
// (coil-maps.png), the g-factor map beside the error map, and their numbers, straight from the
// service's answer. A single-coil answer has none of them and the section stays hidden.

import { getBlob, pageRelative } from './api.js';
import { hideImage, showBlob } from './blob-image.js';
import { byId } from './dom.js';
import { showNumber } from './format.js';

const numberCell = (key) => document.querySelector(`#coilNumbers [data-key="${key}"]`);

async function showImage(id, url) {
  await showBlob(id, await getBlob(pageRelative(url), 'image/png'));
}

/** Hides the coil section and the g-factor figure and blanks their numbers. */
export function clearCoilResults() {
  hideImage('imgCoilMaps');
  hideImage('imgGFactor');
  byId('gFactorFigure').hidden = true;
  byId('resultRow').classList.remove('with-g');
  for (const cell of document.querySelectorAll('#coilNumbers [data-key]')) {
    delete cell.dataset.value;
    cell.textContent = '–';
  }
  byId('coilResultsLabel').textContent = '';
  byId('coilResultsNote').textContent = '';
  byId('coilResults').hidden = true;
}

/** Shows the array's answer: montage, g-factor map and numbers, where the service gave them. */
export async function showCoilResults(outcome) {
  clearCoilResults();
  const coils = outcome.coils;
  const g = outcome.gFactor;
  if (!coils && !g) return;
  const images = outcome.images ?? {};
  const loads = [];
  if (images.coilMaps) loads.push(showImage('imgCoilMaps', images.coilMaps));
  if (images.gFactor) {
    byId('gFactorFigure').hidden = false;
    byId('resultRow').classList.add('with-g');
    loads.push(showImage('imgGFactor', images.gFactor));
  }
  await Promise.all(loads);
  byId('coilResultsLabel').textContent = coils?.label ?? '';
  showNumber(numberCell('coils.count'), coils?.count, 'count');
  // A relative ℓ2 distance, shown to the decimals of NRMSE.
  showNumber(numberCell('coils.fitError'), coils?.fitError, 'nrmse');
  showNumber(numberCell('g.mean'), g?.mean, 'g');
  showNumber(numberCell('g.p95'), g?.p95, 'g');
  showNumber(numberCell('g.max'), g?.max, 'g');
  const method = numberCell('g.method');
  method.textContent = g
    ? `${g.method}${typeof g.replicas === 'number' ? ` (${g.replicas} replicas)` : ''}`
    : 'not given';
  showNumber(numberCell('snr.mean'), outcome.snrRetained?.mean, 'fraction');
  showNumber(numberCell('snr.min'), outcome.snrRetained?.min, 'fraction');
  byId('coilResultsNote').textContent = g
    ? 'g from the maps this reconstruction used, over the object; SNR retained = 1/(g·√R) against the fully sampled scan.'
    : 'The service gives no g-factor for this method and mask (analytic only for SENSE on a uniform lattice).';
  byId('coilResults').hidden = false;
}
