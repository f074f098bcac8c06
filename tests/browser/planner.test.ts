import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyInstance } from 'fastify';
import { type BrowserContext, chromium, type Page, type Response } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../src/app.ts';

/**
 * The planner page in a real browser: Debian's chromium driven by playwright-core against the real
 * service on an ephemeral port. Numbers on the page are checked against the service's own answers
 * (the page keeps each exact value in data-value and shows a rounding of it).
 */

const chromiumPath = '/usr/bin/chromium';
const artifacts = join(dirname(fileURLToPath(import.meta.url)), '..', 'artifacts');
/** Flags that keep chromium from dialling out on a closed network (background services, QUIC, sync). */
const chromiumArgs = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

let app: FastifyInstance;
let baseUrl: string;
let context: BrowserContext;
let page: Page;
let userDataDir: string;
let dataDir: string;
let keyedApp: FastifyInstance;
let keyedUrl: string;
let keyedDataDir: string;
const apiKey = 'browser-test-key-7f3a';
const offOrigin: string[] = [];
const pageErrors: string[] = [];
const requested: string[] = [];

async function api(path: string, init: RequestInit = {}): Promise<globalThis.Response> {
  const response = await fetch(`${baseUrl}${path}`, init);
  expect(response.ok, `${init.method ?? 'GET'} ${path} → ${response.status}`).toBe(true);
  return response;
}

async function postApi(path: string, body: unknown): Promise<Record<string, unknown>> {
  const response = await api(path, {
    method: 'POST',
    headers: { 'content-type': 'application/json', accept: 'application/json' },
    body: JSON.stringify(body),
  });
  return (await response.json()) as Record<string, unknown>;
}

/** The exact value a shown number carries, and its text. */
async function shown(selector: string): Promise<{ value: number; text: string }> {
  const locator = page.locator(selector);
  const value = await locator.getAttribute('data-value');
  expect(value, `${selector} has a data-value`).not.toBeNull();
  return { value: Number(value), text: (await locator.textContent()) ?? '' };
}

/** The first number in the text equals `expected` to the decimals the text shows. */
function expectRounded(text: string, expected: number): void {
  const match = /-?\d+(?:\.(\d+))?/.exec(text);
  expect(match, `a number in "${text}"`).not.toBeNull();
  const decimals = match![1]?.length ?? 0;
  expect(Math.abs(Number(match![0]) - expected)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12);
}

async function expectShownEquals(selector: string, expected: unknown): Promise<void> {
  expect(typeof expected, `${selector}: API value is a number`).toBe('number');
  const { value, text } = await shown(selector);
  expect(value).toBe(expected);
  expectRounded(text, expected as number);
}

/** Counts canvas pixels that are neither transparent nor near-white (i.e. something was drawn). */
async function inkedPixels(selector: string): Promise<number> {
  return page.$eval(selector, (canvas) => {
    const c = canvas as HTMLCanvasElement;
    const data = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
    let count = 0;
    for (let i = 0; i < data.length; i += 4) {
      if (data[i + 3] > 0 && (data[i] < 200 || data[i + 1] < 200 || data[i + 2] < 200)) count++;
    }
    return count;
  });
}

function waitForApi(path: string, method = 'POST', accept?: string): Promise<Response> {
  return page.waitForResponse((r) => {
    const request = r.request();
    if (request.method() !== method || new URL(r.url()).pathname !== path) return false;
    return accept === undefined || (request.headers().accept ?? '').includes(accept);
  });
}

async function listen(server: FastifyInstance): Promise<string> {
  await server.listen({ port: 0, host: '127.0.0.1' });
  const address = server.server.address();
  if (address === null || typeof address === 'string') throw new Error('no TCP address');
  return `http://127.0.0.1:${address.port}`;
}

