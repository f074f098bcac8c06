// One acquisition: the mask and its numbers, the reconstruction with its images and metrics, and the
// scan time of the protocol entered on the page — every number straight from the service's answers.
// An error clears everything shown before, so no old image or number stands beside the message.

import { getBlob, pageRelative, postForBlob, postJson } from './api.js';
import { hideImage, showBlob } from './blob-image.js';
import { isUniform } from './coil-array.js';
import { clearCoilResults, showCoilResults } from './coil-results.js';
import { byId } from './dom.js';
import { offerBlob, offerResource, withdraw } from './downloads.js';
import { colouredErrorPng, drawColourBar, errorLevels } from './error-map.js';
import { formatNumber, showNumber } from './format.js';
import { ImageDialog } from './image-dialog.js';
import { lesionsPiece } from './lesion-form.js';
import { markedPng } from './lesion-marks.js';
import { hideFidelity, lesionMarks, showFidelity } from './lesion-view.js';
import { drawPsfProfile } from './psf-profile.js';
import { runShowingProblems, showStatus } from './status.js';
import { steerZoom, ZoomGroup } from './zoom-group.js';

const numberCell = (key) => document.querySelector(`[data-key="${key}"]`);

/** <img> ids of the images that zoom and pan together (one matrix, one object). */
const linkedImages = ['imgReconstruction', 'imgZeroFilled', 'imgReference', 'imgErrorMap', 'imgGFactor'];
/** <img> ids of the k-space views, enlarged on their own. */
const ownImages = ['imgMask', 'imgPsf'];

function showAcquired(cell, acquired, total) {
  if (!acquired) return showNumber(cell, null);
  const unit = acquired.unit ?? '';
  showNumber(cell, acquired.count, 'count');
  cell.textContent = `${acquired.count}${typeof total === 'number' ? ` of ${total}` : ''} ${unit}`.trim();
}

function showMaskNumbers(mask) {
  showNumber(numberCell('mask.requested'), mask.acceleration?.requested ?? null, 'acceleration');
  showNumber(numberCell('mask.actual'), mask.acceleration?.actual, 'acceleration');
  showAcquired(numberCell('mask.acquired'), mask.acquired, mask.total);
  showNumber(numberCell('mask.fraction'), mask.fraction, 'fraction');
  showNumber(numberCell('mask.peakSidelobe'), mask.psf?.peakSidelobe, 'sidelobe');
  drawPsfProfile(byId('psfProfile'), mask.psf?.radialProfile);
}

function showScanTimes(full, under, withoutPartialFourier) {
  const fullCell = numberCell('time.full');
  const underCell = numberCell('time.under');
  showNumber(fullCell, full.seconds, 'seconds', ` s (${full.formatted})`);
  showNumber(underCell, under.seconds, 'seconds', ` s (${under.formatted})`);
  const saved = full.seconds > 0 ? (100 * (full.seconds - under.seconds)) / full.seconds : null;
  showNumber(numberCell('time.saved'), saved, 'percent', ' %');
  showNumber(numberCell('time.passes'), under.passes, 'count');
  showNumber(numberCell('time.slicesPerTr'), under.slicesPerTr, 'count');
  showNumber(numberCell('time.effectiveTe'), under.effectiveTeMs, 'ms');
  // How much of the saving partial Fourier makes: the same mask timed with every ky row kept.
  const note = byId('timeNote');
  note.hidden = !withoutPartialFourier;
  if (withoutPartialFourier) {
    const share =
      full.seconds > 0 ? (100 * (withoutPartialFourier.seconds - under.seconds)) / full.seconds : 0;
    note.textContent =
      `Partial Fourier keeps ${under.acquired} of the ${withoutPartialFourier.acquired} ${under.unit} this mask ` +
      `would acquire over all of ky: ${formatNumber(share, 'percent')} % of the time saved comes from partial Fourier, ` +
      'not from undersampling.';
  }
}

