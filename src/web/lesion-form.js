// The lesion piece of the setup form: lesions for one reconstruction and for a plan, and the plan's
// targets on task scores. Sent only when "Insert lesions" is ticked; a blank target is not sent.

import { byId } from './dom.js';

const fields = [
  'lesionCount',
  'lesionDiameter',
  'lesionContrast',
  'lesionShape',
  'lesionSeed',
  'lesionContrastDetail',
];

/** Enables the lesion fields with their checkbox. */
export function wireLesionForm() {
  const on = byId('lesionsOn');
  const sync = () => {
    for (const id of fields) byId(id).disabled = !on.checked;
  };
  on.addEventListener('change', sync);
  sync();
}

/** The `lesions` request piece, or undefined when lesions are off. */
export function lesionsPiece() {
  if (!byId('lesionsOn').checked) return undefined;
  const piece = {
    count: Number(byId('lesionCount').value),
    diameter: Number(byId('lesionDiameter').value),
    contrast: Number(byId('lesionContrast').value),
    shape: byId('lesionShape').value,
    seed: Number(byId('lesionSeed').value),
  };
  if (byId('lesionContrastDetail').value === 'yes') piece.contrastDetail = true;
  return piece;
}

/** Plan targets on task scores (all must be met beside the image-quality target); none without lesions. */
export function taskTargets() {
  if (!byId('lesionsOn').checked) return [];
  const targets = [];
  const recovery = byId('targetContrastRecovery').value.trim();
  if (recovery !== '') targets.push({ metric: 'contrastRecovery', atLeast: Number(recovery) });
  const falseLesions = byId('targetFalseLesions').value.trim();
  if (falseLesions !== '') targets.push({ metric: 'falseLesions', atMost: Number(falseLesions) });
  return targets;
}
