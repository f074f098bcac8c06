import { join } from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { debianFile } from '../io/debian-files.ts';
import { artifacts, decodedImage, type PlannerSession, usePlannerSession } from './browser-session.ts';
import { planTableHeaders } from './page-layout.ts';

/**
 * The planner page in a real browser: Debian's chromium driven by playwright-core against the real
 * service on an ephemeral port. Numbers on the page are checked against the service's own answers
 * (the page keeps each exact value in data-value and shows a rounding of it).
 */

let session: PlannerSession;
let baseUrl: string;
let keyedUrl: string;
let context: BrowserContext;
let page: Page;
let pageErrors: string[];
const apiKey = 'browser-test-key-7f3a';
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

/** Ticks exactly the named boxes of one checkbox group of the plan form (patterns or methods). */

/** Presses "Run plan" and returns the id of the plan the service accepted. */
async function submitPlan(): Promise<string> {
  const accepted = await session.clickForApi('#planButton', '/v1/plans');
  const { id } = (await accepted.json()) as { id: string };
  return id;
}

/**
 * Runs a plan of R 2 and 4, one seed, zero-filled and CS-TV over the given patterns with an SSIM
 * target of 0.5, waits until it is done and returns its id.
 */
async function runPlanToDone(patterns: string[]): Promise<string> {
  await session.fillPlan({ accelerations: '2, 4', seeds: 1, patterns, methods: ['zero-filled', 'cs-tv'] });
  await page.selectOption('#targetMetric', 'ssim');
  await page.fill('#targetValue', '0.5');
  const id = await submitPlan();
  await session.planEnded(45_000);
  expect(await page.locator('#planStatus').textContent()).toContain('done');
  return id;
}

usePlannerSession({ prefix: 'kspace-planner-browser-', apiKey }, (opened) => {
  session = opened;
  ({ baseUrl, context, page, pageErrors } = opened);
  keyedUrl = opened.keyedUrl!;
  page.on('request', (request) => requested.push(request.url()));
});

