// The acquisition setup form: turns the controls into the request pieces of the HTTP contract
// (source, matrix, sampling, method, noise, protocol) and shows field errors next to their controls.

import { largestSensibleAcs, suggestedAcs } from './acs-default.js';
import { getJson, uploadImage } from './api.js';
import { CoilPicker } from './coil-array.js';
import { byId } from './dom.js';

/** Draft protocols of the invented demo site (values are plausible, not taken from any real protocol). */
export const protocolPresets = [
  {
    label: 'Knee PD sagittal, draft A',
    protocol: {
      dimensions: '2d',
      trMs: 2800,
      averages: 1,
      echoTrainLength: 8,
      slices: 28,
      partialFourier: 1,
    },
  },
  {
    label: 'Knee T1 coronal, draft B',
    protocol: { dimensions: '2d', trMs: 550, averages: 1, echoTrainLength: 3, slices: 24, partialFourier: 1 },
  },
  {
    label: 'Knee 3D isotropic, draft C',
    protocol: {
      dimensions: '3d',
      trMs: 12,
      averages: 1,
      echoTrainLength: 1,
      slices: 1,
      partialFourier: 0.75,
    },
  },
];

function numberOf(id) {
  const raw = byId(id).value.trim();
  return raw === '' ? undefined : Number(raw);
}

export class SetupForm {
  constructor(form) {
    this.form = form;
    this.uploaded = null;
    // Until the user sets the ACS, it follows the matrix and R (see acs-default.js).
    this.acsEdited = false;
    this.fillPresets();
    this.applyPreset(0);
    form.addEventListener('change', (event) => this.onChange(event));
    byId('nx').addEventListener('input', () => this.syncPartitions());
    this.coilPicker = new CoilPicker(form);
    this.syncVisibility();
  }

  fillPresets() {
    const select = byId('preset');
    protocolPresets.forEach((preset, index) => {
      select.add(new Option(preset.label, String(index)));
    });
    select.add(new Option('custom (edited)', 'custom'));
  }

  applyPreset(index) {
    const preset = protocolPresets[index];
    if (!preset) return;
    byId('preset').value = String(index);
    for (const [key, value] of Object.entries(preset.protocol)) {
      // A 3D preset's slices (always 1) would overwrite the 2D slice count kept in the field.
      if (key === 'slices' && preset.protocol.dimensions === '3d') continue;
      byId(key).value = String(value);
    }
    this.syncDimensions();
  }

  threeD() {
    return byId('dimensions').value === '3d';
  }

  /**
   * In 3D the matrix's ny×nx plane is the ky×kz phase-encode plane: nx counts the partitions and the
   * protocol is one slab (the service requires slices = 1). Labels, hints and the mask's axes say so.
   */
  syncDimensions() {
    const dims = this.threeD() ? '3d' : '2d';
    for (const el of document.querySelectorAll('[data-dim]')) el.hidden = el.dataset.dim !== dims;
    this.syncPartitions();
  }

  syncPartitions() {
    const nx = numberOf('nx');
    const output = byId('partitions');
    output.value = Number.isInteger(nx) ? `${nx} (= nx), one slab` : '–';
    output.dataset.value = Number.isInteger(nx) ? String(nx) : '';
  }

  /**
   * Keeps the ACS usable when the matrix or R changes: an ACS the user never set follows the
   * suggestion; one the user set is lowered on a matrix change when it would fill over half the
   * lines the mask may hold. The hint says what changed.
   */
  adaptAcs(reason) {
    const ny = numberOf('ny');
    const R = numberOf('acceleration');
    const acs = numberOf('acs');
    if (!Number.isInteger(ny) || ny < 1) return;
    let next = acs;
    if (!this.acsEdited) next = suggestedAcs(ny, R);
    else if (reason === 'matrix' && acs !== undefined) next = Math.min(acs, largestSensibleAcs(ny, R));
    const hint = byId('acsHint');
    if (next === acs || next === null) {
      hint.hidden = true;
      return;
    }
    byId('acs').value = String(next);
    hint.textContent =
      `ACS set to ${next} for ${ny} rows at R ${R ?? 1}` +
      (acs === undefined
        ? '.'
        : ` (was ${acs}): the mask holds round(ny / R) = ${Math.round(ny / (R || 1))} lines, the ACS at most half.`);
    hint.hidden = false;
  }

