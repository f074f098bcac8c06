import { type ChildProcess, spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

// Source: the configuration contract of docs/design.md §4.6 and the README (PORT, HOST, API_KEYS; a
// non-loopback HOST needs keys).

const root = fileURLToPath(new URL('../..', import.meta.url));
const tsx = join(root, 'node_modules', '.bin', 'tsx');

function start(env: Record<string, string>): { child: ChildProcess; output: () => string } {
  let output = '';
  // The same entry point as `npm start` (tsx src/main.ts), on an ephemeral port.
  const child = spawn(tsx, ['src/main.ts'], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (chunk) => {
    output += String(chunk);
  });
  child.stderr!.on('data', (chunk) => {
    output += String(chunk);
  });
  return { child, output: () => output };
}

async function until<T>(probe: () => T | undefined, what: string): Promise<T> {
  for (let i = 0; i < 600; i++) {
    const value = probe();
    if (value !== undefined) return value;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`timed out waiting for ${what}`);
}

describe('src/main.ts (what npm start runs)', () => {
  it('serves on the configured port; worker threads load the TypeScript engines (POST /v1/masks runs on one)', async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'kspace-main-'));
    const { child, output } = start({
      PORT: '0',
      HOST: '127.0.0.1',
      DATA_DIR: dataDir,
      WORKERS: '1',
      LOG_LEVEL: 'info',
    });
    try {
      const url = await until(
        () => /Server listening at (http:\/\/127\.0\.0\.1:\d+)/.exec(output())?.[1],
        'listening',
      );
      expect((await (await fetch(`${url}/health`)).json()).status).toBe('ok');
      const res = await fetch(`${url}/v1/masks`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({
          matrix: { nx: 32, ny: 32 },
          sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
        }),
      });
      expect(res.status).toBe(200);
      expect(((await res.json()) as { acquired: { count: number } }).acquired.count).toBe(16); // 32 lines / R 2
    } finally {
      const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
      child.kill('SIGTERM');
      expect(await exited).toBe(0);
    }
  });

  it('refuses to start on a non-loopback HOST without API_KEYS (exit code 2, message names API_KEYS)', async () => {
    const { child, output } = start({
      PORT: '0',
      HOST: '0.0.0.0',
      API_KEYS: '',
      DATA_DIR: mkdtempSync(join(tmpdir(), 'kspace-main-')),
    });
    const code = await new Promise<number | null>((resolve) => child.once('exit', (c) => resolve(c)));
    expect(code).toBe(2);
    expect(output()).toMatch(/API_KEYS/);
  });
});
