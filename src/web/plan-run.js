// Plan a sweep: post the grid, follow its progress on the Server-Sent Events stream, then show the
// tradeoff plot and table the service computed (Pareto front and recommendation included).

import { apiKey, deleteResource, getJson, postJson } from './api.js';
import { planCoilArrays } from './coil-array.js';
import { byId } from './dom.js';
import { offerResource } from './downloads.js';
import { lesionsPiece, taskTargets } from './lesion-form.js';
import { planPoints, renderPlanTable } from './plan-table.js';
import { hideRowImages, showRowImages } from './row-images.js';
import { runShowingProblems, showProblem, showStatus } from './status.js';
import { offerTaskScores } from './task-scores.js';
import { drawTradeoffPlot } from './tradeoff-plot.js';

const terminal = new Set(['done', 'failed', 'cancelled']);
const higherIsBetter = { nrmse: false, psnr: true, ssim: true, hfen: false };

function parseAccelerations(text) {
  return text
    .split(/[\s,;]+/)
    .filter(Boolean)
    .map(Number);
}

export class PlanRun {
  /** `onPlan(id)` hears of every plan shown (a new one or one reopened), e.g. to put it in the address. */
  constructor(setup, onPlan = () => {}) {
    this.setup = setup;
    this.onPlan = onPlan;
    this.status = byId('planStatus');
    this.problems = byId('planProblems');
    this.progress = byId('planProgress');
    this.progressText = byId('planProgressText');
    this.planButton = byId('planButton');
    this.cancelButton = byId('cancelButton');
    this.plot = null;
    this.plan = null;
    this.planButton.addEventListener('click', () => this.start());
    this.cancelButton.addEventListener('click', () => this.cancel());
    byId('plotMetric').addEventListener('change', () => this.redrawPlot());
    byId('targetMetric').addEventListener('change', () => this.suggestTarget());
    byId('planTable').tBodies[0].addEventListener('click', (event) => {
      const key = event.target.closest?.('[data-open-row]')?.dataset.openRow;
      const row = this.plan?.table?.rows.find((r) => r.key === key);
      if (row) showRowImages(row, this.plan, this.problems, this.status);
    });
    const allColumns = byId('allColumns');
    allColumns.addEventListener('change', () => {
      byId('planTable').classList.toggle('compact', !allColumns.checked);
    });
  }

  /** A sensible threshold when the target metric changes (SSIM 0.9, PSNR 30 dB, NRMSE 0.1, HFEN 0.2). */
  suggestTarget() {
    const suggestions = { ssim: 0.9, psnr: 30, nrmse: 0.1, hfen: 0.2 };
    byId('targetValue').value = String(suggestions[byId('targetMetric').value]);
  }

  body() {
    const setup = this.setup;
    const form = byId('planForm');
    const patterns = [...form.querySelectorAll('input[name="planPattern"]:checked')].map((box) =>
      setup.sampling(box.value, { forPlan: true }),
    );
    const methods = [...form.querySelectorAll('input[name="planMethod"]:checked')].map((box) =>
      setup.method(box.value),
    );
    const metric = byId('targetMetric').value;
    const threshold = Number(byId('targetValue').value);
    const body = {
      source: setup.source(),
      matrix: setup.matrix(),
      protocol: setup.protocol(),
      patterns,
      accelerations: parseAccelerations(byId('planAccelerations').value),
      methods,
      seeds: Number(byId('planSeeds').value),
      target: higherIsBetter[metric] ? { metric, atLeast: threshold } : { metric, atMost: threshold },
    };
    const noise = setup.noise();
    if (noise) body.noise = noise;
    const targets = [];
    const lesions = lesionsPiece();
    if (lesions) {
      body.lesions = lesions;
      targets.push(...taskTargets());
    }
    // One uniform coil is the service's default: a plan without an array is sent as before.
    const coilArrays = planCoilArrays(setup.coils(), byId('planCompareUniform').checked);
    if (coilArrays.length > 1 || coilArrays[0].array !== 'uniform') body.coilArrays = coilArrays;
    const gMax = byId('targetGMax').value.trim();
    if (gMax !== '') targets.push({ metric: 'gFactorMax', atMost: Number(gMax) });
    if (targets.length > 0) body.targets = targets;
    return body;
  }

