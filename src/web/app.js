// Entry point of the planner page: wires the setup form, the single acquisition and the plan sections.

import { apiKey, getJson, setApiKey } from './api.js';
import { byId } from './dom.js';
import { wireLesionForm } from './lesion-form.js';
import { PlanList } from './plan-list.js';
import { PlanRun } from './plan-run.js';
import { SetupForm } from './setup-form.js';
import { planParam, restoreSetup, writeAddress } from './setup-url.js';
import { SingleRun } from './single-run.js';
import { showProblem, showStatus } from './status.js';

async function main() {
  const setup = new SetupForm(byId('setup'));
  wireLesionForm();
  const single = new SingleRun(setup);
  // Every plan shown goes into the address (so the link reopens it) and the list is read again.
  const plan = new PlanRun(setup, (id) => {
    writeAddress(setup, { plan: id });
    plans.showing(id);
  });
  const plans = new PlanList((id) => plan.reopen(id));
  // The setup follows every edit into the address, so a copied link reproduces it.
  setup.form.addEventListener('change', () => writeAddress(setup));

  // Enter in a field must not submit (and reload) the page: the buttons run everything.
  for (const form of document.querySelectorAll('form')) {
    form.addEventListener('submit', (event) => event.preventDefault());
  }

  const keyInput = byId('apiKey');
  keyInput.value = apiKey();
  keyInput.addEventListener('change', async () => {
    setApiKey(keyInput.value.trim());
    // The phantom list is the first thing a keyed server refuses; fetch it again with the key.
    try {
      await setup.loadPhantoms();
      showStatus(single.status, 'Key accepted. Choose a setup, then show the mask or reconstruct.');
      single.problems.hidden = true;
      // What the address names (a setup, a plan) and the plan list were refused without the key.
      await restoreFromAddress(setup);
      const planId = new URLSearchParams(location.search).get(planParam);
      if (planId && plan.planId !== planId) plan.reopen(planId);
      plans.load();
    } catch (error) {
      showProblem(single.status, single.problems, error, setup);
    }
  });

  byId('uploadFile').addEventListener('change', async (event) => {
    const file = event.target.files?.[0];
    const info = byId('uploadInfo');
    if (!file) return;
    showStatus(info, `Uploading ${file.name}…`, true);
    try {
      const image = await setup.upload(file);
      showStatus(info, `Uploaded ${image.format ?? 'image'} ${image.nx}×${image.ny} as ${image.id}.`);
      writeAddress(setup);
    } catch (error) {
      showProblem(info, byId('singleProblems'), error, setup);
    }
  });

  try {
    await setup.loadPhantoms();
    await restoreFromAddress(setup);
  } catch (error) {
    showProblem(single.status, single.problems, error, setup);
  }
  const planId = new URLSearchParams(location.search).get(planParam);
  // Not awaited: a plan still running is followed until it ends.
  if (planId) plan.reopen(planId);
  await plans.load();
  document.body.dataset.ready = 'true';
  return { setup, single, plan, plans };
}

/** The setup named in the address (a shared link), including the upload it used when still stored. */
async function restoreFromAddress(setup) {
  const { imageId } = restoreSetup(setup);
  if (!imageId) return;
  const info = byId('uploadInfo');
  const image = await getJson(`v1/images/${encodeURIComponent(imageId)}`);
  setup.uploaded = image;
  showStatus(info, `Using uploaded ${image.format ?? 'image'} ${image.nx}×${image.ny} (${image.id}).`);
}

main();
