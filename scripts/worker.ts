/**
 * `npm run worker`: a worker process for plans on the Redis job queue. Run it on any machine that
 * reaches Redis (QUEUE_URL) and, for plans on uploads, the service (SERVICE_URL, WORKER_KEY).
 * Configuration in README "Configuration"; SIGTERM/SIGINT finish the running cells and stop.
 */
import { pino } from 'pino';
import { ConfigError, loadWorkerConfig } from '../src/http/worker-config.ts';
import { CellWorker } from '../src/jobs/cell-worker.ts';
import { redactedQueueUrl } from '../src/jobs/queue-connection.ts';

const log = pino({ level: process.env.LOG_LEVEL?.trim() || 'info' });
let config: ReturnType<typeof loadWorkerConfig>;
try {
  config = loadWorkerConfig(process.env);
} catch (error) {
  if (error instanceof ConfigError) {
    process.stderr.write(`configuration error: ${error.message}\n`);
    process.exit(2);
  }
  throw error;
}

const worker = await CellWorker.start({ ...config, log });
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    log.info({ signal }, 'worker stopping');
    worker.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  });
}
log.info(
  { queue: redactedQueueUrl(config.queue.url), threads: config.threads, service: config.inputs?.serviceUrl },
  'k-space planner worker ready',
);
