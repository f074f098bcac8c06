// Entry point of the planner page: wires the setup form, the single acquisition and the plan sections.

import { apiKey, setApiKey } from './api.js';
import { wireLesionForm } from './lesion-form.js';
import { PlanRun } from './plan-run.js';
import { SetupForm } from './setup-form.js';
import { SingleRun } from './single-run.js';
import { showProblem, showStatus } from './status.js';

const byId = (id) => document.getElementById(id);

async function main() {
  const setup = new SetupForm(byId('setup'));
  wireLesionForm();
  const single = new SingleRun(setup);
  const plan = new PlanRun(setup);

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
    } catch (error) {
      showProblem(info, byId('singleProblems'), error, setup);
    }
  });

  try {
    await setup.loadPhantoms();
  } catch (error) {
    showProblem(single.status, single.problems, error, setup);
  }
  document.body.dataset.ready = 'true';
  return { setup, single, plan };
}

main();
