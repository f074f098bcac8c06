import { buildApp } from './app.ts';
import { ConfigError, loadConfig } from './http/config.ts';

let config: ReturnType<typeof loadConfig>;
try {
  config = loadConfig(process.env);
} catch (error) {
  if (error instanceof ConfigError) {
    process.stderr.write(`configuration error: ${error.message}\n`);
    process.exit(2);
  }
  throw error;
}

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
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    app.log.info({ signal }, 'shutting down');
    app.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  });
}

await app.listen({ port: config.port, host: config.host });
app.log.info(
  { dataDir: config.dataDir, workers: config.workers, apiKeys: config.apiKeys.length > 0 },
  'k-space planner ready',
);