  setRunning(running) {
    this.planButton.disabled = running;
    this.cancelButton.disabled = !running;
  }

  showProgress(done, total, etaSeconds) {
    this.progress.max = Math.max(1, total);
    this.progress.value = done;
    const eta =
      typeof etaSeconds === 'number' && done < total ? `, about ${Math.ceil(etaSeconds)} s left` : '';
    this.progressText.textContent = `${done} / ${total} cells${eta}`;
    this.progressText.dataset.done = String(done);
    this.progressText.dataset.total = String(total);
  }

  start() {
    return this.guarded(async () => {
      const body = this.body();
      showStatus(this.status, 'Submitting the plan…', true);
      const accepted = await postJson('v1/plans', body);
      await this.track(accepted);
    });
  }

  /** Shows a stored plan: its table and plot when done, its progress (followed) while it runs. */
  reopen(id) {
    return this.guarded(async () => {
      showStatus(this.status, `Opening plan ${id}…`, true);
      await this.track(await getJson(`v1/plans/${encodeURIComponent(id)}`));
    });
  }

  /** Runs `task` from a clean slate with Run plan disabled; a problem clears the results and shows. */
  async guarded(task) {
    this.stopFollowing();
    this.clearResults();
    this.setRunning(true);
    try {
      await runShowingProblems(this, task, () => this.clearResults());
    } finally {
      this.stopFollowing();
      this.setRunning(false);
    }
  }

  /** Follows a plan (as a status answer) until it ends, then shows it. */
  async track(plan) {
    this.planId = plan.id;
    this.onPlan(plan.id);
    this.showProgress(plan.progress.done, plan.progress.total, plan.progress.etaSeconds);
    const final = terminal.has(plan.status) ? plan : await this.followWithStatus(plan);
    await this.finish(final);
  }

  followWithStatus(plan) {
    showStatus(this.status, `Plan ${plan.id} ${plan.status}…`, true);
    return this.follow(plan.id);
  }

  /**
   * Resolves with the finished plan. Progress comes from the SSE stream (`progress` events, then one
   * named after the final status); with an API key, which EventSource cannot send, by polling.
   */
  follow(id) {
    return new Promise((resolve, reject) => {
      const settle = async () => {
        try {
          const plan = await getJson(`v1/plans/${encodeURIComponent(id)}`);
          if (plan.progress) this.showProgress(plan.progress.done, plan.progress.total);
          if (terminal.has(plan.status)) {
            this.stopFollowing();
            resolve(plan);
          }
          return plan;
        } catch (error) {
          this.stopFollowing();
          reject(error);
          return null;
        }
      };
      const poll = () => {
        if (!this.poller) this.poller = setInterval(settle, 500);
      };
      if (apiKey()) {
        poll();
        return;
      }
      const source = new EventSource(`v1/plans/${encodeURIComponent(id)}/events`);
      this.events = source;
      const onEvent = (event) => {
        let data = null;
        try {
          data = JSON.parse(event.data);
        } catch {
          return;
        }
        const progress = data.progress ?? data;
        if (typeof progress.done === 'number' && typeof progress.total === 'number') {
          this.showProgress(progress.done, progress.total, progress.etaSeconds ?? data.etaSeconds);
        }
        if (terminal.has(data.status) || terminal.has(event.type)) settle();
      };
      for (const type of ['progress', 'done', 'failed', 'cancelled']) source.addEventListener(type, onEvent);
      // A dropped stream is retried by the browser; one it gave up on (e.g. refused) falls back to polling.
      source.addEventListener('error', async () => {
        const plan = await settle();
        if (plan && !terminal.has(plan.status) && source.readyState === EventSource.CLOSED) poll();
      });
    });
  }

  /** A new plan starts from a clean slate, so nothing on screen belongs to the previous one. */
  clearResults() {
    this.plan = null;
    this.plot?.stopResizing?.();
    this.plot?.destroy();
    this.plot = null;
    byId('tradeoffPlot').replaceChildren();
    byId('plotPoints').replaceChildren();
    byId('plotPointsBox').hidden = true;
    byId('planNotes').replaceChildren();
    byId('planNotesBox').hidden = true;
    byId('planTiming').hidden = true;
    const table = byId('planTable');
    table.tHead.replaceChildren();
    table.tBodies[0].replaceChildren();
    table.caption?.remove();
    byId('recommendation').hidden = true;
    byId('csvLink').hidden = true;
    hideRowImages();
    this.showProgress(0, 0);
  }

