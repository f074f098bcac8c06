// One acquisition: the mask and its numbers, the reconstruction with its images and metrics, and the
// scan time of the protocol entered on the page — every number straight from the service's answers.

import { getBlob, pageRelative, postForBlob, postJson } from './api.js';
import { showNumber } from './format.js';
import { drawPsfProfile } from './psf-profile.js';
import { showProblem, showStatus } from './status.js';

const byId = (id) => document.getElementById(id);
const numberCell = (key) => document.querySelector(`[data-key="${key}"]`);

/** <img> id → key of the reconstruction's `images` member (URLs under /v1/results/{id}/). */
const resultImages = {
  imgReconstruction: 'reconstruction',
  imgZeroFilled: 'zeroFilled',
  imgReference: 'reference',
  imgErrorMap: 'errorMap',
  imgMask: 'mask',
  imgPsf: 'psf',
};

/** Shows a PNG blob in an <img>, releasing the blob URL it showed before. */
async function showBlob(id, blob) {
  const img = byId(id);
  const previous = img.src;
  img.src = URL.createObjectURL(blob);
  if (previous.startsWith('blob:')) URL.revokeObjectURL(previous);
  await img.decode();
  img.hidden = false;
}

async function showImage(id, url) {
  await showBlob(id, await getBlob(url, 'image/png'));
}

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

function showScanTimes(full, under) {
  const fullCell = numberCell('time.full');
  const underCell = numberCell('time.under');
  showNumber(fullCell, full.seconds, 'seconds', ` s (${full.formatted})`);
  showNumber(underCell, under.seconds, 'seconds', ` s (${under.formatted})`);
  const saved = full.seconds > 0 ? (100 * (full.seconds - under.seconds)) / full.seconds : null;
  showNumber(numberCell('time.saved'), saved, 'percent', ' %');
}

function showMetrics(outcome) {
  const metrics = outcome.metrics ?? {};
  showNumber(numberCell('recon.nrmse'), metrics.nrmse, 'nrmse');
  showNumber(numberCell('recon.psnr'), metrics.psnr, 'psnr');
  showNumber(numberCell('recon.ssim'), metrics.ssim, 'ssim');
  showNumber(numberCell('recon.hfen'), metrics.hfen, 'hfen');
  showNumber(numberCell('recon.reconMs'), outcome.timing?.reconMs, 'ms');
  const notes = byId('reconNotes');
  const list = Array.isArray(outcome.notes) ? outcome.notes : [];
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
  return Promise.all([
    postJson('v1/scan-time', { matrix, protocol }),
    postJson('v1/scan-time', { matrix, protocol, sampling: setup.sampling() }),
  ]);
}

export class SingleRun {
  constructor(setup) {
    this.setup = setup;
    this.status = byId('singleStatus');
    this.problems = byId('singleProblems');
    this.buttons = [byId('maskButton'), byId('reconButton')];
    byId('maskButton').addEventListener('click', () => this.run(() => this.showMask()));
    byId('reconButton').addEventListener('click', () => this.run(() => this.reconstruct()));
  }

  async run(task) {
    for (const button of this.buttons) button.disabled = true;
    this.problems.hidden = true;
    this.setup.markProblems([]);
    try {
      await task();
    } catch (error) {
      showProblem(this.status, this.problems, error, this.setup);
    } finally {
      for (const button of this.buttons) button.disabled = false;
    }
  }

  async showMask() {
    showStatus(this.status, 'Drawing the mask…', true);
    const body = { matrix: this.setup.matrix(), sampling: this.setup.sampling() };
    const [mask, png, [full, under]] = await Promise.all([
      postJson('v1/masks', body),
      postForBlob('v1/masks', body, 'image/png'),
      scanTimes(this.setup),
    ]);
    await showBlob('imgMask', png);
    await showImage('imgPsf', pageRelative(mask.images.psf));
    showMaskNumbers(mask);
    showScanTimes(full, under);
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
    const [outcome, mask, [full, under]] = await Promise.all([
      postJson('v1/reconstructions', body),
      postJson('v1/masks', { matrix: body.matrix, sampling: body.sampling }),
      scanTimes(setup),
    ]);
    await Promise.all(
      Object.entries(resultImages).map(([element, key]) =>
        showImage(element, pageRelative(outcome.images[key])),
      ),
    );
    showMaskNumbers(mask);
    showMetrics(outcome);
    showScanTimes(full, under);
    this.lastOutcome = outcome;
    showStatus(this.status, `Reconstruction ${outcome.id} done (${body.method.name}).`);
  }
}
