/**
 * `npm run worker`: a worker process for plans on the Redis job queue. Run it on any machine that
 * reaches Redis (QUEUE_URL) and, for plans on uploads, the service (SERVICE_URL, WORKER_KEY).
 * Configuration in README "Configuration"; SIGTERM/SIGINT finish the running cells and stop.
 */
import { pino } from 'pino';
import { closeOnSignals, configOrExit } from '../src/http/process-lifecycle.ts';
import { loadWorkerConfig } from '../src/http/worker-config.ts';
import { CellWorker } from '../src/jobs/cell-worker.ts';
import { redactedQueueUrl } from '../src/jobs/queue-connection.ts';

const log = pino({ level: process.env.LOG_LEVEL?.trim() || 'info' });
const config = configOrExit(() => loadWorkerConfig(process.env));

const worker = await CellWorker.start({ ...config, log });
closeOnSignals(
  (signal) => log.info({ signal }, 'worker stopping'),
  () => worker.close(),
);
log.info(
  { queue: redactedQueueUrl(config.queue.url), threads: config.threads, service: config.inputs?.serviceUrl },
  'k-space planner worker ready',
);
