import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import { defaultLimits, type Limits, MAX_KSPACE_POINTS_CEILING } from '../core/limits.ts';
import type { QueueSettings } from '../jobs/queue-connection.ts';

/** Everything the service reads from its environment, with safe defaults. */
export interface ServiceConfig {
  port: number;
  host: string;
  dataDir: string;
  /** Empty: no key needed (only allowed on a loopback host). */
  apiKeys: string[];
  limits: Limits;
  /** Worker threads for plan cells and long single computations. */
  workers: number;
  /** Plans queued or running at once before POST /v1/plans answers 429. */
  maxQueuedPlans: number;
  /** Request-driven worker tasks (uploads, masks, reconstructions…) in flight before 429. */
  maxRequestTasks: number;
  /** Largest JSON request body in bytes (a custom mask PNG travels base64 inside JSON). */
  maxJsonBytes: number;
  logLevel: string;
  /** Retention: age and total-size limits (0 disables each) and how often the cleanup runs. */
  retention: { maxAgeHours: number; maxBytes: number; intervalMs: number };
  /** Each API key sees and deletes only what it created. */
  tenantIsolation: boolean;
  /** QUEUE_URL set: plan cells go to that Redis queue for `npm run worker` processes. */
  queue?: QueueSettings & { planConcurrency: number };
  /** WORKER_KEY: the worker processes' key for the uploads their cells name. */
  workerKey?: string;
}

export class ConfigError extends Error {
  override readonly name = 'ConfigError';
}

const loopbackHosts = new Set(['127.0.0.1', '::1', 'localhost', '::ffff:127.0.0.1']);

/** True for addresses that only this machine can reach (127.0.0.0/8, ::1, localhost). */
export function isLoopbackHost(host: string): boolean {
  return loopbackHosts.has(host) || /^127\.\d+\.\d+\.\d+$/.test(host);
}

export function integer(
  env: NodeJS.ProcessEnv,
  name: string,
  fallback: number,
  min: number,
  max: number,
): number {
  const raw = env[name];
  if (raw === undefined || raw.trim() === '') return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new ConfigError(`${name} must be an integer in [${min}, ${max}], got "${raw}"`);
  }
  return value;
}

function flag(env: NodeJS.ProcessEnv, name: string): boolean {
  const raw = env[name]?.trim().toLowerCase();
  if (raw === undefined || raw === '' || raw === 'false' || raw === '0') return false;
  if (raw === 'true' || raw === '1') return true;
  throw new ConfigError(`${name} must be true or false, got "${env[name]}"`);
}

/** QUEUE_URL (redis:// or rediss://, password in the URL) and QUEUE_TLS_CA_FILE; undefined when unset. */
export function queueSettings(env: NodeJS.ProcessEnv): QueueSettings | undefined {
  const raw = env.QUEUE_URL?.trim();
  if (!raw) return undefined;
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    throw new ConfigError('QUEUE_URL must be a URL such as redis://:password@host:6379');
  }
  if (url.protocol !== 'redis:' && url.protocol !== 'rediss:') {
    throw new ConfigError(`QUEUE_URL must start with redis:// or rediss:// (TLS), got ${url.protocol}//`);
  }
  const tlsCaFile = env.QUEUE_TLS_CA_FILE?.trim();
  if (tlsCaFile && url.protocol !== 'rediss:') {
    throw new ConfigError('QUEUE_TLS_CA_FILE needs a rediss:// QUEUE_URL');
  }
  return { url: raw, ...(tlsCaFile ? { tlsCaFile } : {}) };
}

/** Reads the configuration from environment variables (documented in README.md). */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): ServiceConfig {
  const host = env.HOST?.trim() || '127.0.0.1';
  const apiKeys = (env.API_KEYS ?? '')
    .split(',')
    .map((key) => key.trim())
    .filter((key) => key.length > 0);
  if (!isLoopbackHost(host) && apiKeys.length === 0) {
    throw new ConfigError(
      `HOST=${host} is reachable from other machines: set API_KEYS (comma-separated) so every /v1 request needs a key`,
    );
  }
  const tenantIsolation = flag(env, 'TENANT_ISOLATION');
  if (tenantIsolation && apiKeys.length === 0) {
    throw new ConfigError('TENANT_ISOLATION=true needs API_KEYS: each key is a tenant');
  }
  const workers = integer(env, 'WORKERS', availableParallelism(), 1, 256);
  const queue = queueSettings(env);
  const workerKey = env.WORKER_KEY?.trim() || undefined;
  if (workerKey && apiKeys.includes(workerKey)) {
    throw new ConfigError('WORKER_KEY must differ from every API key: it reads uploads across tenants');
  }
  return {
    port: integer(env, 'PORT', 8080, 0, 65535),
    host,
    dataDir: resolve(env.DATA_DIR?.trim() || './data'),
    apiKeys,
    limits: {
      maxMatrixSide: integer(env, 'MAX_MATRIX_SIDE', defaultLimits.maxMatrixSide, 8, 8192),
      maxIterations: integer(env, 'MAX_ITERATIONS', defaultLimits.maxIterations, 1, 100_000),
      maxPlanCells: integer(env, 'MAX_PLAN_CELLS', defaultLimits.maxPlanCells, 1, 1_000_000),
      maxUploadBytes: integer(env, 'MAX_UPLOAD_BYTES', defaultLimits.maxUploadBytes, 1024, 2 ** 31),
      maxKspacePoints: integer(
        env,
        'MAX_KSPACE_POINTS',
        defaultLimits.maxKspacePoints,
        1,
        MAX_KSPACE_POINTS_CEILING,
      ),
    },
    workers,
    maxQueuedPlans: integer(env, 'MAX_QUEUED_PLANS', 16, 1, 10_000),
    maxRequestTasks: integer(env, 'MAX_REQUEST_TASKS', 8 * workers, 1, 100_000),
    maxJsonBytes: integer(env, 'MAX_JSON_BYTES', 8 * 1024 * 1024, 1024, 2 ** 30),
    logLevel: env.LOG_LEVEL?.trim() || 'info',
    retention: {
      maxAgeHours: integer(env, 'RETENTION_MAX_AGE_HOURS', 168, 0, 1_000_000),
      maxBytes: integer(env, 'RETENTION_MAX_BYTES', 2 * 1024 ** 3, 0, Number.MAX_SAFE_INTEGER),
      intervalMs: 1000 * integer(env, 'RETENTION_INTERVAL_SECONDS', 600, 1, 86_400),
    },
    tenantIsolation,
    ...(queue
      ? { queue: { ...queue, planConcurrency: integer(env, 'PLAN_CELL_CONCURRENCY', 8, 1, 10_000) } }
      : {}),
    ...(workerKey ? { workerKey } : {}),
  };
}
