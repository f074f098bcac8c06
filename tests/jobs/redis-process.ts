import { type ChildProcess, spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** A child process and the lines it printed so far (stdout and stderr). */
export interface Child {
  process: ChildProcess;
  lines: string[];
  /** Resolves with the first line matching `pattern` (already printed or still to come). */
  line(pattern: RegExp, timeoutMs?: number): Promise<string>;
  stop(signal?: NodeJS.Signals): Promise<void>;
}

function watch(child: ChildProcess, name: string): Child {
  const lines: string[] = [];
  const waiters: Array<{ pattern: RegExp; resolve: (line: string) => void }> = [];
  const onData = (chunk: Buffer) => {
    for (const line of String(chunk).split('\n')) {
      if (line.length === 0) continue;
      lines.push(line);
      for (const waiter of waiters.filter((w) => w.pattern.test(line))) {
        waiters.splice(waiters.indexOf(waiter), 1);
        waiter.resolve(line);
      }
    }
  };
  child.stdout?.on('data', onData);
  child.stderr?.on('data', onData);
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  return {
    process: child,
    lines,
    line(pattern, timeoutMs = 60_000) {
      const found = lines.find((line) => pattern.test(line));
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const timer = setTimeout(
          () =>
            reject(new Error(`${name} printed no line matching ${pattern}:\n${lines.slice(-20).join('\n')}`)),
          timeoutMs,
        );
        waiters.push({
          pattern,
          resolve: (line) => {
            clearTimeout(timer);
            resolve(line);
          },
        });
      });
    },
    async stop(signal = 'SIGTERM') {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill(signal);
      await exited;
    },
  };
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
    });
  });
}

export interface RedisServer {
  url: string;
  stop(): Promise<void>;
}

/**
 * Debian's redis-server (installed by .ci/run) on a free loopback port, its files in a temporary
 * directory, nothing persisted; stopped and the directory removed by stop().
 */
export async function startRedis(password?: string): Promise<RedisServer> {
  const dir = mkdtempSync(join(tmpdir(), 'kspace-redis-'));
  const port = await freePort();
  const args = [
    '--port',
    String(port),
    '--bind',
    '127.0.0.1',
    '--dir',
    dir,
    '--save',
    '',
    '--appendonly',
    'no',
  ];
  if (password) args.push('--requirepass', password);
  const server = watch(spawn('redis-server', args, { stdio: ['ignore', 'pipe', 'pipe'] }), 'redis-server');
  await server.line(/Ready to accept connections/, 20_000);
  const auth = password ? `:${encodeURIComponent(password)}@` : '';
  return {
    url: `redis://${auth}127.0.0.1:${port}`,
    async stop() {
      await server.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

const repository = new URL('../../', import.meta.url);

/** `npm run worker` (scripts/worker.ts) as its own process, with `env` added to this one's. */
export async function startWorker(env: Record<string, string>): Promise<Child> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], {
    cwd: repository,
    env: { ...process.env, WORKERS: '1', WORKER_LOCK_SECONDS: '2', LOG_LEVEL: 'info', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const worker = watch(child, 'worker');
  await worker.line(/worker ready/);
  return worker;
}