/** Iterations run of the most allowed, and whether the solver met its tolerance (when it says). */
function showSolver(info) {
  const iterations = numberCell('recon.iterations');
  const converged = numberCell('recon.converged');
  if (typeof info?.iterations === 'number') {
    showNumber(iterations, info.iterations, 'count');
    iterations.textContent =
      typeof info.iterationLimit === 'number'
        ? `${info.iterations} of ${info.iterationLimit}`
        : String(info.iterations);
  } else {
    showNumber(iterations, null);
    iterations.textContent = 'not iterative';
  }
  if (typeof info?.converged === 'boolean') {
    converged.dataset.value = String(info.converged);
    const change =
      typeof info.relativeChange === 'number' && typeof info.tolerance === 'number'
        ? ` (change ${info.relativeChange.toExponential(1)} ${info.converged ? '<' : '≥'} ${info.tolerance})`
        : '';
    converged.textContent = `${info.converged ? 'yes' : 'no, stopped at the limit'}${change}`;
  } else {
    delete converged.dataset.value;
    converged.textContent = '–';
  }
}

/** The four scores under `prefix` (recon, zeroFilled); a score the service left null is +∞. */
function showScores(prefix, metrics) {
  for (const name of ['nrmse', 'psnr', 'ssim', 'hfen']) {
    const cell = numberCell(`${prefix}.${name}`);
    showNumber(cell, metrics?.[name], name);
    if (metrics && metrics[name] === null) cell.textContent = '∞';
  }
}

function showMetrics(outcome) {
  showScores('recon', outcome.metrics);
  showScores('zeroFilled', outcome.zeroFilledMetrics);
  showNumber(numberCell('recon.reconMs'), outcome.timing?.reconMs, 'ms');
  showSolver(outcome.info);
  showNotes(Array.isArray(outcome.notes) ? outcome.notes : []);
}

function showNotes(list) {
  const notes = byId('reconNotes');
  notes.replaceChildren(
    ...list.map((note) => {
      const li = document.createElement('li');
      li.textContent = note;
      return li;
    }),
  );
  notes.hidden = list.length === 0;
}

async function scanTimes(setup) {
  const matrix = setup.matrix();
  const protocol = setup.protocol();
  const sampling = setup.sampling();
  const requests = [
    postJson('v1/scan-time', { matrix, protocol }),
    postJson('v1/scan-time', { matrix, protocol, sampling }),
  ];
  if (sampling.partialFourier !== undefined) {
    const { partialFourier: _pf, ...allRows } = sampling;
    requests.push(
      postJson('v1/scan-time', { matrix, protocol: { ...protocol, partialFourier: 1 }, sampling: allRows }),
    );
  }
  return Promise.all(requests);
}

export class SingleRun {
  constructor(setup) {
    this.setup = setup;
    this.status = byId('singleStatus');
    this.problems = byId('singleProblems');
    this.buttons = [byId('maskButton'), byId('reconButton')];
    this.errors = null;
    byId('maskButton').addEventListener('click', () => this.run(() => this.showMask()));
    byId('reconButton').addEventListener('click', () => this.run(() => this.reconstruct()));
    byId('errorScaleMax').addEventListener('change', () => this.recolourErrorMap());
    this.wireImages();
  }

  /** Zoom and pan shared by the four result images; a click enlarges any image. */
  wireImages() {
    const level = byId('zoomLevel');
    this.zoom = new ZoomGroup((group) => {
      level.textContent = `${Number(group.scale.toFixed(2))}×`;
      level.dataset.value = String(group.scale);
    });
    this.dialog = new ImageDialog();
    const caption = (img) => img.closest('figure')?.querySelector('figcaption')?.textContent?.trim() ?? '';
    for (const id of [...linkedImages, ...ownImages]) {
      const img = byId(id);
      const tile = img.closest('.tile');
      const linked = linkedImages.includes(id);
      if (linked) this.zoom.add(img);
      tile.tabIndex = 0;
      tile.setAttribute('aria-label', `${img.alt}: Enter enlarges${linked ? ', + and − zoom all four' : ''}`);
      steerZoom(
        tile,
        () => (linked ? this.zoom : null),
        () => this.dialog.open(img, caption(img), linked ? this.zoom : null),
      );
    }
    byId('zoomIn').addEventListener('click', () => this.zoom.zoomAt(1.5));
    byId('zoomOut').addEventListener('click', () => this.zoom.zoomAt(1 / 1.5));
    byId('zoomReset').addEventListener('click', () => this.zoom.reset());
  }

