import { readFileSync } from 'node:fs';
import type { ConnectionOptions } from 'bullmq';

/** How the service and the worker processes reach Redis (QUEUE_URL and its TLS options). */
export interface QueueSettings {
  /** redis://[:password@]host:port[/db] or rediss://… for TLS. */
  url: string;
  /** PEM file of the CA that signed the Redis server's certificate (rediss:// with a private CA). */
  tlsCaFile?: string;
}

/** The BullMQ queue that carries plan cells, and the Redis names beside it. */
export const CELL_QUEUE_NAME = 'kspace-plan-cells';
/** Pub/sub channel on which the service names a cancelled plan; workers stop its running cells. */
export const CANCEL_CHANNEL = 'kspace-plan-cells:cancel';
/** Set for a cancelled plan (a day): a worker that picks up one of its cells afterwards skips it. */
export function cancelledKey(planId: string): string {
  return `kspace-plan-cells:cancelled:${planId}`;
}

/** A cell's job id: the same plan and cell always give the same job, so a re-submission is a no-op. */
export function cellJobId(planId: string, cellIndex: number): string {
  return `${planId}-cell-${cellIndex}`;
}

/** ioredis options as BullMQ takes them; `maxRetriesPerRequest: null` is what BullMQ workers need. */
export function redisConnection(settings: QueueSettings): ConnectionOptions {
  const url = new URL(settings.url);
  if (url.protocol !== 'redis:' && url.protocol !== 'rediss:') {
    throw new Error(`QUEUE_URL must start with redis:// or rediss://, got ${url.protocol}//`);
  }
  const tls =
    url.protocol === 'rediss:'
      ? { ...(settings.tlsCaFile ? { ca: readFileSync(settings.tlsCaFile) } : {}) }
      : undefined;
  return { url: settings.url, maxRetriesPerRequest: null, ...(tls ? { tls } : {}) };
}

/** The URL without its password, for logs. */
export function redactedQueueUrl(raw: string): string {
  const url = new URL(raw);
  if (url.password) url.password = '***';
  return url.toString();
}
