import { availableParallelism } from 'node:os';
import type { CellWorkerOptions } from '../jobs/cell-worker.ts';
import { ConfigError, integer, queueSettings } from './config.ts';

export { ConfigError };

/** What `npm run worker` reads from its environment (documented in README "Configuration"). */
export function loadWorkerConfig(env: NodeJS.ProcessEnv): Omit<CellWorkerOptions, 'log'> {
  const queue = queueSettings(env);
  if (!queue) throw new ConfigError('QUEUE_URL is needed: the worker takes its cells from that Redis queue');
  const serviceUrl = env.SERVICE_URL?.trim();
  if (serviceUrl) {
    try {
      new URL(serviceUrl);
    } catch {
      throw new ConfigError(`SERVICE_URL must be a URL such as http://planner:8080, got "${serviceUrl}"`);
    }
  }
  const workerKey = env.WORKER_KEY?.trim();
  return {
    queue,
    threads: integer(env, 'WORKERS', availableParallelism(), 1, 256),
    lockSeconds: integer(env, 'WORKER_LOCK_SECONDS', 30, 1, 3600),
    ...(serviceUrl ? { inputs: { serviceUrl, ...(workerKey ? { workerKey } : {}) } } : {}),
  };
}
