import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { smallPlanBody } from '../plan/small-plan.ts';
import { VOLUME_FIXTURE, volumePlanBody } from '../volume/fixture.ts';
import { artifacts, type PlannerSession, usePlannerSession } from './browser-session.ts';
import { expectNoSidewaysScroll } from './page-layout.ts';

/**
 * Stored plans, addresses and downloads on the planner page, in Debian's chromium against the real
 * service: a plan reopened from `/?plan=ID`, the paged and filtered plan list, a table row opened to
 * its seed-1 images, the download links answered with the right content type, the zero-filled
 * scores beside the reconstruction's, and a setup restored from its address. Every value the page
 * shows is compared with the service's own answer (data-value holds the exact number).
 */

let session: PlannerSession;
let baseUrl: string;
let keyedUrl: string;
let context: BrowserContext;
let page: Page;
const apiKey = 'plans-page-key-41c2';

/** 32×32 phantom, random lines at R 2 and 4, zero-filled and CS-TV (10 iterations), one seed. */
const smallPlan = smallPlanBody({
  patterns: [{ pattern: 'cartesian-random', acs: 4 }],
  accelerations: [2, 4],
  methods: [{ name: 'zero-filled' }, { name: 'cs-tv', iterations: 10 }],
  seeds: 1,
  target: { metric: 'ssim', atLeast: 0.5 },
});

/** Two cells: the reference and one uniform R 2 zero-filled row. */
const tinyPlan = {
  ...smallPlan,
  patterns: [{ pattern: 'cartesian-uniform', acs: 0 }],
  accelerations: [2],
  methods: [{ name: 'zero-filled' }],
};

type PlanRow = {
  key: string;
  seeds: number;
  resultId?: string;
  images?: Record<string, string>;
  metrics: Record<string, { mean: number | null }>;
};
type PlanStatus = { id: string; status: string; table?: { rows: PlanRow[] } };

async function apiOn(origin: string, path: string, init: RequestInit = {}, key?: string) {
  const headers = { ...(init.headers as Record<string, string>), ...(key ? { 'x-api-key': key } : {}) };
  const response = await fetch(`${origin}${path}`, { ...init, headers });
  expect(response.ok, `${init.method ?? 'GET'} ${path} → ${response.status}`).toBe(true);
  return response;
}

/** Submits a plan through the API and waits until it is done; returns its final status. */
async function planDone(body: unknown, origin = baseUrl, key?: string): Promise<PlanStatus> {
  const init = {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  };
  const { id } = (await (await apiOn(origin, '/v1/plans', init, key)).json()) as { id: string };
  for (let i = 0; i < 1200; i++) {
    const plan = (await (await apiOn(origin, `/v1/plans/${id}`, {}, key)).json()) as PlanStatus;
    if (plan.status === 'done') return plan;
    expect(['queued', 'running']).toContain(plan.status);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`plan ${id} did not finish`);
}

/**
 * What a download link gives: the content type and bytes. A link to the service is fetched by the
 * page (the service's content-type header); a blob link (made with an API key, or from bytes the page
 * holds) is clicked and the saved file read, its type being the `type` hint the page copied from the
 * service's answer (the page's CSP allows no fetch of blob: URLs).
 */
async function fetchLink(selector: string, on: Page = page): Promise<{ type: string; bytes: Buffer }> {
  const href = await on.getAttribute(selector, 'href');
  expect(href, `${selector} has an href`).toBeTruthy();
  expect(href).not.toBe('#');
  if (href!.startsWith('blob:')) {
    const [download] = await Promise.all([on.waitForEvent('download'), on.click(selector)]);
    const bytes = readFileSync((await download.path())!);
    return { type: (await on.getAttribute(selector, 'type')) ?? '', bytes };
  }
  const got = await on.evaluate(async (url) => {
    const response = await fetch(url);
    return {
      type: response.headers.get('content-type') ?? '',
      bytes: Array.from(new Uint8Array(await response.arrayBuffer())),
    };
  }, href!);
  return { type: got.type, bytes: Buffer.from(got.bytes) };
}

/** The PNG signature (ISO/IEC 15948 §5.2). */
const pngSignature = Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]);

/** Each of the download links (element ids) gives a PNG: its content type and its signature. */
async function expectPngDownloads(linkIds: string[], on: Page = page): Promise<void> {
  for (const link of linkIds) {
    const got = await fetchLink(`#${link}`, on);
    expect(got.type, link).toBe('image/png');
    expect(got.bytes.subarray(0, 8).equals(pngSignature), link).toBe(true);
  }
}

