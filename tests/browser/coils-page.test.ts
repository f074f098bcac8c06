import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { artifacts, type PlannerSession, usePlannerSession } from './browser-session.ts';
import { expectNoSidewaysScroll } from './page-layout.ts';

/**
 * The receive-array part of the planner page (docs/design.md §3.8, §4.3, §4.4) in Debian's chromium
 * against the real service: the array picker and its drawing, the `coils` piece a reconstruction
 * sends, the coil results, the plan's `coilArrays` and g target, and the setup address.
 *
 * The service answers a multi-coil reconstruction only once a method reconstructs receive-array
 * data; until then it refuses with a 422 naming `coils`. Where the answer decides what the page must
 * show, the test checks the page against the answer it got: montage, g-factor and numbers equal to
 * the service's for a 201, the problem marked on the array control for a 422.
 */

let session: PlannerSession;
let page: Page;

async function chooseEightLoops(): Promise<void> {
  await page.selectOption('#coilArray', 'loops');
  await page.fill('#coilCount', '8');
  await page.fill('#coilLoopRadius', '0.35');
  await page.fill('#coilRingRadius', '1.25');
  await page.fill('#coilCorrelation', '0.1');
  await page.locator('#coilCorrelation').dispatchEvent('change');
}

usePlannerSession({ prefix: 'kspace-planner-browser-coils-', workers: 1 }, (opened) => {
  session = opened;
  page = opened.page;
});