  onChange(event) {
    const target = event.target;
    if (target.id === 'preset') this.applyPreset(Number(target.value));
    else if (target.closest('fieldset')?.querySelector('#trMs')) byId('preset').value = 'custom';
    if (target.id === 'dimensions') this.syncDimensions();
    if (target.id === 'nx') this.syncPartitions();
    if (target.id === 'acs') {
      this.acsEdited = true;
      byId('acsHint').hidden = true;
    }
    if (target.id === 'nx' || target.id === 'ny') this.adaptAcs('matrix');
    if (target.id === 'acceleration') this.adaptAcs('acceleration');
    if (target.id === 'noiseOn') byId('snr').disabled = !target.checked;
    if (target.name === 'sourceKind' || target.id === 'pattern' || target.id === 'method')
      this.syncVisibility();
    if (target.getAttribute?.('aria-invalid') === 'true') target.removeAttribute('aria-invalid');
  }

  /** Shows only the parameters that apply to the chosen source, pattern and method. */
  syncVisibility() {
    const kind = this.form.querySelector('input[name="sourceKind"]:checked').value;
    for (const el of this.form.querySelectorAll('[data-source]')) el.hidden = el.dataset.source !== kind;
    const pattern = byId('pattern').value;
    for (const el of this.form.querySelectorAll('[data-pattern]')) {
      el.hidden = !el.dataset.pattern.split(' ').includes(pattern);
    }
    const method = byId('method').value;
    for (const el of this.form.querySelectorAll('[data-method]')) {
      el.hidden = !el.dataset.method.split(' ').includes(method);
    }
    // Poisson-disc keeps a central square of points; the line patterns keep whole lines.
    const square = pattern === 'poisson-disc';
    for (const el of this.form.querySelectorAll('[data-acs]'))
      el.hidden = (el.dataset.acs === 'square') !== square;
  }

  async loadPhantoms() {
    const select = byId('phantom');
    const { phantoms } = await getJson('v1/phantoms');
    select.replaceChildren();
    for (const phantom of phantoms) {
      const option = new Option(phantom.name, phantom.name);
      option.title = phantom.description ?? '';
      select.add(option);
    }
    const preferred = phantoms.find((p) => p.name === 'shepp-logan-modified');
    if (preferred) select.value = preferred.name;
    return phantoms;
  }

  async upload(file) {
    const info = await uploadImage(file);
    this.uploaded = info;
    if (Number.isInteger(info.nx) && Number.isInteger(info.ny)) {
      byId('nx').value = String(info.nx);
      byId('ny').value = String(info.ny);
      this.syncPartitions();
      this.adaptAcs('matrix');
    }
    return info;
  }

  source() {
    const kind = this.form.querySelector('input[name="sourceKind"]:checked').value;
    if (kind === 'upload') return { imageId: this.uploaded?.id ?? '' };
    return { phantom: byId('phantom').value, kspace: byId('phantomKspace').value };
  }

  matrix() {
    return { nx: numberOf('nx'), ny: numberOf('ny') };
  }

  /**
   * The sampling piece for one pattern. A plan pattern (forPlan) carries neither R nor seed: the plan's
   * accelerations and its seeds 1…n set them.
   */
  sampling(pattern = byId('pattern').value, { forPlan = false } = {}) {
    const spec = { pattern };
    if (!forPlan) spec.acceleration = numberOf('acceleration');
    if (pattern !== 'radial') spec.acs = numberOf('acs');
    if (pattern === 'cartesian-random' || pattern === 'poisson-disc')
      spec.density = { power: numberOf('densityPower') };
    if (pattern === 'radial') spec.angles = byId('angles').value;
    if (!forPlan) spec.seed = numberOf('seed');
    // A single run carries partial Fourier in its sampling (the simulation leaves the rows out); a plan
    // gets it through the protocol, which applies it to every Cartesian pattern.
    const partialFourier = numberOf('partialFourier');
    if (!forPlan && pattern !== 'radial' && partialFourier !== undefined && partialFourier < 1)
      spec.partialFourier = partialFourier;
    return spec;
  }