  stopFollowing() {
    if (this.events) this.events.close();
    this.events = null;
    if (this.poller) clearInterval(this.poller);
    this.poller = null;
  }

  async cancel() {
    if (!this.planId) return;
    try {
      await deleteResource(`v1/plans/${encodeURIComponent(this.planId)}`);
      showStatus(this.status, `Cancelling plan ${this.planId}…`, true);
    } catch (error) {
      showProblem(this.status, this.problems, error, this.setup);
    }
  }

  async finish(plan) {
    this.plan = plan;
    if (plan.status !== 'done') {
      this.clearResults();
      const reason = plan.error?.detail ?? '';
      showStatus(this.status, `Plan ${plan.id} ${plan.status}${reason ? `: ${reason}` : ''}.`);
      return;
    }
    const metric = plan.table?.paretoMetric ?? byId('targetMetric').value;
    offerTaskScores(byId('plotMetric'), plan.table?.rows ?? []);
    byId('plotMetric').value = metric;
    renderPlanTable(byId('planTable'), plan);
    this.redrawPlot();
    this.showRecommendation(plan);
    this.showNotes(plan.table?.notes ?? []);
    this.showTiming(plan.table?.fullySampled);
    await this.offerCsv(plan);
    showStatus(this.status, `Plan ${plan.id} done.`);
  }

  redrawPlot() {
    if (!this.plan?.table) return;
    this.plot?.stopResizing?.();
    this.plot?.destroy();
    const metric = byId('plotMetric').value;
    const paretoMetric = this.plan.table.paretoMetric;
    const { points, offAxis } = planPoints(this.plan, metric);
    const list = byId('plotPoints');
    this.plot = drawTradeoffPlot(byId('tradeoffPlot'), points, metric, paretoMetric, list);
    const rows = this.plan.table.rows.length;
    byId('plotPointsSummary').textContent = `Plotted points: ${points.length} of ${rows} table rows`;
    const off = byId('plotOffAxis');
    off.textContent = offAxis.length
      ? `Not on the axis (value +∞, an exact reconstruction): ${offAxis.map((row) => `${row.pattern} · ${row.method}`).join('; ')}.`
      : '';
    off.hidden = offAxis.length === 0;
    byId('plotPointsBox').hidden = false;
  }

  /** Passes, slices per TR and effective TE of the plan's protocol (its fully sampled scan). */
  showTiming(fullySampled) {
    const line = byId('planTiming');
    line.hidden = !fullySampled;
    if (!fullySampled) return;
    const te =
      typeof fullySampled.effectiveTeMs === 'number' ? `${fullySampled.effectiveTeMs} ms` : 'not modelled';
    line.textContent =
      `Protocol timing (fully sampled): ${fullySampled.passes} pass${fullySampled.passes === 1 ? '' : 'es'}, ` +
      `${fullySampled.slicesPerTr} slice${fullySampled.slicesPerTr === 1 ? '' : 's'} per TR, effective TE ${te}.`;
    line.dataset.passes = String(fullySampled.passes);
    line.dataset.slicesPerTr = String(fullySampled.slicesPerTr);
    line.dataset.effectiveTeMs = String(fullySampled.effectiveTeMs);
  }

  /** The service's notes on the plan, word for word (what the numbers do and do not model). */
  showNotes(notes) {
    byId('planNotes').replaceChildren(
      ...notes.map((note) => {
        const li = document.createElement('li');
        li.textContent = note;
        return li;
      }),
    );
    byId('planNotesBox').hidden = notes.length === 0;
  }

  /** The service's own sentence (its numbers, its rounding); the table row it names is highlighted. */
  showRecommendation(plan) {
    const element = byId('recommendation');
    const rec = plan.table?.recommendation ?? plan.recommendation ?? null;
    element.textContent = rec?.statement ?? 'The service gave no recommendation for this plan.';
    element.hidden = false;
  }

  async offerCsv(plan) {
    await offerResource(byId('csvLink'), plan.links.csv, 'text/csv', `plan-${plan.id}.csv`);
  }
}
