import Fastify, { type FastifyInstance, type FastifyServerOptions } from 'fastify';

export interface AppOptions {
  logger?: FastifyServerOptions['logger'];
}

/** Builds the fastify instance; used by main.ts and by the API tests. */
export async function buildApp(options: AppOptions = {}): Promise<FastifyInstance> {
  const app = Fastify({ logger: options.logger ?? false });
  app.get('/health', async () => ({ status: 'ok' }));
  return app;
}
