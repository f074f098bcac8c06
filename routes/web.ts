import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import fastifyStatic from '@fastify/static';
import type { FastifyInstance } from 'fastify';

/**
 * The planner web page: GET / answers with the page, /web/* serves its plain ES modules and styles
 * from src/web, and /web/vendor/uplot/* the charting library straight from node_modules, so that
 * `npm ci && npm start` serves everything with no build step and no network.
 */

const webRoot = join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'web');
const uplotDist = join(dirname(createRequire(import.meta.url).resolve('uplot/package.json')), 'dist');

/** The only library files the page loads; nothing else under node_modules is reachable. */
const vendorFiles: Record<string, string> = {
  'uPlot.esm.js': 'text/javascript; charset=utf-8',
  'uPlot.min.css': 'text/css; charset=utf-8',
};

/** Same-origin only: the page talks to this service's /v1 routes and nothing else. */
const contentSecurityPolicy = [
  "default-src 'self'",
  "img-src 'self' blob: data:",
  "connect-src 'self'",
  "style-src 'self'",
  "script-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "frame-ancestors 'none'",
  "form-action 'self'",
].join('; ');

export async function webRoutes(app: FastifyInstance): Promise<void> {
  const indexHtml = readFileSync(join(webRoot, 'index.html'));
  const vendorCache = new Map<string, Buffer>();

  app.get('/', { schema: { hide: true } }, async (_request, reply) => {
    reply
      .type('text/html; charset=utf-8')
      .header('content-security-policy', contentSecurityPolicy)
      .header('x-content-type-options', 'nosniff')
      .header('cache-control', 'no-cache');
    return indexHtml;
  });

  app.get<{ Params: { file: string } }>(
    '/web/vendor/uplot/:file',
    { schema: { hide: true } },
    async (request, reply) => {
      const { file } = request.params;
      const type = vendorFiles[file];
      if (!type) return reply.callNotFound();
      let body = vendorCache.get(file);
      if (!body) {
        body = readFileSync(join(uplotDist, file));
        vendorCache.set(file, body);
      }
      reply.type(type).header('x-content-type-options', 'nosniff').header('cache-control', 'max-age=3600');
      return body;
    },
  );

  await app.register(fastifyStatic, {
    root: webRoot,
    prefix: '/web/',
    decorateReply: false,
    index: false,
    cacheControl: true,
    maxAge: 0,
    allowedPath: (pathName) => /\.(js|css|svg)$/.test(pathName) && !pathName.startsWith('/vendor/'),
  });
}

export default webRoutes;