  /** The method piece; a blank iteration count is left out, so the service's default applies. */
  method(name = byId('method').value) {
    const spec = this.methodWithoutFill(name);
    const fill = byId('partialFourierFill').value;
    if ((numberOf('partialFourier') ?? 1) < 1 && fill !== 'zero-fill') spec.partialFourier = fill;
    return spec;
  }

  methodWithoutFill(name) {
    const iterations = numberOf('iterations');
    if (name === 'cs-tv') {
      const spec = { name };
      if (iterations !== undefined) spec.iterations = iterations;
      const lambda = numberOf('lambda');
      if (lambda !== undefined) spec.lambda = lambda;
      return spec;
    }
    if (name === 'cs-wavelet') {
      const spec = { name, wavelet: byId('wavelet').value };
      if (iterations !== undefined) spec.iterations = iterations;
      const lambda = numberOf('lambda');
      if (lambda !== undefined) spec.lambda = lambda;
      const tvLambda = numberOf('tvLambda');
      if (tvLambda !== undefined && tvLambda > 0) spec.tvLambda = tvLambda;
      return spec;
    }
    if (name === 'lowrank-hankel') {
      const spec = { name, kernel: numberOf('kernel'), weighting: byId('weighting').value };
      if (iterations !== undefined) spec.iterations = iterations;
      const rank = numberOf('rank');
      if (rank !== undefined) spec.rank = rank;
      return spec;
    }
    return { name };
  }

  /** The receive array (`coils` piece); { array: 'uniform' } is the service's default. */
  coils() {
    return this.coilPicker.spec();
  }

  noise() {
    return byId('noiseOn').checked ? { snr: numberOf('snr') } : undefined;
  }

  protocol() {
    return {
      dimensions: byId('dimensions').value,
      trMs: numberOf('trMs'),
      averages: numberOf('averages'),
      echoTrainLength: numberOf('echoTrainLength'),
      // 3D: one slab; the partitions are the matrix's nx.
      slices: this.threeD() ? 1 : numberOf('slices'),
      partialFourier: numberOf('partialFourier'),
      // Echo-train timing only with an echo spacing; blanks are left out (JSON drops undefined).
      echoSpacingMs: numberOf('echoSpacingMs'),
      teMs: numberOf('teMs'),
      echoOrder: numberOf('echoSpacingMs') === undefined ? undefined : byId('echoOrder').value,
      sliceOverheadMs: numberOf('echoSpacingMs') === undefined ? undefined : numberOf('sliceOverheadMs'),
    };
  }

  /** Marks the controls named by a problem's field paths; returns the paths it could not place. */
  markProblems(fieldErrors) {
    for (const el of document.querySelectorAll('[aria-invalid="true"]')) el.removeAttribute('aria-invalid');
    const unplaced = [];
    for (const { field } of fieldErrors ?? []) {
      const control = controlForField(field);
      if (control) control.setAttribute('aria-invalid', 'true');
      else unplaced.push(field);
    }
    return unplaced;
  }
}

/** Maps "sampling.acceleration", "patterns[0].acs" or "/methods/1/lambda" to the control that edits it. */
function controlForField(field) {
  const dotted = String(field)
    .replace(/^\//, '')
    .replaceAll('/', '.')
    .replace(/\[(\d+)\]/g, '.$1');
  const candidates = [
    dotted,
    dotted.replace(/^patterns\.\d+\./, 'sampling.'),
    dotted.replace(/^methods\.\d+\./, 'method.'),
    dotted.replace(/^accelerations\.\d+$/, 'accelerations'),
    dotted.replace(/^target\..*$/, 'target'),
    dotted.replace(/^coilArrays\.\d+/, 'coils'),
    dotted.replace(/^coilArrays\.\d+\..*$/, 'coils'),
    dotted.replace(/^coils\..*$/, 'coils'),
    dotted.replace(/^targets\..*$/, 'targets'),
  ];
  for (const candidate of candidates) {
    const control = document.querySelector(`[data-field="${CSS.escape(candidate)}"]`);
    if (control) return control;
  }
  return null;
}
