import type { BaseLogger } from 'pino';

/** The log calls the background jobs make; fastify's request-independent `app.log` is one. */
export type JobLog = Pick<BaseLogger, 'error' | 'warn' | 'info'>;
