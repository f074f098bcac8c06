import { buildApp } from './app.ts';
import { loadConfig } from './http/config.ts';
import { closeOnSignals, configOrExit } from './http/process-lifecycle.ts';

const config = configOrExit(() => loadConfig(process.env));

const app = await buildApp({
  dataDir: config.dataDir,
  limits: config.limits,
  logger: { level: config.logLevel },
  apiKeys: config.apiKeys,
  workers: config.workers,
  maxQueuedPlans: config.maxQueuedPlans,
  maxJsonBytes: config.maxJsonBytes,
  maxRequestTasks: config.maxRequestTasks,
  retention: config.retention,
  tenantIsolation: config.tenantIsolation,
  ...(config.queue ? { queue: config.queue } : {}),
  ...(config.workerKey ? { workerKey: config.workerKey } : {}),
});

// Finish the request in flight and leave queued/running plans in the store to resume on restart.
closeOnSignals(
  (signal) => app.log.info({ signal }, 'shutting down'),
  () => app.close(),
);

await app.listen({ port: config.port, host: config.host });
app.log.info(
  { dataDir: config.dataDir, workers: config.workers, apiKeys: config.apiKeys.length > 0 },
  'k-space planner ready',
);
