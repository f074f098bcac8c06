import { buildApp } from './app.ts';

const port = Number(process.env.PORT ?? 8080);
const host = process.env.HOST ?? '127.0.0.1';

const app = await buildApp({ logger: { level: process.env.LOG_LEVEL ?? 'info' } });
await app.listen({ port, host });