beforeAll(async () => {
  if (!existsSync(chromiumPath)) {
    throw new Error(
      `${chromiumPath} is missing: the browser test needs Debian's chromium (apt-get install chromium)`,
    );
  }
  mkdirSync(artifacts, { recursive: true });
  dataDir = mkdtempSync(join(tmpdir(), 'kspace-planner-browser-data-'));
  app = await buildApp({ dataDir });
  baseUrl = await listen(app);
  keyedDataDir = mkdtempSync(join(tmpdir(), 'kspace-planner-browser-keyed-'));
  keyedApp = await buildApp({ dataDir: keyedDataDir, apiKeys: [apiKey], workers: 1 });
  keyedUrl = await listen(keyedApp);

  userDataDir = mkdtempSync(join(tmpdir(), 'kspace-planner-chromium-'));
  context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: chromiumPath,
    headless: true,
    args: chromiumArgs,
    viewport: { width: 1280, height: 800 },
    acceptDownloads: true,
  });
  // Nothing leaves the service's origin: no CDN, no fonts, no telemetry.
  await context.route('**/*', (route) => {
    const url = route.request().url();
    const local = [baseUrl, keyedUrl, 'blob:', 'data:'].some((origin) => url.startsWith(origin));
    if (local) return route.continue();
    offOrigin.push(url);
    return route.abort();
  });
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (error) => pageErrors.push(String(error)));
  page.on('console', (message) => {
    if (message.type() === 'error') pageErrors.push(message.text());
  });
  page.on('request', (request) => requested.push(request.url()));
});