describe('planner page in Chromium', () => {
  it('loads with the cautions in view at 1280×800 and every control labelled', async () => {
    await session.open('/');
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
    const uploaded = session.waitForApi('/v1/images');
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

  it('defines every field in one line and shows units', async () => {
    // Each control of the setup and plan forms sits under a one-line hover definition (title).
    const undefined_ = await page.$$eval(
      '#setup input, #setup select, #planForm input, #planForm select',
      (els) =>
        els
          .map((el) => ({
            id: el.id || (el as HTMLInputElement).name,
            title: el.closest('[title]')?.getAttribute('title') ?? '',
          }))
          .filter(({ title }) => title.trim() === '' || title.includes('\n')),
    );
    expect(undefined_).toEqual([]);
    const titleOf = (id: string) =>
      page.$eval(`#${id}`, (el) => el.closest('[title]')?.getAttribute('title') ?? '');
    // What R, ACS, density power, λ and SNR mean here (DEVELOPERS.md "Engines: definitions worth knowing").
    expect(await titleOf('acceleration')).toMatch(/fully sampled count ÷ acquired count/);
    expect(await titleOf('acs')).toMatch(/centre of k-space/);
    expect(await titleOf('densityPower')).toMatch(/sampling density falls from the centre/);
    expect(await titleOf('lambda')).toMatch(/total-variation .*penalty/);
    expect(await titleOf('snr')).toMatch(/÷ noise standard deviation/);
    // Units in the labels: px for the matrix, ms for TR and the reconstruction time.
    for (const [selector, unit] of [
      ['label[for="nx"]', '(px)'],
      ['label[for="ny"]', '(px)'],
      ['label[for="kernel"]', '(px)'],
      ['label[for="trMs"]', '(ms)'],
      ['#reconNumbers', 'Reconstruction (ms)'],
    ] as const) {
      expect(await page.locator(selector).textContent()).toContain(unit);
    }
    // A blank iteration count means the service's default (sent as nothing).
    expect(await page.inputValue('#iterations')).toBe('');
    expect(await page.getAttribute('#iterations', 'placeholder')).toBe('default');
  });

  it('adapts the ACS to an uploaded 64×64 DICOM and runs it with the service’s default iterations', async () => {
    // MR_small.dcm: 64×64 MR slice from Debian's python3-pydicom test files (see tests/io/debian-files.ts).
    await page.check('input[name="sourceKind"][value="upload"]');
    const uploaded = session.waitForApi('/v1/images');
    await page.setInputFiles('#uploadFile', {
      name: 'MR_small.dcm',
      mimeType: 'application/dicom',
      buffer: debianFile('pydicom', 'MR_small.dcm'),
    });
    expect((await uploaded).status()).toBe(201);
    await page.waitForFunction(() =>
      document.querySelector('#uploadInfo')?.textContent?.startsWith('Uploaded'),
    );
    expect([await page.inputValue('#nx'), await page.inputValue('#ny')]).toEqual(['64', '64']);
    // The old fixed default (ACS 16 at R 4) is refused by the service at 64 rows: round(64/4) = 16
    // lines cannot hold 16 ACS lines and one drawn at random (sampling/cartesian-lines.ts).
    const refused = await fetch(`${baseUrl}/v1/masks`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', accept: 'application/json' },
      body: JSON.stringify({
        matrix: { nx: 64, ny: 64 },
        sampling: { pattern: 'cartesian-random', acceleration: 4, acs: 16, density: { power: 2 }, seed: 7 },
      }),
    });
    expect(refused.status).toBe(422);
    // The page proposes half the round(64/4) = 16 lines instead, and says so.
    expect(await page.inputValue('#acceleration')).toBe('4');
    expect(await page.inputValue('#acs')).toBe('8');
    expect(await page.locator('#acsHint').textContent()).toContain('ACS set to 8 for 64 rows at R 4');

    await page.selectOption('#method', 'cs-tv');
    const response = await session.clickForApi('#reconButton', '/v1/reconstructions');
    expect(response.status()).toBe(201);
    const sent = response.request().postDataJSON();
    expect(sent.sampling.acs).toBe(8);
    expect(sent.source).toHaveProperty('imageId');
    expect(sent.method).toEqual({ name: 'cs-tv' }); // no iteration count: the service's default applies
    const outcome = (await response.json()) as {
      info: { iterations: number; iterationLimit: number; converged: boolean };
    };
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);
    expect(await page.locator('#singleStatus').textContent()).toContain('done');
    // Iterations run and convergence as the service reports them in `info`.
    expect(typeof outcome.info.iterations).toBe('number');
    const iterations = await shown('[data-key="recon.iterations"]');
    expect(iterations.value).toBe(outcome.info.iterations);
    expect(iterations.text).toBe(`${outcome.info.iterations} of ${outcome.info.iterationLimit}`);
    expect(await page.getAttribute('[data-key="recon.converged"]', 'data-value')).toBe(
      String(outcome.info.converged),
    );
    expect(await page.locator('[data-key="recon.converged"]').textContent()).toMatch(
      outcome.info.converged ? /^yes/ : /^no/,
    );
    // A count typed in is sent.
    await page.fill('#iterations', '15');
    expect(
      (await session.clickForApi('#reconButton', '/v1/reconstructions')).request().postDataJSON().method,
    ).toEqual({ name: 'cs-tv', iterations: 15 });
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);
    expect((await shown('[data-key="recon.iterations"]')).text).toMatch(/ of 15$/);
    await page.check('input[name="sourceKind"][value="phantom"]');
  });

  it('makes a mask and shows the service’s numbers', async () => {
    await session.fillSampling({ nx: 32, ny: 32, pattern: 'cartesian-random', acceleration: 2, acs: 6 });
    await page.fill('#iterations', '20');
    const response = await session.clickForApi('#maskButton', '/v1/masks', 'POST', 'application/json');
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
    const response = await session.clickForApi('#maskButton', '/v1/masks', 'POST', 'application/json');
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
    const response = await session.clickForApi('#reconButton', '/v1/reconstructions');
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

  it('enlarges images, zooms the four together and keeps the error map on a fixed colour scale', async () => {
    await page.selectOption('#errorScaleMax', '0.05');
    const answered = await session.clickForApi('#reconButton', '/v1/reconstructions');
    const outcome = (await answered.json()) as {
      images: Record<string, string>;
    };
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);

    // Room for the images at 1280×800: each result tile is at least 190 px wide (it was 138 px).
    const tile = await page.locator('#imgReconstruction').boundingBox();
    expect(tile!.width).toBeGreaterThanOrEqual(190);

    // The error map, formed from the service's reconstruction and reference PNGs (same grey scale,
    // white = the reference maximum), independently here with sharp: | recon − reference | / 255.
    const levels = async (url: string) =>
      sharp(Buffer.from(await (await api(url)).arrayBuffer()))
        .extractChannel(0)
        .raw()
        .toBuffer();
    const [recon, reference] = await Promise.all([
      levels(outcome.images.reconstruction),
      levels(outcome.images.reference),
    ]);
    const diff = Array.from(recon, (v, i) => Math.abs(v - reference[i]));
    const maxLevel = Math.max(...diff);
    expect(Number(await page.getAttribute('#errorScale', 'data-max-error'))).toBe(maxLevel / 255);
    expect(await page.getAttribute('#errorScale', 'data-scale-max')).toBe('0.05');
    expect(await page.locator('#errorScaleNote').textContent()).toContain(
      `Largest error in this image ${(maxLevel / 255).toFixed(3)} × the reference maximum`,
    );
    // The colour bar states its numeric range.
    const ticks = await page.$$eval('#errorColourTicks span', (spans) => spans.map((s) => s.textContent));
    expect(ticks).toEqual(['0', '0.0125', '0.025', '0.0375', '≥ 0.05']);
    expect(await inkedPixels('#errorColourBar')).toBeGreaterThan(1000);
    // Pixels without error take viridis(0) = (68, 1, 84), pixels at or above the scale's end take
    // viridis(1) = (253, 231, 37): the end colours of matplotlib's viridis (Debian python3-matplotlib).
    const shownMap = (await decodedImage(page, '#imgErrorMap')).rgba;
    expect(shownMap.length).toBe(4 * diff.length);
    let zeros = 0;
    let saturated = 0;
    const wrong: number[] = [];
    diff.forEach((d, i) => {
      const rgb = shownMap.slice(4 * i, 4 * i + 3);
      if (d === 0) {
        zeros++;
        if (rgb.join() !== '68,1,84') wrong.push(i);
      } else if (d / 255 >= 0.05) {
        saturated++;
        if (rgb.join() !== '253,231,37') wrong.push(i);
      }
    });
    expect(wrong).toEqual([]);
    expect(zeros).toBeGreaterThan(0);
    expect(saturated).toBeGreaterThan(0);

    // Zoom and pan: one transform for the four result images.
    const transforms = () =>
      page.$$eval('#resultFigures img', (imgs) => imgs.map((img) => (img as HTMLElement).style.transform));
    const box = (await page.locator('#imgReconstruction').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.4);
    await page.mouse.wheel(0, -500);
    await page.waitForFunction(
      () => Number(document.querySelector('#zoomLevel')?.getAttribute('data-value')) > 1,
    );
    const zoomed = await transforms();
    expect(zoomed).toHaveLength(4);
    expect(zoomed[0]).toMatch(/scale\(/);
    expect(new Set(zoomed).size).toBe(1);
    // Drag on the error map: all four move.
    const errorBox = (await page.locator('#imgErrorMap').boundingBox())!;
    await page.mouse.move(errorBox.x + 100, errorBox.y + 100);
    await page.mouse.down();
    await page.mouse.move(errorBox.x + 130, errorBox.y + 120, { steps: 4 });
    await page.mouse.up();
    const panned = await transforms();
    expect(new Set(panned).size).toBe(1);
    expect(panned[0]).not.toBe(zoomed[0]);
    await page.screenshot({ path: join(artifacts, 'planner-zoomed-1280x800.png') });

    // A click (no drag) enlarges the image in a dialog that follows the same zoom.
    const zeroBox = (await page.locator('#imgZeroFilled').boundingBox())!;
    await page.mouse.click(zeroBox.x + zeroBox.width / 2, zeroBox.y + zeroBox.height / 2);
    await page.waitForSelector('#imageDialog[open]');
    expect(await page.getAttribute('#imageDialog', 'data-source')).toBe('imgZeroFilled');
    const large = (await page.locator('#imageDialogImg').boundingBox())!;
    expect(large.width).toBeGreaterThanOrEqual(2 * tile!.width);
    expect(await page.$eval('#imageDialogImg', (img) => (img as HTMLElement).style.transform)).toBe(
      panned[0],
    );
    await page.screenshot({ path: join(artifacts, 'planner-image-dialog-1280x800.png') });
    await page.keyboard.press('Escape');
    await page.waitForSelector('#imageDialog:not([open])', { state: 'attached' });
    await page.click('#zoomReset');
    expect(new Set(await transforms())).toEqual(new Set(['']));
  });

  it('clears earlier images and numbers when a request fails', async () => {
    const errorsBefore = pageErrors.length;
    expect(await page.isVisible('#imgReconstruction')).toBe(true);
    await page.fill('#acceleration', '0.5');
    expect((await session.clickForApi('#reconButton', '/v1/reconstructions')).status()).toBe(422);
    await page.waitForFunction(() => !(document.querySelector('#reconButton') as HTMLButtonElement).disabled);
    expect(await page.locator('#singleProblems').textContent()).toContain('sampling.acceleration');
    const visibleImages = await page.$$eval('#single img', (imgs) =>
      imgs.filter((img) => !(img as HTMLImageElement).hidden).map((img) => img.id),
    );
    expect(visibleImages).toEqual([]);
    const leftNumbers = await page.$$eval('#single [data-key]', (cells) =>
      cells
        .filter((c) => c.hasAttribute('data-value') || c.textContent !== '–')
        .map((c) => c.getAttribute('data-key')),
    );
    expect(leftNumbers).toEqual([]);
    expect(await page.isVisible('#errorScale')).toBe(false);
    expect(await page.locator('#psfProfile canvas').count()).toBe(0);
    await page.screenshot({ path: join(artifacts, 'planner-after-error-1280x800.png') });
    // The browser logs the refused requests; they are the point of this check, not page errors.
    const logged = pageErrors.splice(errorsBefore);
    expect(logged.every((line) => /status of 4\d\d/.test(line))).toBe(true);
    // The scale chosen stays for the next run, so two runs compare on the same colours.
    await page.fill('#acceleration', '2');
    await page.click('#reconButton');
    await page.waitForSelector('#errorScale:not([hidden])');
    expect(await page.getAttribute('#errorScale', 'data-scale-max')).toBe('0.05');
  });

  it('runs a small plan to completion and draws the tradeoff plot and table', async () => {
    await page.fill('#iterations', '10');
    const id = await runPlanToDone(['cartesian-random', 'cartesian-uniform']);

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

  it('plots every row of a 2D Poisson-disc plan, shows its notes and the key columns without scrolling', async () => {
    await page.fill('#nx', '32');
    await page.fill('#ny', '32');
    await page.fill('#iterations', '10');
    await page.selectOption('#preset', '0'); // 2D draft A
    await page.fill('#partialFourier', '0.75');
    const id = await runPlanToDone(['cartesian-random', 'poisson-disc']);
    const plan = (await (await api(`/v1/plans/${id}`)).json()) as {
      table: {
        rows: Array<{
          key: string;
          pattern: string;
          reference: boolean;
          pareto: boolean;
          scanSeconds: number;
        }>;
        notes: string[];
        recommendation: { overall: { key: string } | null };
      };
    };
    const rows = plan.table.rows;
    expect(rows.length).toBe(1 + 2 * 2 * 2);
    // In 2D every Poisson-disc row costs (nearly) every line: rows share scan times, which the old
    // plot (one value per scan time) collapsed.
    const times = rows.map((r) => r.scanSeconds);
    expect(new Set(times).size).toBeLessThan(times.length);

    // One drawn point per table row (SSIM is finite for every row, the reference's is 1).
    type Point = { row: string; x: number; y: number; pareto: string; recommended: string };
    const points: Point[] = await page.$$eval('#plotPoints li', (items) =>
      items.map((li) => {
        const d = (li as HTMLElement).dataset;
        return {
          row: d.row ?? '',
          x: Number(d.canvasX),
          y: Number(d.canvasY),
          pareto: d.paretoMarker ?? '',
          recommended: d.recommendedMarker ?? '',
        };
      }),
    );
    expect(points.map((p) => p.row).sort()).toEqual(rows.map((r) => r.key).sort());
    expect(await page.locator('#planTable tbody tr[data-row]').count()).toBe(points.length);
    expect(await page.locator('#plotPointsSummary').textContent()).toBe(
      `Plotted points: ${rows.length} of ${rows.length} table rows`,
    );
    // Each point is drawn: the canvas has ink at its position.
    const inkAt = await page.$eval(
      '#tradeoffPlot canvas',
      (canvas, spots) => {
        const ctx = (canvas as HTMLCanvasElement).getContext('2d')!;
        return spots.map(({ x, y }) => {
          const [r, g, b, a] = ctx.getImageData(x, y, 1, 1).data;
          return a > 0 && (r < 200 || g < 200 || b < 200);
        });
      },
      points.map(({ x, y }) => ({ x, y })),
    );
    await page.screenshot({ path: join(artifacts, 'planner-2d-poisson-plan-1280x800.png'), fullPage: true });
    expect(
      points.filter((_, i) => !inkAt[i]),
      'points without ink',
    ).toEqual([]);
    // Pareto and recommended markers sit on the service's rows.
    const byKey = new Map(rows.map((r) => [r.key, r]));
    for (const p of points) {
      const row = byKey.get(p.row)!;
      expect(p.pareto, `${p.row} pareto`).toBe(String(row.pareto && !row.reference));
      expect(p.recommended, `${p.row} recommended`).toBe(
        String(p.row === plan.table.recommendation.overall?.key),
      );
    }
    // Hover describes the row under the pointer.
    await page.locator('#tradeoffPlot').scrollIntoViewIfNeeded();
    const canvasBox = (await page.locator('#tradeoffPlot canvas').boundingBox())!;
    const ratio = await page.evaluate(() => devicePixelRatio);
    const target =
      points.find((p) => points.filter((q) => Math.hypot(q.x - p.x, q.y - p.y) < 30 * ratio).length === 1) ??
      points[0];
    await page.mouse.move(canvasBox.x + target.x / ratio, canvasBox.y + target.y / ratio);
    await page.waitForSelector('#tradeoffPlot .plot-tooltip:not([hidden])');
    expect(await page.getAttribute('#tradeoffPlot .plot-tooltip', 'data-row')).toBe(target.row);
    expect(await page.locator('#tradeoffPlot .plot-tooltip').textContent()).toContain(
      byKey.get(target.row)!.pattern,
    );
    await page.screenshot({ path: join(artifacts, 'planner-2d-poisson-plot-hover-1280x800.png') });
    await page.mouse.move(0, 0);
    // On PSNR the fully sampled row is +∞ (an exact reconstruction): listed as off the axis, not lost.
    const psnrNull = rows.filter(
      (r) => (r as unknown as { metrics: { psnr: { mean: number | null } } }).metrics.psnr.mean === null,
    );
    expect(psnrNull.map((r) => r.key)).toContain('reference');
    await page.selectOption('#plotMetric', 'psnr');
    expect(await page.locator('#plotPoints li').count()).toBe(rows.length - psnrNull.length);
    expect(await page.locator('#plotPointsSummary').textContent()).toBe(
      `Plotted points: ${rows.length - psnrNull.length} of ${rows.length} table rows`,
    );
    expect(await page.locator('#plotOffAxis').textContent()).toContain('fully sampled');
    await page.selectOption('#plotMetric', 'ssim');

    // The service's notes, word for word, visible without a click.
    const notes = await page.$$eval('#planNotes li', (items) => items.map((li) => li.textContent));
    expect(notes).toEqual(plan.table.notes);
    expect(await page.isVisible('#planNotes')).toBe(true);
    expect(notes.some((n) => /point mask \(e\.g\. poisson-disc\) in a 2D protocol/.test(n ?? ''))).toBe(true);
    // protocol.partialFourier is now the alias of sampling.partialFourier: the simulation leaves the rows out too.
    expect(notes.some((n) => /^Partial Fourier 0\.75: .*leave the other rows out too/.test(n ?? ''))).toBe(
      true,
    );

    // At 1280 px the target metric, Pareto and meets-target columns show without sideways scrolling.
    const wrap = await page.$eval('.table-wrap', (el) => ({
      scroll: el.scrollWidth,
      client: el.clientWidth,
      right: el.getBoundingClientRect().right,
    }));
    expect(wrap.scroll).toBeLessThanOrEqual(wrap.client);
    const headers = await planTableHeaders(page);
    for (const name of ['SSIM mean ± sd', 'Pareto', 'Meets target']) {
      const header = headers.find((h) => h.text === name);
      expect(header?.visible, name).toBe(true);
      expect(header!.right).toBeLessThanOrEqual(wrap.right);
    }
    expect(await page.getAttribute('#planTable th.target', 'data-metric')).toBe('ssim');
    await page.screenshot({ path: join(artifacts, 'planner-2d-poisson-plan-1280x800.png'), fullPage: true });
    // "All columns" shows the secondary ones; the key columns stay in view.
    await page.check('#allColumns');
    const all = await page.$$eval('#planTable thead th', (ths) =>
      ths.filter((th) => (th as HTMLElement).offsetParent !== null).map((th) => th.textContent),
    );
    expect(all).toContain('HFEN mean ± sd');
    expect(all).toContain('Recon (ms)');
    const pareto = await page.locator('#planTable thead th', { hasText: 'Meets target' }).boundingBox();
    expect(pareto!.x + pareto!.width).toBeLessThanOrEqual(wrap.right);
    await page.uncheck('#allColumns');
    await page.selectOption('#preset', '0');
  });

  it('labels the 3D phase-encode plane and sends what the service accepts', async () => {
    await page.selectOption('#preset', '2'); // 3D draft C
    expect(await page.inputValue('#dimensions')).toBe('3d');
    expect(await page.locator('label[for="nx"] span:not([hidden])').textContent()).toContain('Partitions');
    expect(await page.locator('label[for="ny"] span:not([hidden])').textContent()).toContain('Phase encode');
    expect(await page.locator('#maskAxes span:not([hidden])').textContent()).toContain('z across');
    expect(await page.isVisible('#slices')).toBe(false);
    await page.fill('#nx', '40');
    await page.fill('#ny', '32');
    expect(await page.locator('#partitions').textContent()).toBe('40 (= nx), one slab');
    const scanTime = page.waitForResponse(
      (r) =>
        new URL(r.url()).pathname === '/v1/scan-time' && r.request().postDataJSON().sampling === undefined,
    );
    await page.click('#maskButton');
    const response = await scanTime;
    expect(response.status()).toBe(200);
    const sent = response.request().postDataJSON();
    // protocol schema: slices must be 1 in 3D, the partitions are the matrix's nx.
    expect(sent.protocol.dimensions).toBe('3d');
    expect(sent.protocol.slices).toBe(1);
    await page.waitForFunction(() => !(document.querySelector('#maskButton') as HTMLButtonElement).disabled);
    const full = (await response.json()) as { seconds: number };
    await expectShownEquals('[data-key="time.full"]', full.seconds);
    // 3D counts every point of the ky×kz plane: 32 × 40 × TR 12 ms × 1 average, ETL 1, partial
    // Fourier 0.75 keeps ⌈0.75·32⌉ = 24 rows (DEVELOPERS.md "Scan time and plans").
    expect(full.seconds).toBeCloseTo((24 * 40 * 12) / 1000, 9);
    // The earlier reconstruction (another matrix) no longer matches this mask: it is cleared.
    expect(await page.isVisible('#imgReconstruction')).toBe(false);
    expect(await page.locator('[data-key="recon.nrmse"]').textContent()).toBe('–');
    expect(await page.$eval('#imgMask', (img) => (img as HTMLImageElement).naturalWidth)).toBe(40);
    await page.screenshot({ path: join(artifacts, 'planner-3d-setup-1280x800.png') });
    await page.selectOption('#preset', '0');
    expect(await page.locator('label[for="nx"] span:not([hidden])').textContent()).toContain('Readout');
    expect(await page.isVisible('#slices')).toBe(true);
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
    await session.fillPlan({
      accelerations: '2, 3, 4, 5, 6, 8',
      seeds: 10,
      patterns: ['cartesian-random'],
      methods: ['cs-tv'],
    });
    const id = await submitPlan();
    expect((await session.clickForApi('#cancelButton', `/v1/plans/${id}`, 'DELETE')).status()).toBe(200);
    await session.planEnded();
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
    await session.open(`${keyedUrl}/`, keyed);
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
    await session.fillSampling({ nx: 32, ny: 32, acceleration: 2, acs: 4 }, keyed);
    await keyed.click('#maskButton');
    await keyed.waitForFunction(() => !(document.querySelector('#maskButton') as HTMLButtonElement).disabled);
    expect(await keyed.locator('#singleStatus').textContent()).toContain('Mask ready');
    expect(await keyed.$eval('#imgPsf', (img) => (img as HTMLImageElement).naturalWidth)).toBe(32);

    // EventSource cannot send a key: the page follows the plan by polling its status instead.
    await session.fillPlan(
      {
        accelerations: '2',
        seeds: 1,
        patterns: ['cartesian-random'],
        methods: ['zero-filled'],
      },
      keyed,
    );
    await keyed.click('#planButton');
    await session.planEnded(30_000, keyed);
    expect(await keyed.locator('#planStatus').textContent()).toContain('done');
    expect(await keyed.locator('#planTable tbody tr[data-row]').count()).toBe(2);
    expect(keyedRequests.some((url) => url.includes('/events'))).toBe(false);
    const csvHref = (await keyed.getAttribute('#csvLink', 'href')) ?? '';
    expect(csvHref.startsWith('blob:')).toBe(true);
    expect(keyedErrors).toEqual([]);
    await keyed.close();
  });

  it('shows passes, slices per TR and effective TE, and notes the saving from partial Fourier', async () => {
    await page.selectOption('#preset', '0'); // 2D draft A: TR 2800 ms, ETL 8, 28 slices
    await session.fillSampling({ nx: 32, ny: 32, pattern: 'cartesian-uniform', acceleration: 2, acs: 4 });
    await page.fill('#partialFourier', '0.625');
    await page.fill('#echoSpacingMs', '10');
    const scanTime = page.waitForResponse(
      (r) =>
        new URL(r.url()).pathname === '/v1/scan-time' &&
        r.request().postDataJSON().sampling?.partialFourier === 0.625,
    );
    await page.click('#maskButton');
    const response = await scanTime;
    const sent = response.request().postDataJSON();
    expect(sent.protocol).toMatchObject({ echoSpacingMs: 10, echoOrder: 'linear', partialFourier: 0.625 });
    const under = (await response.json()) as { passes: number; slicesPerTr: number; effectiveTeMs: number };
    await page.waitForFunction(() => !(document.querySelector('#maskButton') as HTMLButtonElement).disabled);
    // By hand (docs/design.md §2.2): ⌊2800 / (8 × 10)⌋ = 35 slices per TR ≥ 28 → 1 pass. R = 2 with 4 ACS rows
    // keeps rows 12…31 at p = 0.625: 10 even rows + ACS rows 15, 17 = 12 lines, 2 shots; rows 12, 14, 15 lie
    // ahead of the centre row 16, so echo ⌊3 / 2⌋ + 1 = 2 acquires it: 20 ms.
    expect(under).toMatchObject({ passes: 1, slicesPerTr: 35, effectiveTeMs: 20 });
    await expectShownEquals('[data-key="time.passes"]', under.passes);
    await expectShownEquals('[data-key="time.slicesPerTr"]', under.slicesPerTr);
    await expectShownEquals('[data-key="time.effectiveTe"]', under.effectiveTeMs);
    expect(await page.isVisible('#timeNote')).toBe(true);
    expect(await page.locator('#timeNote').textContent()).toMatch(
      /^Partial Fourier keeps 12 of the 18 lines .* comes from partial Fourier, not from undersampling\.$/,
    );
    await page.screenshot({ path: join(artifacts, 'planner-timing-1280x800.png') });
    // Back to the preset's protocol for what follows.
    await page.fill('#echoSpacingMs', '');
    await page.fill('#partialFourier', '1');
  });

  it('made no request off the service origin and raised no page errors', () => {
    expect(session.offOrigin).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
