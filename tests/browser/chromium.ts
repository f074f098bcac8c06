import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyInstance } from 'fastify';
import { type BrowserContext, chromium } from 'playwright-core';

/** Debian's chromium, which the browser tests drive through playwright-core (never a downloaded browser). */
export const chromiumPath = '/usr/bin/chromium';
/** Screenshots land here (git-ignored). */
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

/** Fails (never skips) without Debian's chromium; makes the screenshot folder. */
export function requireChromium(): void {
  if (!existsSync(chromiumPath)) {
    throw new Error(
      `${chromiumPath} is missing: the browser test needs Debian's chromium (apt-get install chromium)`,
    );
  }
  mkdirSync(artifacts, { recursive: true });
}

/** Starts a service on an ephemeral loopback port and returns its base URL. */
export async function listen(server: FastifyInstance): Promise<string> {
  await server.listen({ port: 0, host: '127.0.0.1' });
  const address = server.server.address();
  if (address === null || typeof address === 'string') throw new Error('no TCP address');
  return `http://127.0.0.1:${address.port}`;
}

/** A fresh chromium profile at 1280×800 with the quiet flags above. */
export function launchChromium(userDataDir: string, acceptDownloads = false): Promise<BrowserContext> {
  return chromium.launchPersistentContext(userDataDir, {
    executablePath: chromiumPath,
    headless: true,
    args: chromiumArgs,
    viewport: { width: 1280, height: 800 },
    acceptDownloads,
  });
}
