import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyInstance } from 'fastify';
import { type BrowserContext, chromium, type Page } from 'playwright-core';

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
