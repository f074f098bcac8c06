import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { artifacts, decodedImage, type PlannerSession, usePlannerSession } from './browser-session.ts';
import { planTableHeaders } from './page-layout.ts';

/**
 * Feature fidelity on the planner page, in Debian's chromium driven by playwright-core against the
 * real service: lesion circles drawn on the reconstruction with lesions and on the error map, the
 * per-lesion scores the service computed, the contrast–detail plot, and a plan's task-score column
 * and plot axis.
 */

let session: PlannerSession;
let page: Page;

interface Circle {
  x: number;
  y: number;
  radius: number;
}

usePlannerSession({ prefix: 'kspace-planner-lesions-data-', workers: 1 }, (opened) => {
  session = opened;
  page = opened.page;
});

describe('lesions on the planner page', () => {
  it('circles the true lesion positions on the reconstruction with lesions and on the error map, lists the scores', async () => {
    await session.open('/');
    await session.fillSampling({ nx: 64, ny: 64, pattern: 'cartesian-random', acceleration: 2, acs: 8 });
    await page.selectOption('#method', 'zero-filled');
    await page.check('#noiseOn');
    await page.fill('#snr', '30');
    await page.check('#lesionsOn');
    await page.fill('#lesionCount', '4');
    await page.fill('#lesionDiameter', '3');
    await page.fill('#lesionContrast', '0.3');
    await page.selectOption('#lesionContrastDetail', 'yes');
    const response = await session.clickForApi('#reconButton', '/v1/reconstructions');
    expect(response.status()).toBe(201);
    const outcome = (await response.json()) as {
      fidelity: {
        lesions: Array<{ row: number; col: number; contrastRecovery: number }>;
        contrastRecovery: { mean: number };
        falseLesions: { count: number };
      };
    };
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);
    expect(await page.locator('#singleStatus').textContent()).toContain('done');
    expect(await page.locator('#fidelity').isVisible()).toBe(true);

    // The marked pictures are enlarged 8× (512 px for 64 px) with one circle per lesion, centred on it.
    const circles = JSON.parse((await page.getAttribute('#imgLesions', 'data-circles')) ?? '[]') as Circle[];
    expect(circles).toHaveLength(4);
    outcome.fidelity.lesions.forEach((lesion, i) => {
      expect(circles[i].x).toBe((lesion.col + 0.5) * 8);
      expect(circles[i].y).toBe((lesion.row + 0.5) * 8);
    });
    for (const selector of ['#imgLesions', '#imgErrorMap']) {
      const image = await decodedImage(page, selector);
      expect(image.width, selector).toBe(512);
      // On each circle, left, right, above and below its centre: the red of the marks.
      for (const { x, y, radius } of circles) {
        for (const [dx, dy] of [
          [radius, 0],
          [-radius, 0],
          [0, radius],
          [0, -radius],
        ]) {
          const at = 4 * (Math.round(y + dy) * image.width + Math.round(x + dx));
          const [r, g, b] = image.rgba.slice(at, at + 3);
          expect([r > 200, g < 80, b < 80], `${selector} at (${x + dx}, ${y + dy})`).toEqual([
            true,
            true,
            true,
          ]);
        }
      }
    }

    // Per-lesion contrast recovery: the service's values, in order.
    const shown = await page.$$eval('#lesionTable tbody tr td:nth-child(3)', (cells) =>
      cells.map((c) => Number((c as HTMLElement).dataset.value)),
    );
    expect(shown).toEqual(outcome.fidelity.lesions.map((l) => l.contrastRecovery));
    expect(await page.getAttribute('[data-key="fidelity.contrastRecovery"]', 'data-value')).toBe(
      String(outcome.fidelity.contrastRecovery.mean),
    );
    expect(await page.getAttribute('[data-key="fidelity.falseLesions"]', 'data-value')).toBe(
      String(outcome.fidelity.falseLesions.count),
    );
    // Contrast–detail: two curves of five diameters each.
    expect(await page.locator('#contrastDetailFigure').isVisible()).toBe(true);
    expect(await page.locator('#contrastDetailPlot circle[data-series="this"]').count()).toBe(5);
    expect(await page.locator('#contrastDetailPlot circle[data-series="full"]').count()).toBe(5);
    await page.locator('#fidelity').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'planner-lesions-1280x800.png'), fullPage: true });
    await page
      .locator('#resultFigures')
      .screenshot({ path: join(artifacts, 'planner-lesions-error-map.png') });
    await page.locator('#fidelity').screenshot({ path: join(artifacts, 'planner-lesions-fidelity.png') });
  });

  it('a plan with lesions: task-score columns, targets sent, contrast recovery on the plot axis', async () => {
    await session.fillPlan({
      accelerations: '2, 4',
      seeds: 1,
      patterns: ['cartesian-uniform'],
      methods: ['zero-filled'],
    });
    await page.selectOption('#lesionContrastDetail', 'no');
    await page.fill('#targetValue', '0');
    await page.fill('#targetContrastRecovery', '0.3');
    await page.fill('#targetFalseLesions', '');
    const sent = (await session.clickForApi('#planButton', '/v1/plans')).request().postDataJSON();
    expect(sent.lesions).toMatchObject({ count: 4, diameter: 3, contrast: 0.3 });
    expect(sent.targets).toEqual([{ metric: 'contrastRecovery', atLeast: 0.3 }]);
    await session.planEnded(60_000);
    expect(await page.locator('#planStatus').textContent()).toContain('done');
    const headers = await planTableHeaders(page);
    // The two task scores a target usually names show beside the key columns without sideways
    // scrolling at 1280 px; detectability and the resolved fraction come with "All columns".
    const wrapRight = await page.$eval(
      '#planTable',
      (t) => t.closest('.table-wrap')!.getBoundingClientRect().right,
    );
    for (const name of ['Recovery', 'False lesions', 'Pareto', 'Meets target']) {
      const header = headers.find((h) => h.text === name);
      expect(header?.visible, name).toBe(true);
      expect(header!.right, name).toBeLessThanOrEqual(wrapRight);
    }
    expect(headers.find((h) => h.text === 'Detectability d′')?.visible).toBe(false);
    const rows = await page.locator('#planTable tbody tr').count();
    await page.selectOption('#plotMetric', 'contrastRecovery');
    expect(await page.locator('#plotPointsSummary').textContent()).toBe(
      `Plotted points: ${rows} of ${rows} table rows`,
    );
    expect(await page.locator('#recommendation').textContent()).toMatch(/contrast recovery ≥ 0\.3/);
    await page.screenshot({ path: join(artifacts, 'planner-lesion-plan-1280x800.png'), fullPage: true });
  });

  it('raised no page errors', () => {
    expect(session.pageErrors).toEqual([]);
  });
});