  async run(task) {
    for (const button of this.buttons) button.disabled = true;
    try {
      await runShowingProblems(this, task, () => this.clear());
    } finally {
      for (const button of this.buttons) button.disabled = false;
    }
  }

  /** Removes every image and number of an earlier run (they would not belong to the new message). */
  clear() {
    this.clearReconstruction();
    for (const id of ownImages) hideImage(id);
    for (const cell of document.querySelectorAll('#single [data-key]')) {
      delete cell.dataset.value;
      cell.textContent = '–';
    }
    drawPsfProfile(byId('psfProfile'), null);
    this.lastMask = null;
  }

  /** Removes the reconstruction's images and numbers (e.g. when a new mask no longer matches them). */
  clearReconstruction() {
    for (const id of linkedImages) hideImage(id);
    for (const cell of document.querySelectorAll('#reconNumbers [data-key]')) {
      delete cell.dataset.value;
      cell.textContent = '–';
    }
    showNotes([]);
    clearCoilResults();
    byId('singleDownloads').hidden = true;
    for (const link of byId('singleDownloads').querySelectorAll('a')) withdraw(link);
    hideFidelity();
    this.marks = null;
    this.errors = null;
    byId('errorScale').hidden = true;
    this.lastOutcome = null;
    this.reconstructed = null;
  }

  async showMask() {
    showStatus(this.status, 'Drawing the mask…', true);
    const body = { matrix: this.setup.matrix(), sampling: this.setup.sampling() };
    // Images reconstructed from another matrix or mask would sit beside this mask as if they matched.
    if (this.reconstructed !== JSON.stringify(body)) this.clearReconstruction();
    const [mask, png, [full, under, withoutPartialFourier]] = await Promise.all([
      postJson('v1/masks', body),
      postForBlob('v1/masks', body, 'image/png'),
      scanTimes(this.setup),
    ]);
    await showBlob('imgMask', png);
    await showBlob('imgPsf', await getBlob(pageRelative(mask.images.psf), 'image/png'));
    showMaskNumbers(mask);
    showScanTimes(full, under, withoutPartialFourier);
    this.lastMask = mask;
    showStatus(
      this.status,
      `Mask ready: ${mask.acquired?.count ?? '?'} ${mask.acquired?.unit ?? ''} acquired. Reconstruct to see the images.`,
    );
  }

  async reconstruct() {
    showStatus(this.status, 'Simulating the acquisition and reconstructing…', true);
    const setup = this.setup;
    const body = {
      source: setup.source(),
      matrix: setup.matrix(),
      sampling: setup.sampling(),
      method: setup.method(),
    };
    const noise = setup.noise();
    if (noise) body.noise = noise;
    const lesions = lesionsPiece();
    if (lesions) body.lesions = lesions;
    // The single uniform coil is the service's default: left out, the request stays as it was.
    const coils = setup.coils();
    if (!isUniform(coils)) body.coils = coils;
    const maskBody = { matrix: body.matrix, sampling: body.sampling };
    const [outcome, mask, maskPng, [full, under, withoutPartialFourier]] = await Promise.all([
      postJson('v1/reconstructions', body),
      postJson('v1/masks', maskBody),
      postForBlob('v1/masks', maskBody, 'image/png'),
      scanTimes(setup),
    ]);
    const fetched = Object.fromEntries(
      await Promise.all(
        ['reconstruction', 'zeroFilled', 'reference', 'mask', 'psf'].map(async (key) => [
          key,
          await getBlob(pageRelative(outcome.images[key]), 'image/png'),
        ]),
      ),
    );
    this.errors = await errorLevels(fetched.reconstruction, fetched.reference);
    this.marks = lesionMarks(outcome);
    await Promise.all([
      showFidelity(outcome),
      showBlob('imgReconstruction', fetched.reconstruction),
      showBlob('imgZeroFilled', fetched.zeroFilled),
      showBlob('imgReference', fetched.reference),
      showBlob('imgMask', fetched.mask),
      showBlob('imgPsf', fetched.psf),
      this.recolourErrorMap(),
    ]);
    showMaskNumbers(mask);
    showMetrics(outcome);
    await showCoilResults(outcome);
    showScanTimes(full, under, withoutPartialFourier);
    await this.offerDownloads(outcome, maskPng, mask);
    this.lastOutcome = outcome;
    this.reconstructed = JSON.stringify({ matrix: body.matrix, sampling: body.sampling });
    showStatus(this.status, `Reconstruction ${outcome.id} done (${body.method.name}).`);
  }

