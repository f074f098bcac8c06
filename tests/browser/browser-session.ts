import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyInstance } from 'fastify';
import { type BrowserContext, chromium, type Page, type Response } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { buildApp } from '../../src/app.ts';

/** What every browser test shares: Debian's chromium, its flags, the artifacts folder, a listener. */
export const chromiumPath = '/usr/bin/chromium';
export const artifacts = join(dirname(fileURLToPath(import.meta.url)), '..', 'artifacts');

/** Flags that keep chromium from dialling out on a closed network (background services, QUIC, sync). */
export const chromiumArgs = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** Starts a built app on an ephemeral loopback port; returns its origin. */
export async function listen(server: FastifyInstance): Promise<string> {
  await server.listen({ port: 0, host: '127.0.0.1' });
  const address = server.server.address();
  if (address === null || typeof address === 'string') throw new Error('no TCP address');
  return `http://127.0.0.1:${address.port}`;
}

/**
 * A fresh chromium profile at 1280×800 whose requests may reach only `origins` (and blob:/data:);
 * anything else is aborted and recorded in `offOrigin`. Its first page records uncaught errors and
 * console errors in `pageErrors`. `close` also removes the profile.
 */
export async function launchBrowser(
  origins: string[],
  offOrigin: string[],
  pageErrors: string[],
): Promise<{ context: BrowserContext; page: Page; close: () => Promise<void> }> {
  if (!existsSync(chromiumPath)) {
    throw new Error(
      `${chromiumPath} is missing: the browser test needs Debian's chromium (apt-get install chromium)`,
    );
  }
  mkdirSync(artifacts, { recursive: true });
  const userDataDir = mkdtempSync(join(tmpdir(), 'kspace-planner-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: chromiumPath,
    headless: true,
    args: chromiumArgs,
    viewport: { width: 1280, height: 800 },
    acceptDownloads: true,
  });
  await context.route('**/*', (route) => {
    const url = route.request().url();
    if ([...origins, 'blob:', 'data:'].some((origin) => url.startsWith(origin))) return route.continue();
    offOrigin.push(url);
    return route.abort();
  });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (error) => pageErrors.push(String(error)));
  page.on('console', (message) => {
    if (message.type() === 'error') pageErrors.push(message.text());
  });
  return {
    context,
    page,
    close: async () => {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** A running service (and optionally a second one that demands an API key) with one chromium page on it. */
export interface PlannerSession {
  baseUrl: string;
  /** Origin of the service that demands `apiKey`; undefined when none was asked for. */
  keyedUrl: string | undefined;
  context: BrowserContext;
  page: Page;
  /** Requests the page tried to send off the services' origins (aborted). */
  offOrigin: string[];
  /** Uncaught errors and console errors of the page. */
  pageErrors: string[];
  /**
   * Loads `address` (a path on the main service, or a whole URL) in `on` (the session's page unless
   * given) and waits until the planner page says it is ready (its data-ready mark).
   */
  open: (address: string, on?: Page) => Promise<void>;
  /** The next response of the service to `method path` (and, when given, to a request accepting `accept`). */
  waitForApi: (path: string, method?: string, accept?: string) => Promise<Response>;
  /** Clicks `button` and answers the service's response to `method path` (see `waitForApi`) that follows. */
  clickForApi: (button: string, path: string, method?: string, accept?: string) => Promise<Response>;
  /** Fills the single-run sampling controls of `on` (the session's page unless given). */
  fillSampling: (controls: SamplingControls, on?: Page) => Promise<void>;
  /** Fills the plan controls of `on` (the session's page unless given). */
  fillPlan: (controls: PlanControls, on?: Page) => Promise<void>;
  /**
   * Waits until `on` (the session's page unless given) re-enables "Run plan": the plan ended (done,
   * failed or cancelled) or was refused. `timeoutMs` as playwright's (its default when undefined).
   */
  planEnded: (timeoutMs?: number, on?: Page) => Promise<void>;
  /** Closes the browser and the services and removes their data folders. */
  close: () => Promise<void>;
}

export interface PlannerSessionOptions {
  /** Start of the temporary data folders' names. */
  prefix: string;
  /** Worker threads of the main service (the app's default when undefined). */
  workers?: number;
  /** Also start a service that demands this API key, with one worker. */
  apiKey?: string;
}

/**
 * The one session a test file runs on: opened before its tests (then handed to `onOpen`, which keeps
 * what the file uses), closed after them. `timeoutMs` bounds the opening (vitest's hook default else).
 */
export function usePlannerSession(
  options: PlannerSessionOptions,
  onOpen: (session: PlannerSession) => void,
  timeoutMs?: number,
): void {
  let session: PlannerSession | undefined;
  beforeAll(async () => {
    session = await openPlannerSession(options);
    onOpen(session);
  }, timeoutMs);
  afterAll(() => session?.close());
}

/** Builds the service on a fresh data folder, listens on loopback, and opens chromium limited to it. */
export async function openPlannerSession(options: PlannerSessionOptions): Promise<PlannerSession> {
  const apps: FastifyInstance[] = [];
  const dataDirs: string[] = [];
  const closeServices = async (): Promise<void> => {
    for (const app of apps) await app.close();
    for (const dataDir of dataDirs) rmSync(dataDir, { recursive: true, force: true });
  };
  const start = async (suffix: string, config: { workers?: number; apiKeys?: string[] }): Promise<string> => {
    const dataDir = mkdtempSync(join(tmpdir(), `${options.prefix}${suffix}`));
    dataDirs.push(dataDir);
    const app = await buildApp({ dataDir, ...config });
    apps.push(app);
    return listen(app);
  };
  const offOrigin: string[] = [];
  const pageErrors: string[] = [];
  try {
    const baseUrl = await start('', options.workers === undefined ? {} : { workers: options.workers });
    const keyedUrl =
      options.apiKey === undefined
        ? undefined
        : await start('keyed-', { apiKeys: [options.apiKey], workers: 1 });
    // Nothing leaves the services' origins: no CDN, no fonts, no telemetry.
    const origins = keyedUrl === undefined ? [baseUrl] : [baseUrl, keyedUrl];
    const browser = await launchBrowser(origins, offOrigin, pageErrors);
    return {
      baseUrl,
      keyedUrl,
      context: browser.context,
      page: browser.page,
      offOrigin,
      pageErrors,
      open: async (address, on = browser.page) => {
        await on.goto(new URL(address, baseUrl).href);
        await on.waitForSelector('body[data-ready="true"]');
      },
      waitForApi: (path, method, accept) => waitForApi(browser.page, path, method, accept),
      clickForApi: async (button, path, method, accept) => {
        const answer = waitForApi(browser.page, path, method, accept);
        await browser.page.click(button);
        return answer;
      },
      fillSampling: (controls, on = browser.page) => fillSampling(on, controls),
      fillPlan: (controls, on = browser.page) => fillPlan(on, controls),
      planEnded: (timeoutMs, on = browser.page) => planEnded(on, timeoutMs),
      close: async () => {
        await browser.close();
        await closeServices();
      },
    };
  } catch (error) {
    // A session that failed to open leaves no service listening and no data folder behind.
    await closeServices();
    throw error;
  }
}

function waitForApi(page: Page, path: string, method = 'POST', accept?: string): Promise<Response> {
  return page.waitForResponse((r) => {
    const request = r.request();
    if (request.method() !== method || new URL(r.url()).pathname !== path) return false;
    return accept === undefined || (request.headers().accept ?? '').includes(accept);
  });
}

/** RGBA bytes of an <img> as decoded at its natural size, row by row. */
export async function decodedImage(
  page: Page,
  selector: string,
): Promise<{ width: number; height: number; rgba: number[] }> {
  return page.$eval(selector, (img) => {
    const image = img as HTMLImageElement;
    const canvas = document.createElement('canvas');
    canvas.width = image.naturalWidth;
    canvas.height = image.naturalHeight;
    const context = canvas.getContext('2d')!;
    context.drawImage(image, 0, 0);
    const rgba = Array.from(context.getImageData(0, 0, canvas.width, canvas.height).data);
    return { width: canvas.width, height: canvas.height, rgba };
  });
}

/** The single-run sampling controls: matrix nx × ny, the pattern (left as it is when undefined), R and ACS. */
export interface SamplingControls {
  nx: number;
  ny: number;
  pattern?: string;
  acceleration: number;
  acs: number;
}

async function fillSampling(page: Page, controls: SamplingControls): Promise<void> {
  await page.fill('#nx', String(controls.nx));
  await page.fill('#ny', String(controls.ny));
  if (controls.pattern !== undefined) await page.selectOption('#pattern', controls.pattern);
  await page.fill('#acceleration', String(controls.acceleration));
  await page.fill('#acs', String(controls.acs));
}

/** Ticks exactly `values` in one of the plan's checkbox groups. */
async function tickOnly(page: Page, group: 'planPattern' | 'planMethod', values: string[]): Promise<void> {
  for (const box of await page.$$(`input[name="${group}"]`)) await box.setChecked(false);
  for (const value of values) await page.check(`input[name="${group}"][value="${value}"]`);
}

/** The plan controls: accelerations (as typed, e.g. "2, 4"), seeds, and the patterns and methods ticked. */
export interface PlanControls {
  accelerations: string;
  seeds: number;
  patterns: string[];
  methods: string[];
}

async function planEnded(page: Page, timeoutMs: number | undefined): Promise<void> {
  await page.waitForFunction(
    () => !(document.querySelector('#planButton') as HTMLButtonElement).disabled,
    undefined,
    timeoutMs === undefined ? {} : { timeout: timeoutMs },
  );
}

async function fillPlan(page: Page, controls: PlanControls): Promise<void> {
  await page.fill('#planAccelerations', controls.accelerations);
  await page.fill('#planSeeds', String(controls.seeds));
  await tickOnly(page, 'planPattern', controls.patterns);
  await tickOnly(page, 'planMethod', controls.methods);
}
