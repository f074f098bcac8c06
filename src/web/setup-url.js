// The setup in the page's address: every control of the setup form as a query parameter named after
// the control, so a copied link reproduces the setup and loading it restores the form. `plan=ID`
// beside them reopens a stored plan. The API key is never written to the address.

import { coilControls } from './coil-array.js';
import { byId } from './dom.js';

/** Controls kept in the address, in the order they are restored (the preset before its fields). */
const controls = [
  'phantom',
  'phantomKspace',
  'nx',
  'ny',
  'pattern',
  'acceleration',
  'acs',
  'densityPower',
  'seed',
  'angles',
  'method',
  'lambda',
  'tvLambda',
  'wavelet',
  'kernel',
  'rank',
  'weighting',
  'iterations',
  'senseMaps',
  'grappaKy',
  'grappaKx',
  'tikhonov',
  'snr',
  ...coilControls,
  'preset',
  'dimensions',
  'trMs',
  'averages',
  'echoTrainLength',
  'slices',
  'partialFourier',
];

/** Query parameters that are not form controls. */
const sourceParam = 'source';
const imageParam = 'image';
const noiseParam = 'noise';
export const planParam = 'plan';

/** The address's query for the current setup, keeping a `plan` parameter already there. */
export function setupQuery(setup, current = new URLSearchParams(location.search)) {
  const params = new URLSearchParams();
  const kind = setup.form.querySelector('input[name="sourceKind"]:checked').value;
  params.set(sourceParam, kind);
  if (kind === 'upload' && setup.uploaded?.id) params.set(imageParam, setup.uploaded.id);
  for (const id of controls) {
    const value = byId(id).value.trim();
    if (value !== '') params.set(id, value);
  }
  params.set(noiseParam, byId('noiseOn').checked ? 'on' : 'off');
  const plan = current.get(planParam);
  if (plan) params.set(planParam, plan);
  return params;
}

/** Rewrites the address (no new history entry) to hold the setup, and the plan when given. */
export function writeAddress(setup, { plan } = {}) {
  const params = setupQuery(setup);
  if (plan !== undefined) {
    if (plan) params.set(planParam, plan);
    else params.delete(planParam);
  }
  history.replaceState(null, '', `${location.pathname}?${params}`);
}

/**
 * Restores the setup from the address. Values go into the controls as they are (the service checks
 * them when they are used); a select keeps its value only if it has that option. Returns the upload
 * id to restore, if the address names one.
 */
export function restoreSetup(setup, params = new URLSearchParams(location.search)) {
  for (const id of controls) {
    const value = params.get(id);
    if (value === null) continue;
    const control = byId(id);
    if (control instanceof HTMLSelectElement && ![...control.options].some((o) => o.value === value))
      continue;
    control.value = value;
  }
  const kind = params.get(sourceParam);
  if (kind === 'phantom' || kind === 'upload') {
    setup.form.querySelector(`input[name="sourceKind"][value="${kind}"]`).checked = true;
  }
  const noise = params.get(noiseParam);
  if (noise === 'on' || noise === 'off') byId('noiseOn').checked = noise === 'on';
  byId('snr').disabled = !byId('noiseOn').checked;
  // An ACS from the address is the user's own: it no longer follows the matrix.
  if (params.has('acs')) setup.acsEdited = true;
  setup.syncDimensions();
  setup.syncVisibility();
  setup.coilPicker.sync();
  return { imageId: kind === 'upload' ? params.get(imageParam) : null };
}