async function planShownDone(on: Page = page): Promise<void> {
  await on.waitForFunction(
    () => /done\.$/.test(document.querySelector('#planStatus')?.textContent ?? ''),
    undefined,
    {
      timeout: 30_000,
    },
  );
}

usePlannerSession(
  { prefix: 'kspace-plans-page-', workers: 2, apiKey },
  (opened) => {
    session = opened;
    ({ baseUrl, context, page } = opened);
    keyedUrl = opened.keyedUrl!;
  },
  60_000,
);

describe('stored plans, addresses and downloads in Chromium', () => {
  let plan: PlanStatus;

  it('reopens a plan from /?plan=ID, lists it, and serves its CSV as text/csv', async () => {
    plan = await planDone(smallPlan);
    await session.open(`/?plan=${plan.id}`);
    await planShownDone();
    const rows = plan.table!.rows;
    expect(await page.locator('#planTable tbody tr[data-row]').count()).toBe(rows.length);
    expect(
      await page.$$eval('#planTable tbody tr[data-row]', (trs) =>
        trs.map((tr) => (tr as HTMLElement).dataset.row),
      ),
    ).toEqual(rows.map((r) => r.key));
    // The plan list (GET /v1/plans) shows it, with the service's label and status.
    const listed = (await (await apiOn(baseUrl, '/v1/plans')).json()) as {
      items: Array<{ id: string; label: string; status: string }>;
    };
    const item = page.locator(`#planListItems li[data-plan="${plan.id}"]`);
    await item.waitFor();
    expect(await item.getAttribute('data-status')).toBe('done');
    expect(await item.locator('.plan-label').textContent()).toBe(
      listed.items.find((i) => i.id === plan.id)!.label,
    );
    // The CSV link answers the service's CSV with its media type (RFC 4180 registers text/csv).
    const csv = await fetchLink('#csvLink');
    expect(csv.type).toMatch(/^text\/csv/);
    const fromApi = await (await apiOn(baseUrl, `/v1/plans/${plan.id}/table.csv`)).text();
    expect(csv.bytes.toString('utf8')).toBe(fromApi);
    await page.screenshot({ path: join(artifacts, 'plans-reopened-1280x800.png'), fullPage: true });
  });

  it('opens a row to its seed-1 images, with PNG links and the stored scores', async () => {
    const row = plan.table!.rows.find((r) => r.key !== 'reference' && r.resultId)!;
    expect(row, 'a non-reference row with a stored result').toBeDefined();
    await page.click(`#planTable button[data-open-row="${row.key}"]`);
    await page.waitForFunction(() => !(document.querySelector('#rowImgErrorMap') as HTMLImageElement).hidden);
    expect(await page.getAttribute('#rowImages', 'data-row')).toBe(row.key);
    for (const id of ['rowImgReconstruction', 'rowImgErrorMap', 'rowImgZeroFilled', 'rowImgMask']) {
      expect(await page.$eval(`#${id}`, (img) => (img as HTMLImageElement).naturalWidth), id).toBe(32);
    }
    // The stored result is the row's seed-1 cell: with one seed its scores are the row's means.
    const stored = (await (await apiOn(baseUrl, `/v1/reconstructions/${row.resultId}`)).json()) as {
      metrics: Record<string, number>;
    };
    for (const name of ['nrmse', 'ssim', 'hfen', 'psnr']) {
      expect(stored.metrics[name], name).toBe(row.metrics[name].mean);
      expect(Number(await page.getAttribute(`[data-key="row.${name}"]`, 'data-value'))).toBe(
        stored.metrics[name],
      );
    }
    await expectPngDownloads([
      'rowDownloadReconstruction',
      'rowDownloadErrorMap',
      'rowDownloadZeroFilled',
      'rowDownloadMask',
    ]);
    await page.locator('#rowImages').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'plans-row-images-1280x800.png') });
  });

  it('pages the plan list with its cursor and filters it by status', async () => {
    // Ten more plans: eleven stored, so a page of ten leaves one for the older page.
    const ids = [plan.id];
    for (let i = 0; i < 10; i++) ids.push((await planDone({ ...tinyPlan, seeds: 1 + (i % 2) })).id);
    await page.click('#planListRefresh');
    await page.waitForFunction(() => document.querySelectorAll('#planListItems li').length === 10);
    const first = await page.$$eval('#planListItems li', (lis) =>
      lis.map((li) => (li as HTMLElement).dataset.plan),
    );
    expect(first).toEqual(ids.slice(1).reverse()); // newest first
    expect(await page.isDisabled('#planListOlder')).toBe(false);
    await page.click('#planListOlder');
    await page.waitForFunction(() => document.querySelectorAll('#planListItems li').length === 1);
    expect(await page.getAttribute('#planListItems li', 'data-plan')).toBe(plan.id);
    expect(await page.isDisabled('#planListOlder')).toBe(true);
    await page.click('#planListNewer');
    await page.waitForFunction(() => document.querySelectorAll('#planListItems li').length === 10);
    // Status filter: every plan is done; none failed.
    await page.selectOption('#planListStatus', 'failed');
    await page.waitForFunction(() => document.querySelectorAll('#planListItems li').length === 0);
    expect(await page.locator('#planListStatusLine').textContent()).toBe('No failed plans stored.');
    await page.selectOption('#planListStatus', 'done');
    await page.waitForFunction(() => document.querySelectorAll('#planListItems li').length === 10);
    // Open from the list: the address names the plan, so a reload reopens it.
    await page.click(`#planListItems li[data-plan="${ids[3]}"] button`);
    await page.waitForFunction((id) => new URL(location.href).searchParams.get('plan') === id, ids[3]);
    await planShownDone();
    expect(await page.locator('#planTable tbody tr[data-row]').count()).toBe(2);
    await page.reload();
    await page.waitForSelector('body[data-ready="true"]');
    await planShownDone();
    expect(await page.locator('#planStatus').textContent()).toContain(ids[3]);
    await page.screenshot({ path: join(artifacts, 'plans-list-1280x800.png'), fullPage: true });
  }, 120_000);

  it('restores the setup from its address and keeps the address in step with the form', async () => {
    const query =
      'source=phantom&phantom=shepp-logan&phantomKspace=raster&nx=48&ny=40&pattern=poisson-disc&acceleration=3' +
      '&acs=10&densityPower=1.5&seed=11&method=lowrank-hankel&kernel=5&weighting=none&iterations=12&noise=on' +
      '&snr=25&preset=custom&dimensions=3d&trMs=9&averages=2&echoTrainLength=1&partialFourier=0.875';
    await session.open(`/?${query}`);
    const values = await page.evaluate(() =>
      Object.fromEntries(
        Array.from(document.querySelectorAll('#setup input, #setup select')).map((el) => {
          const c = el as HTMLInputElement;
          return [c.id || c.name, c.type === 'checkbox' || c.type === 'radio' ? String(c.checked) : c.value];
        }),
      ),
    );
    expect(values).toMatchObject({
      phantom: 'shepp-logan',
      phantomKspace: 'raster',
      nx: '48',
      ny: '40',
      pattern: 'poisson-disc',
      acceleration: '3',
      acs: '10',
      densityPower: '1.5',
      seed: '11',
      method: 'lowrank-hankel',
      kernel: '5',
      weighting: 'none',
      iterations: '12',
      noiseOn: 'true',
      snr: '25',
      preset: 'custom',
      dimensions: '3d',
      trMs: '9',
      averages: '2',
      partialFourier: '0.875',
    });
    expect(await page.isEnabled('#snr')).toBe(true);
    expect(await page.isVisible('#kernel')).toBe(true); // the method's own fields show
    expect(await page.locator('label[for="nx"] span:not([hidden])').textContent()).toContain('Partitions');
    // What the page sends is the restored setup.
    const masks = page.waitForResponse((r) => new URL(r.url()).pathname === '/v1/masks');
    await page.click('#maskButton');
    const sent = (await masks).request().postDataJSON();
    // The protocol's partial Fourier 0.875 belongs to the sampling (docs/design.md §4.3): it is sent there.
    expect(sent).toEqual({
      matrix: { nx: 48, ny: 40 },
      sampling: {
        pattern: 'poisson-disc',
        acceleration: 3,
        acs: 10,
        density: { power: 1.5 },
        seed: 11,
        partialFourier: 0.875,
      },
    });
    // An edit goes into the address; loading that address gives the same form.
    await page.fill('#nx', '56');
    await page.locator('#nx').dispatchEvent('change');
    await page.waitForFunction(() => new URL(location.href).searchParams.get('nx') === '56');
    const address = page.url();
    const acsAfterEdit = await page.inputValue('#acs');
    await session.open(new URL(address).pathname + new URL(address).search);
    expect(await page.inputValue('#nx')).toBe('56');
    expect(await page.inputValue('#acs')).toBe(acsAfterEdit);
    expect(await page.isChecked('#noiseOn')).toBe(true);
    await page.screenshot({ path: join(artifacts, 'plans-setup-restored-1280x800.png') });
  });

  it('shows the zero-filled scores beside the reconstruction’s and serves every image and the mask as PNG', async () => {
    const query =
      'source=phantom&phantom=shepp-logan-modified&nx=32&ny=32&pattern=cartesian-random&acceleration=3&acs=4' +
      '&densityPower=2&seed=5&method=cs-tv&iterations=15&noise=off&preset=0';
    await session.open(`/?${query}`);
    const answered = page.waitForResponse((r) => new URL(r.url()).pathname === '/v1/reconstructions');
    await page.click('#reconButton');
    const outcome = (await (await answered).json()) as {
      id: string;
      metrics: Record<string, number>;
      zeroFilledMetrics: Record<string, number>;
    };
    await page.waitForFunction(() => !(document.querySelector('#singleDownloads') as HTMLElement).hidden);
    // The zero-filled method's own scores for the same acquisition are the zero-filled column.
    const body = {
      source: { phantom: 'shepp-logan-modified', kspace: 'analytic' },
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-random', acceleration: 3, acs: 4, density: { power: 2 }, seed: 5 },
      method: { name: 'zero-filled' },
    };
    const zeroFilled = (await (
      await apiOn(baseUrl, '/v1/reconstructions', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify(body),
      })
    ).json()) as { metrics: Record<string, number> };
    for (const name of ['nrmse', 'psnr', 'ssim', 'hfen']) {
      expect(outcome.zeroFilledMetrics[name], name).toBe(zeroFilled.metrics[name]);
      const cell = page.locator(`[data-key="zeroFilled.${name}"]`);
      expect(await cell.isVisible()).toBe(true);
      expect(Number(await cell.getAttribute('data-value'))).toBe(outcome.zeroFilledMetrics[name]);
      expect(Number(await page.getAttribute(`[data-key="recon.${name}"]`, 'data-value'))).toBe(
        outcome.metrics[name],
      );
    }
    // CS-TV on 3× random lines beats zero-filling on NRMSE here (measured: see the report's numbers).
    expect(outcome.metrics.nrmse).toBeLessThan(outcome.zeroFilledMetrics.nrmse);
    await expectPngDownloads([
      'downloadReconstruction',
      'downloadZeroFilled',
      'downloadReference',
      'downloadErrorMap',
    ]);
    // The mask link holds what POST /v1/masks answers with Accept: image/png, byte for byte.
    const maskLink = await fetchLink('#downloadMask');
    expect(maskLink.type).toBe('image/png');
    const maskPng = Buffer.from(
      await (
        await apiOn(baseUrl, '/v1/masks', {
          method: 'POST',
          headers: { 'content-type': 'application/json', accept: 'image/png' },
          body: JSON.stringify({ matrix: body.matrix, sampling: body.sampling }),
        })
      ).arrayBuffer(),
    );
    expect(maskLink.bytes.equals(maskPng)).toBe(true);
    const meta = await sharp(maskPng).metadata();
    expect([meta.width, meta.height]).toEqual([32, 32]);
    // Full precision: a 16-bit PNG of the reconstruction, and every image as a float32 NIfTI-1
    // (sizeof_hdr 348, datatype 16 = float32: nifti1.h).
    const deep = await fetchLink('#downloadReconstruction16');
    expect(deep.type).toBe('image/png');
    expect((await sharp(deep.bytes).metadata()).depth).toBe('ushort');
    const nifti = await fetchLink('#downloadImagesNifti');
    expect(nifti.type).toBe('application/octet-stream');
    expect(nifti.bytes.readInt32LE(0)).toBe(348);
    expect(nifti.bytes.readInt16LE(70)).toBe(16);
    // The acquired k-space: complex64 NIfTI-1 (datatype 32, nifti1.h), 32×32 grid, one coil, and its header.
    const acquisition = await fetchLink('#downloadAcquisitionNifti');
    expect(acquisition.bytes.readInt16LE(70)).toBe(32);
    expect([1, 2, 3, 4].map((i) => acquisition.bytes.readInt16LE(40 + 2 * i))).toEqual([32, 32, 1, 1]);
    const acquisitionHeader = JSON.parse(
      (await fetchLink('#downloadAcquisitionJson')).bytes.toString('utf8'),
    );
    expect(acquisitionHeader).toMatchObject({ resultId: outcome.id, geometry: 'cartesian', coils: 1 });
    // The mask's sample table: RFC 4180 CSV with the Cartesian header.
    const table = await fetchLink('#downloadMaskTable');
    expect(table.type).toMatch(/^text\/csv/);
    expect(table.bytes.toString('utf8').split('\r\n')[0]).toBe('order,ky,kx');
    await page.locator('#reconNumbers').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'plans-zero-filled-scores-1280x800.png') });
  });

  it('fits 420 px: list, row images and downloads without sideways scrolling', async () => {
    await session.open(`/?plan=${plan.id}`);
    await planShownDone();
    await page.setViewportSize({ width: 420, height: 900 });
    const row = plan.table!.rows.find((r) => r.key !== 'reference' && r.resultId)!;
    await page.click(`#planTable button[data-open-row="${row.key}"]`);
    await page.waitForFunction(
      () => !(document.querySelector('#rowImgReconstruction') as HTMLImageElement).hidden,
    );
    await expectNoSidewaysScroll(page);
    await page.locator('#rowImages').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'plans-row-images-420.png') });
    await page.locator('#plans').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'plans-list-420.png') });
    await page.setViewportSize({ width: 1280, height: 800 });
  });

  it('on a server with API keys: reopens the addressed plan once the key is given, and downloads carry it', async () => {
    const keyedPlan = await planDone(tinyPlan, keyedUrl, apiKey);
    const keyed = await context.newPage();
    const errors: string[] = [];
    keyed.on('pageerror', (error) => errors.push(String(error)));
    await session.open(`${keyedUrl}/?plan=${keyedPlan.id}`, keyed);
    // Refused without the key: nothing shown, and the page says where to enter one.
    expect(await keyed.locator('#planListStatusLine').textContent()).toContain('Service access');
    await keyed.click('.access summary');
    await keyed.fill('#apiKey', apiKey);
    await keyed.press('#apiKey', 'Enter');
    await planShownDone(keyed);
    await keyed.locator(`#planListItems li[data-plan="${keyedPlan.id}"]`).waitFor();
    // Links cannot send a header: the page fetched each file with the key and links a blob of it.
    const csvHref = (await keyed.getAttribute('#csvLink', 'href')) ?? '';
    expect(csvHref.startsWith('blob:')).toBe(true);
    expect((await fetchLink('#csvLink', keyed)).type).toMatch(/^text\/csv/);
    await keyed.click('#planTable button[data-open-row="p0-r0-m0"]');
    await keyed.waitForFunction(
      () => !(document.querySelector('#rowImgErrorMap') as HTMLImageElement).hidden,
    );
    await expectPngDownloads(['rowDownloadErrorMap'], keyed);
    expect(errors).toEqual([]);
    await keyed.close();
  });

  it('a volume plan shows an Acquisition column (3d, multi-slice); a 2D plan has none', async () => {
    const columnTexts = () =>
      page.$$eval('#planTable thead th', (ths) => ths.map((th) => th.textContent?.trim() ?? ''));
    await session.open(`/?plan=${plan.id}`);
    await planShownDone();
    expect(await columnTexts()).not.toContain('Acquisition');
    // The 32³ mricron-data volume of tests/volume/fixture.ts, planned 3D against multi-slice.
    const form = new FormData();
    form.append('file', new Blob([readFileSync(VOLUME_FIXTURE)]), 'brain.nii.gz');
    const upload = await apiOn(baseUrl, '/v1/images?slices=all', { method: 'POST', body: form });
    const volumePlan = await planDone(volumePlanBody(((await upload.json()) as { id: string }).id));
    await session.open(`/?plan=${volumePlan.id}`);
    await planShownDone();
    const column = (await columnTexts()).indexOf('Acquisition');
    expect(column).toBeGreaterThan(-1);
    const shown = await page.$$eval(
      '#planTable tbody tr[data-row]',
      (trs, at) => trs.map((tr) => tr.children[at].textContent),
      column,
    );
    const rows = volumePlan.table!.rows as Array<PlanRow & { acquisition?: string }>;
    expect(shown).toEqual(rows.map((r) => r.acquisition));
    expect(shown).toEqual(['3d', '3d', 'multi-slice']);
  });

  it('made no request off the service origin and raised no page errors', () => {
    expect(session.offOrigin).toEqual([]);
    expect(session.pageErrors).toEqual([]);
  });
});