  /**
   * Links to each image as the service serves it (8-bit and 16-bit PNG, float32 NIfTI), to the mask
   * the mask route drew as PNG, to its sample table, and to the acquired k-space with its header.
   */
  async offerDownloads(outcome, maskPng, mask) {
    const name = (image) => `${image}-${outcome.id}.png`;
    await Promise.all([
      offerResource(
        byId('downloadReconstruction'),
        outcome.images.reconstruction,
        'image/png',
        name('reconstruction'),
      ),
      offerResource(byId('downloadZeroFilled'), outcome.images.zeroFilled, 'image/png', name('zero-filled')),
      offerResource(byId('downloadReference'), outcome.images.reference, 'image/png', name('reference')),
      offerResource(byId('downloadErrorMap'), outcome.images.errorMap, 'image/png', name('error-map')),
      offerResource(
        byId('downloadReconstruction16'),
        `${outcome.images.reconstruction}?depth=16`,
        'image/png',
        `reconstruction-16bit-${outcome.id}.png`,
      ),
      offerResource(
        byId('downloadImagesNifti'),
        `v1/results/${outcome.id}/images.nii`,
        'application/octet-stream',
        `images-${outcome.id}.nii`,
      ),
      offerResource(byId('downloadMaskTable'), mask.tables.csv, 'text/csv', `mask-${mask.id}.csv`),
      offerResource(
        byId('downloadAcquisitionNifti'),
        outcome.acquisition.nifti,
        'application/octet-stream',
        `acquisition-${outcome.id}.nii`,
      ),
      offerResource(
        byId('downloadAcquisitionJson'),
        outcome.acquisition.json,
        'application/json',
        `acquisition-${outcome.id}.json`,
      ),
    ]);
    offerBlob(byId('downloadMask'), maskPng, name('mask'));
    byId('singleDownloads').hidden = false;
  }

  /** Draws the error map and its colour bar on the scale chosen (kept from run to run). */
  async recolourErrorMap() {
    const errors = this.errors;
    if (!errors) return;
    const scaleMax = Number(byId('errorScaleMax').value);
    const coloured = await colouredErrorPng(errors, scaleMax);
    // With lesions, the true positions (circles) and the false lesions (squares) are marked on it.
    await showBlob('imgErrorMap', this.marks ? (await markedPng(coloured, this.marks)).png : coloured);
    const box = byId('errorScale');
    drawColourBar(byId('errorColourBar'), byId('errorColourTicks'), scaleMax);
    const maxError = errors.maxLevel / 255;
    box.dataset.scaleMax = String(scaleMax);
    box.dataset.maxError = String(maxError);
    const clipped =
      errors.clipped > 0
        ? ` ${errors.clipped} px of the reconstruction reach the reference maximum (white): the error shown there is a lower bound.`
        : '';
    byId('errorScaleNote').textContent =
      `Largest error in this image ${formatNumber(maxError, 'fraction')} × the reference maximum` +
      `${maxError > scaleMax ? ' (above the scale: shown in its top colour)' : ''}. Formed on this page from the ` +
      `8-bit reconstruction and reference images (±1/255).${clipped}`;
    box.hidden = false;
  }
}