describe('receive arrays on the planner page', () => {
  it('draws 8 loops on their ring, each a segment of length 2a normal to its radius, around the FOV', async () => {
    await session.open('/');
    // Uniform by default: no loop drawn, only the field of view.
    expect(await page.locator('#coilPicture .coil-loop').count()).toBe(0);
    expect(await page.locator('#coilPicture .coil-fov').count()).toBe(1);
    await chooseEightLoops();
    await expect.poll(() => page.locator('#coilPicture .coil-loop').count()).toBe(8);
    expect(await page.getAttribute('#coilPicture', 'data-coils')).toBe('8');

    // docs/design.md §3.8: loop c on a circle of radius ringRadius at 90° + 360°·c/C (coil 0 at the
    // top); its plane holds the image normal and the ring tangent, so in the image it is a segment of
    // length 2a along the tangent. The SVG flips y (screen y down).
    const loops = await page.$$eval('#coilPicture .coil-loop', (lines) =>
      lines.map((line) => ['x1', 'y1', 'x2', 'y2'].map((k) => Number(line.getAttribute(k)))),
    );
    loops.forEach(([x1, y1, x2, y2], c) => {
      const phi = ((90 + 45 * c) * Math.PI) / 180;
      const centre = [1.25 * Math.cos(phi), -1.25 * Math.sin(phi)];
      expect((x1 + x2) / 2).toBeCloseTo(centre[0], 3); // coordinates written to 4 decimals
      expect((y1 + y2) / 2).toBeCloseTo(centre[1], 3);
      expect(Math.hypot(x2 - x1, y2 - y1)).toBeCloseTo(0.7, 3);
      // Normal to the radius: the segment's direction dotted with the radius is zero.
      expect(((x2 - x1) * centre[0] + (y2 - y1) * centre[1]) / 0.7 / 1.25).toBeCloseTo(0, 3);
    });
    const fov = await page.$eval('#coilPicture .coil-fov', (rect) =>
      ['x', 'y', 'width', 'height'].map((k) => Number(rect.getAttribute(k))),
    );
    expect(fov).toEqual([-1, -1, 2, 2]);
    // The picture follows an edit without a button press.
    await page.fill('#coilCount', '4');
    await expect.poll(() => page.locator('#coilPicture .coil-loop').count()).toBe(4);
    await page.fill('#coilCount', '8');
    await expect.poll(() => page.locator('#coilPicture .coil-loop').count()).toBe(8);
    // Gaussian profiles are drawn as circles of radius σ.
    await page.selectOption('#coilArray', 'gaussian');
    expect(await page.locator('#coilPicture .coil-profile').count()).toBe(8);
    expect(await page.getAttribute('#coilPicture .coil-profile', 'r')).toBe('0.6');
    expect(await page.isVisible('#coilLoopRadius')).toBe(false);
    expect(await page.isVisible('#coilWidth')).toBe(true);
    await chooseEightLoops();
    await page.locator('#coilPicture').screenshot({ path: join(artifacts, 'coils-8-loops-picture.png') });
  });

  it('sends the array with a CS-TV reconstruction and shows what the service answers', async () => {
    await session.fillSampling({ nx: 32, ny: 32, pattern: 'cartesian-uniform', acceleration: 2, acs: 4 });
    await page.selectOption('#method', 'cs-tv');
    await page.fill('#iterations', '10');
    const response = await session.clickForApi('#reconButton', '/v1/reconstructions');
    const body = response.request().postDataJSON();
    expect(body.coils).toEqual({
      array: 'loops',
      count: 8,
      loopRadius: 0.35,
      ringRadius: 1.25,
      correlation: 0.1,
    });
    expect(body.method).toEqual({ name: 'cs-tv', iterations: 10 });
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);
    const outcome = await response.json();
    if (response.status() === 201) {
      // The montage is ⌈√C⌉ tiles across (docs/design.md §3.8): 3 × 3 tiles of 32² for 8 coils.
      expect(await page.isVisible('#coilResults')).toBe(true);
      const montage = await page.$eval('#imgCoilMaps', (img) => [
        (img as HTMLImageElement).naturalWidth,
        (img as HTMLImageElement).naturalHeight,
      ]);
      expect(montage).toEqual([96, 96]);
      expect(await page.textContent('#coilResultsLabel')).toBe(outcome.coils.label);
      expect(await page.getAttribute('[data-key="coils.count"]', 'data-value')).toBe('8');
      if (typeof outcome.coils.fitError === 'number')
        expect(Number(await page.getAttribute('[data-key="coils.fitError"]', 'data-value'))).toBe(
          outcome.coils.fitError,
        );
      if (outcome.gFactor) {
        expect(await page.isVisible('#imgGFactor')).toBe(true);
        for (const key of ['mean', 'p95', 'max'])
          expect(Number(await page.getAttribute(`[data-key="g.${key}"]`, 'data-value'))).toBe(
            outcome.gFactor[key],
          );
        expect(await page.textContent('[data-key="g.method"]')).toContain(outcome.gFactor.method);
      }
    } else {
      // Until a method reconstructs receive-array data: a 422 naming `coils`, shown beside the picker.
      expect(response.status()).toBe(422);
      expect(outcome.errors.map((e: { field: string }) => e.field)).toContain('coils');
      expect(await page.getAttribute('#coilArray', 'aria-invalid')).toBe('true');
      expect(await page.textContent('#singleProblems')).toContain('coils');
      expect(await page.isVisible('#coilResults')).toBe(false);
    }
    await page.screenshot({ path: join(artifacts, 'coils-reconstruction-1280x800.png'), fullPage: true });
  });

  it('carries the array in the setup address and restores it', async () => {
    await page.fill('#coilTilt', '10');
    await page.locator('#coilTilt').dispatchEvent('change');
    const params = new URL(page.url()).searchParams;
    expect(params.get('coilArray')).toBe('loops');
    expect(params.get('coilCount')).toBe('8');
    expect(params.get('coilLoopRadius')).toBe('0.35');
    expect(params.get('coilRingRadius')).toBe('1.25');
    expect(params.get('coilCorrelation')).toBe('0.1');
    expect(params.get('coilTilt')).toBe('10');
    await session.open(page.url());
    expect(await page.inputValue('#coilArray')).toBe('loops');
    expect(await page.inputValue('#coilTilt')).toBe('10');
    expect(await page.locator('#coilPicture .coil-loop').count()).toBe(8);
    await page.fill('#coilTilt', '');
    await page.locator('#coilTilt').dispatchEvent('change');
  });

  it('plans over the setup array and uniform with a g target, and shows the coils column', async () => {
    await session.fillPlan({
      accelerations: '2',
      seeds: 1,
      patterns: ['cartesian-uniform'],
      methods: ['zero-filled'],
    });
    expect(await page.textContent('#planSetupArrayLabel')).toBe('8 loops');
    await page.check('#planCompareUniform');
    await page.fill('#targetGMax', '1.5');
    const response = await session.clickForApi('#planButton', '/v1/plans');
    const body = response.request().postDataJSON();
    expect(body.coilArrays).toEqual([
      { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25, correlation: 0.1 },
      { array: 'uniform' },
    ]);
    expect(body.targets).toEqual([{ metric: 'gFactorMax', atMost: 1.5 }]);
    expect(response.status()).toBe(202);
    const { id } = await response.json();
    await session.planEnded(60_000);
    const plan = await (await fetch(`${session.baseUrl}/v1/plans/${id}`)).json();
    if (plan.status === 'done') {
      // One row per array and cell, and the reference: the Coils column is a key column here.
      const header = await page.$$eval('#planTable thead th', (ths) =>
        ths.map((th) => [th.textContent, th.classList.contains('secondary')]),
      );
      expect(header).toContainEqual(['Coils', false]);
      const shown = await page.$$eval('#planTable tbody tr', (trs) =>
        trs.map((tr) => Array.from(tr.querySelectorAll('td'))[2].textContent),
      );
      expect(shown).toEqual(plan.table.rows.map((row: { coils: string }) => row.coils));
      expect(new Set(shown)).toEqual(new Set(['8 loops', 'uniform']));
    } else {
      // Cells the service cannot reconstruct yet fail the plan; the page says so and shows no table.
      expect(plan.status).toBe('failed');
      expect(await page.textContent('#planStatus')).toContain('failed');
      expect(await page.locator('#planTable tbody tr').count()).toBe(0);
    }
    await page.screenshot({ path: join(artifacts, 'coils-plan-1280x800.png'), fullPage: true });
  });

  it('keeps the coil fields usable at 420 px wide', async () => {
    await page.setViewportSize({ width: 420, height: 900 });
    await expectNoSidewaysScroll(page);
    const picture = await page.locator('#coilPicture').boundingBox();
    expect(picture!.x + picture!.width).toBeLessThanOrEqual(420);
    await page.locator('#coilPicture').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'coils-narrow-420.png') });
    await page.setViewportSize({ width: 1280, height: 800 });
  });

  it('made no request off the service origin and raised no page errors', () => {
    expect(session.offOrigin).toEqual([]);
    // A refused request is logged by chromium as a failed resource; nothing else may be.
    expect(session.pageErrors.filter((e) => !/status of 422/.test(e))).toEqual([]);
  });
});