afterAll(async () => {
  await context?.close();
  await app?.close();
  await keyedApp?.close();
  if (keyedDataDir) rmSync(keyedDataDir, { recursive: true, force: true });
  if (userDataDir) rmSync(userDataDir, { recursive: true, force: true });
  if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

describe('planner page in Chromium', () => {
  it('loads with the cautions in view at 1280×800 and every control labelled', async () => {
    await page.goto(`${baseUrl}/`);
    await page.waitForSelector('body[data-ready="true"]');
    await page.screenshot({ path: join(artifacts, 'planner-first-load-1280x800.png') });

    // docs/references.md §11: the four cautions, readable without scrolling.
    const box = await page.locator('#cautions').boundingBox();
    expect(box).not.toBeNull();
    expect(box!.y).toBeGreaterThanOrEqual(0);
    expect(box!.y + box!.height).toBeLessThanOrEqual(800);
    const cautions = (await page.locator('#cautions').textContent()) ?? '';
    expect(cautions).toContain('not for diagnosis');
    expect(cautions).toContain('remove or invent small features');
    expect(cautions).toContain('SAR and nerve stimulation are not modelled');
    expect(cautions).toContain('responsible MR physicist');

    // The phantom list is the service's.
    const { phantoms } = (await (await api('/v1/phantoms')).json()) as { phantoms: Array<{ name: string }> };
    const options = await page.$$eval('#phantom option', (list) =>
      list.map((o) => (o as HTMLOptionElement).value),
    );
    expect(options).toEqual(phantoms.map((p) => p.name));

    // Every form control has a label or an accessible name (WCAG 2.2 SC 1.3.1 / 4.1.2).
    const unlabelled = await page.$$eval('input, select, button, textarea', (controls) =>
      controls
        .filter((c) => {
          const el = c as HTMLInputElement;
          const named =
            (el.labels?.length ?? 0) > 0 || el.getAttribute('aria-label') || el.textContent?.trim();
          return !named;
        })
        .map((c) => c.outerHTML.slice(0, 80)),
    );
    expect(unlabelled).toEqual([]);

    // Keyboard: Tab reaches the Reconstruct button.
    let reached = false;
    for (let i = 0; i < 80 && !reached; i++) {
      await page.keyboard.press('Tab');
      reached = await page.evaluate(() => document.activeElement?.id === 'reconButton');
    }
    expect(reached).toBe(true);
  });

  it('uploads an image as the source and shows what the service stored', async () => {
    // A 40×24 grey ramp, made here with sharp (no patient data).
    const pixels = Buffer.alloc(40 * 24);
    for (let i = 0; i < pixels.length; i++) pixels[i] = (i * 7) % 256;
    const png = await sharp(pixels, { raw: { width: 40, height: 24, channels: 1 } })
      .png()
      .toBuffer();
    await page.check('input[name="sourceKind"][value="upload"]');
    const uploaded = waitForApi('/v1/images');
    await page.setInputFiles('#uploadFile', { name: 'ramp.png', mimeType: 'image/png', buffer: png });
    const response = await uploaded;
    expect(response.status()).toBe(201);
    const info = (await response.json()) as { id: string; nx: number; ny: number };
    await page.waitForFunction(() =>
      document.querySelector('#uploadInfo')?.textContent?.startsWith('Uploaded'),
    );
    const stored = (await (await api(`/v1/images/${info.id}`)).json()) as {
      id: string;
      nx: number;
      ny: number;
    };
    expect([stored.nx, stored.ny]).toEqual([40, 24]);
    expect(await page.locator('#uploadInfo').textContent()).toContain(
      `${stored.nx}×${stored.ny} as ${stored.id}`,
    );
    expect(await page.inputValue('#nx')).toBe('40');
    expect(await page.inputValue('#ny')).toBe('24');
    await page.check('input[name="sourceKind"][value="phantom"]');
    expect(await page.isVisible('#phantom')).toBe(true);
  });

  it('makes a mask and shows the service’s numbers', async () => {
    await page.fill('#nx', '32');
    await page.fill('#ny', '32');
    await page.selectOption('#pattern', 'cartesian-random');
    await page.fill('#acceleration', '2');
    await page.fill('#acs', '6');
    await page.fill('#iterations', '20');
    const maskJson = waitForApi('/v1/masks', 'POST', 'application/json');
    await page.click('#maskButton');
    const response = await maskJson;
    const mask = (await response.json()) as {
      acceleration: { requested: number; actual: number };
      fraction: number;
      psf: { peakSidelobe: number; radialProfile: number[] };
    };
    await page.waitForFunction(() => !document.querySelector('#singleStatus')?.classList.contains('busy'));
    const body = response.request().postDataJSON();
    expect(body.matrix).toEqual({ nx: 32, ny: 32 });

    // The same request through the API gives the same answer (seeded), and the page shows it.
    const { id: _id, images: _images, ...sameMask } = mask as Record<string, unknown>;
    const { id: _againId, images: _againImages, ...sameAgain } = await postApi('/v1/masks', body);
    expect(sameAgain).toEqual(sameMask);
    await expectShownEquals('[data-key="mask.actual"]', mask.acceleration.actual);
    await expectShownEquals('[data-key="mask.requested"]', mask.acceleration.requested);
    await expectShownEquals('[data-key="mask.fraction"]', mask.fraction);
    await expectShownEquals('[data-key="mask.peakSidelobe"]', mask.psf.peakSidelobe);

    const maskSize = await page.$eval('#imgMask', (img) => [
      (img as HTMLImageElement).naturalWidth,
      (img as HTMLImageElement).naturalHeight,
    ]);
    expect(maskSize).toEqual([32, 32]);
    const psfWidth = await page.$eval('#imgPsf', (img) => (img as HTMLImageElement).naturalWidth);
    expect(psfWidth).toBe(32);
    // The radial profile of the PSF is drawn from the service's numbers.
    expect(mask.psf.radialProfile.length).toBeGreaterThan(1);
    expect(await inkedPixels('#psfProfile canvas')).toBeGreaterThan(50);
  });

  it('marks the control a service problem names', async () => {
    const errorsBefore = pageErrors.length;
    await page.fill('#acceleration', '0.5');
    const refused = waitForApi('/v1/masks', 'POST', 'application/json');
    await page.click('#maskButton');
    const response = await refused;
    // R < 1 is a value out of range: 422 problem+json (RFC 9457; docs/design.md §4.1 error classes).
    expect(response.status()).toBe(422);
    const problem = (await response.json()) as { errors: Array<{ field: string }> };
    expect(problem.errors.map((e) => e.field)).toContain('sampling.acceleration');
    await page.waitForFunction(() => !(document.querySelector('#maskButton') as HTMLButtonElement).disabled);
    expect(await page.getAttribute('#acceleration', 'aria-invalid')).toBe('true');
    expect(await page.locator('#singleProblems').textContent()).toContain('sampling.acceleration');
    // The browser logs the refused requests; they are the point of this check, not page errors.
    const logged = pageErrors.splice(errorsBefore);
    expect(logged.every((line) => /status of 4\d\d/.test(line))).toBe(true);
    await page.fill('#acceleration', '2');
  });

  it('runs a reconstruction and shows its images, metrics and scan time', async () => {
    await page.selectOption('#method', 'cs-tv');
    const reconResponse = waitForApi('/v1/reconstructions');
    await page.click('#reconButton');
    const response = await reconResponse;
    expect(response.status()).toBe(201);
    const outcome = (await response.json()) as {
      metrics: Record<string, number>;
      timing: { reconMs: number };
    };
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);
    expect(await page.locator('#singleStatus').textContent()).toContain('done');

    for (const id of [
      'imgMask',
      'imgPsf',
      'imgReconstruction',
      'imgZeroFilled',
      'imgReference',
      'imgErrorMap',
    ]) {
      // Each result PNG is one pixel per matrix element (32×32 set above).
      const size = await page.$eval(`#${id}`, (img) => [
        (img as HTMLImageElement).naturalWidth,
        (img as HTMLImageElement).naturalHeight,
      ]);
      expect(size, `${id} rendered`).toEqual([32, 32]);
    }

    // Same request again through the API: the metrics are seeded, hence equal; the page shows them.
    const again = (await postApi('/v1/reconstructions', response.request().postDataJSON())) as {
      metrics: Record<string, number>;
    };
    expect(again.metrics).toEqual(outcome.metrics);
    for (const metric of ['nrmse', 'psnr', 'ssim', 'hfen']) {
      await expectShownEquals(`[data-key="recon.${metric}"]`, outcome.metrics[metric]);
    }
    await expectShownEquals('[data-key="recon.reconMs"]', outcome.timing.reconMs);

    // Scan time of the protocol on the page, fully sampled and with this mask.
    const body = response.request().postDataJSON();
    const protocol = await page.evaluate(() => ({
      dimensions: (document.querySelector('#dimensions') as HTMLSelectElement).value,
      trMs: Number((document.querySelector('#trMs') as HTMLInputElement).value),
      averages: Number((document.querySelector('#averages') as HTMLInputElement).value),
      echoTrainLength: Number((document.querySelector('#echoTrainLength') as HTMLInputElement).value),
      slices: Number((document.querySelector('#slices') as HTMLInputElement).value),
      partialFourier: Number((document.querySelector('#partialFourier') as HTMLInputElement).value),
    }));
    const full = (await postApi('/v1/scan-time', { matrix: body.matrix, protocol })) as {
      seconds: number;
      formatted: string;
    };
    const under = (await postApi('/v1/scan-time', {
      matrix: body.matrix,
      protocol,
      sampling: body.sampling,
    })) as {
      seconds: number;
      formatted: string;
    };
    await expectShownEquals('[data-key="time.full"]', full.seconds);
    await expectShownEquals('[data-key="time.under"]', under.seconds);
    expect(await page.locator('[data-key="time.full"]').textContent()).toContain(full.formatted);
    expect(await page.locator('[data-key="time.under"]').textContent()).toContain(under.formatted);
    // The page's one derived number: the saving, 100 · (1 − undersampled / fully sampled).
    await expectShownEquals('[data-key="time.saved"]', (100 * (full.seconds - under.seconds)) / full.seconds);
  });

  it('runs a small plan to completion and draws the tradeoff plot and table', async () => {
    await page.fill('#planAccelerations', '2, 4');
    await page.fill('#planSeeds', '1');
    await page.fill('#iterations', '10');
    for (const box of await page.$$('input[name="planPattern"]')) await box.setChecked(false);
    await page.check('input[name="planPattern"][value="cartesian-random"]');
    await page.check('input[name="planPattern"][value="cartesian-uniform"]');
    for (const box of await page.$$('input[name="planMethod"]')) await box.setChecked(false);
    await page.check('input[name="planMethod"][value="zero-filled"]');
    await page.check('input[name="planMethod"][value="cs-tv"]');
    await page.selectOption('#targetMetric', 'ssim');
    await page.fill('#targetValue', '0.5');

    const accepted = waitForApi('/v1/plans');
    await page.click('#planButton');
    const { id } = (await (await accepted).json()) as { id: string };
    // The page re-enables "Run plan" when the plan ends (done, failed or cancelled) or is refused.
    await page.waitForFunction(
      () => !(document.querySelector('#planButton') as HTMLButtonElement).disabled,
      undefined,
      {
        timeout: 45_000,
      },
    );
    expect(await page.locator('#planStatus').textContent()).toContain('done');

    // The progress bar was fed by the events stream and ends full.
    expect(requested.some((url) => url.endsWith(`/v1/plans/${id}/events`))).toBe(true);
    const progress = await page.$eval('#planProgress', (p) => [
      (p as HTMLProgressElement).value,
      (p as HTMLProgressElement).max,
    ]);
    const plan = (await (await api(`/v1/plans/${id}`)).json()) as {
      status: string;
      progress: { done: number; total: number };
      table: {
        rows: Array<Record<string, unknown>>;
        paretoMetric: string;
        recommendation: { statement: string; overall: { key: string } | null };
      };
    };
    expect(plan.status).toBe('done');
    // (1 fully sampled reference + 2 patterns × 2 R × 2 methods) × 1 seed.
    expect(plan.progress.total).toBe(1 + 2 * 2 * 2);
    expect(progress).toEqual([plan.progress.total, plan.progress.total]);

    // Table: one row per cell, each shown number equal to the API's.
    type ShownCell = { col: string; value: string | undefined; text: string };
    const shownRows: ShownCell[][] = await page.$$eval('#planTable tbody tr[data-row]', (rows) =>
      rows.map((row) =>
        Array.from(row.querySelectorAll('td[data-col]')).map((td) => ({
          col: (td as HTMLElement).dataset.col ?? '',
          value: (td as HTMLElement).dataset.value,
          text: td.textContent ?? '',
        })),
      ),
    );
    expect(shownRows.length).toBe(plan.table.rows.length);
    let compared = 0;
    shownRows.forEach((cells, i) => {
      for (const cell of cells) {
        if (cell.value === undefined) continue;
        const path = cell.col;
        const expected = path
          .split('.')
          .reduce<unknown>((o, k) => (o as Record<string, unknown>)?.[k], plan.table.rows[i]);
        expect(Number(cell.value), `row ${i} ${path}`).toBe(expected);
        expectRounded(cell.text, expected as number);
        compared++;
      }
    });
    expect(compared).toBeGreaterThanOrEqual(plan.table.rows.length * 4);

    // The recommendation is the service's sentence, and its row is the highlighted one.
    expect(await page.locator('#recommendation').textContent()).toBe(plan.table.recommendation.statement);
    const highlighted = await page.$$eval('#planTable tr.recommended', (rows) =>
      rows.map((row) => (row as HTMLElement).dataset.row),
    );
    expect(highlighted).toEqual(
      plan.table.recommendation.overall ? [plan.table.recommendation.overall.key] : [],
    );
    const paretoRows = await page.$$eval('#planTable tr.pareto', (rows) =>
      rows.map((row) => (row as HTMLElement).dataset.row),
    );
    expect(paretoRows).toEqual(
      plan.table.rows.filter((row) => row.pareto && !row.reference).map((row) => row.key),
    );

    // The plot: uPlot's canvas has ink; its legend names the reference, one series per pattern+method,
    // the Pareto front and the recommendation (uPlot leaves the x series out of a static legend).
    const inked = await inkedPixels('#tradeoffPlot canvas');
    expect(inked).toBeGreaterThan(200);
    const legend = await page.$$eval('#tradeoffPlot .u-legend .u-series th', (ths) =>
      ths.map((t) => t.textContent?.trim()),
    );
    const series = [
      ...new Set(
        plan.table.rows.filter((row) => !row.reference).map((row) => `${row.pattern} · ${row.method}`),
      ),
    ];
    expect(series.length).toBe(4);
    expect(legend).toEqual(['fully sampled', ...series, 'Pareto front (SSIM)', 'recommended']);

    // CSV download is the service's table.csv.
    const href = await page.getAttribute('#csvLink', 'href');
    expect(href).toBeTruthy();
    const csvFromPage = await page.evaluate(async (url) => (await fetch(url!)).text(), href);
    const csvFromApi = await (await api(`/v1/plans/${id}/table.csv`)).text();
    expect(csvFromPage).toBe(csvFromApi);

    await page.screenshot({ path: join(artifacts, 'planner-after-plan-1280x800.png'), fullPage: true });
  });

  it('stays usable at 420 px wide', async () => {
    await page.setViewportSize({ width: 420, height: 900 });
    // The plot follows its container (a ResizeObserver), so wait for it to fit.
    await page.waitForFunction(() => {
      const plot = document.querySelector('#tradeoffPlot .uplot') as HTMLElement | null;
      return plot !== null && plot.getBoundingClientRect().right <= window.innerWidth;
    });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    const buttonBox = await page.locator('#reconButton').boundingBox();
    expect(buttonBox!.x + buttonBox!.width).toBeLessThanOrEqual(420);
    await page.screenshot({ path: join(artifacts, 'planner-narrow-420.png'), fullPage: true });
    await page.setViewportSize({ width: 420, height: 900 });
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: join(artifacts, 'planner-narrow-420-top.png') });
  });

  it('cancels a running plan from the page', async () => {
    // A plan long enough to be still running when Cancel is pressed: (1 + 6 R) × 10 seeds of 64×64 CS-TV.
    await page.fill('#nx', '64');
    await page.fill('#ny', '64');
    await page.fill('#iterations', '400');
    await page.fill('#planAccelerations', '2, 3, 4, 5, 6, 8');
    await page.fill('#planSeeds', '10');
    for (const box of await page.$$('input[name="planPattern"]')) await box.setChecked(false);
    await page.check('input[name="planPattern"][value="cartesian-random"]');
    for (const box of await page.$$('input[name="planMethod"]')) await box.setChecked(false);
    await page.check('input[name="planMethod"][value="cs-tv"]');
    const accepted = waitForApi('/v1/plans');
    await page.click('#planButton');
    const { id } = (await (await accepted).json()) as { id: string };
    const cancelled = waitForApi(`/v1/plans/${id}`, 'DELETE');
    await page.click('#cancelButton');
    expect((await cancelled).status()).toBe(200);
    await page.waitForFunction(() => !(document.querySelector('#planButton') as HTMLButtonElement).disabled);
    const plan = (await (await api(`/v1/plans/${id}`)).json()) as {
      status: string;
      progress: { done: number; total: number };
    };
    expect(plan.status).toBe('cancelled');
    expect(plan.progress.done).toBeLessThan(plan.progress.total);
    expect(await page.locator('#planStatus').textContent()).toContain('cancelled');
  });

  it('works on a server that requires an API key', async () => {
    const keyed = await context.newPage();
    const keyedErrors: string[] = [];
    const keyedRequests: string[] = [];
    keyed.on('pageerror', (error) => keyedErrors.push(String(error)));
    keyed.on('request', (request) => keyedRequests.push(request.url()));
    await keyed.goto(`${keyedUrl}/`);
    await keyed.waitForSelector('body[data-ready="true"]');
    // Without the key the service refuses, and the page says where to enter one.
    expect(await keyed.locator('#singleStatus').textContent()).toContain('Service access');

    await keyed.click('.access summary');
    await keyed.fill('#apiKey', apiKey);
    await keyed.press('#apiKey', 'Enter'); // commits the field; must not reload the page
    await keyed.waitForFunction(() => document.querySelectorAll('#phantom option').length > 0);
    const listed = await fetch(`${keyedUrl}/v1/phantoms`, { headers: { 'x-api-key': apiKey } });
    const { phantoms } = (await listed.json()) as { phantoms: Array<{ name: string }> };
    const options = await keyed.$$eval('#phantom option', (list) =>
      list.map((o) => (o as HTMLOptionElement).value),
    );
    expect(options).toEqual(phantoms.map((p) => p.name));

    // Images come through fetch with the key (an <img src> could not send it).
    await keyed.fill('#nx', '32');
    await keyed.fill('#ny', '32');
    await keyed.fill('#acceleration', '2');
    await keyed.fill('#acs', '4');
    await keyed.click('#maskButton');
    await keyed.waitForFunction(() => !(document.querySelector('#maskButton') as HTMLButtonElement).disabled);
    expect(await keyed.locator('#singleStatus').textContent()).toContain('Mask ready');
    expect(await keyed.$eval('#imgPsf', (img) => (img as HTMLImageElement).naturalWidth)).toBe(32);

    // EventSource cannot send a key: the page follows the plan by polling its status instead.
    for (const box of await keyed.$$('input[name="planPattern"]')) await box.setChecked(false);
    await keyed.check('input[name="planPattern"][value="cartesian-random"]');
    for (const box of await keyed.$$('input[name="planMethod"]')) await box.setChecked(false);
    await keyed.check('input[name="planMethod"][value="zero-filled"]');
    await keyed.fill('#planAccelerations', '2');
    await keyed.fill('#planSeeds', '1');
    await keyed.click('#planButton');
    await keyed.waitForFunction(
      () => !(document.querySelector('#planButton') as HTMLButtonElement).disabled,
      undefined,
      {
        timeout: 30_000,
      },
    );
    expect(await keyed.locator('#planStatus').textContent()).toContain('done');
    expect(await keyed.locator('#planTable tbody tr[data-row]').count()).toBe(2);
    expect(keyedRequests.some((url) => url.includes('/events'))).toBe(false);
    const csvHref = (await keyed.getAttribute('#csvLink', 'href')) ?? '';
    expect(csvHref.startsWith('blob:')).toBe(true);
    expect(keyedErrors).toEqual([]);
    await keyed.close();
  });

  it('made no request off the service origin and raised no page errors', () => {
    expect(offOrigin).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
