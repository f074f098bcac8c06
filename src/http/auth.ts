import { createHash, timingSafeEqual } from 'node:crypto';
import type { FastifyInstance, FastifyRequest } from 'fastify';
import { HttpProblem } from './problem.ts';

function digest(value: string): Buffer {
  return createHash('sha256').update(value).digest();
}

/** The key a client sent: `x-api-key: <key>` or `Authorization: Bearer <key>`. */
export function presentedKey(request: FastifyRequest): string | undefined {
  const header = request.headers['x-api-key'];
  if (typeof header === 'string' && header.length > 0) return header;
  const authorization = request.headers.authorization;
  const match = authorization ? /^Bearer\s+(.+)$/i.exec(authorization) : null;
  return match ? match[1].trim() : undefined;
}

/**
 * Requires a valid API key on every route of the context it is installed in (src/app.ts installs it
 * in the one encapsulated context that holds every /v1 route). The hook runs on the route the router
 * matched, so percent-encoded paths, absolute-form request targets, double slashes or dot segments
 * cannot reach a /v1 handler without passing it; it never looks at the raw URL. Keys are compared as
 * SHA-256 digests in constant time, so neither length nor content leaks through timing.
 */
export function installApiKeyAuth(app: FastifyInstance, apiKeys: readonly string[]): void {
  if (apiKeys.length === 0) return;
  const digests = apiKeys.map(digest);
  app.addHook('onRequest', async (request) => {
    const key = presentedKey(request);
    const candidate = key === undefined ? undefined : digest(key);
    const valid = candidate !== undefined && digests.some((d) => timingSafeEqual(d, candidate));
    if (!valid) {
      throw new HttpProblem(
        401,
        key === undefined ? 'this server requires an API key' : 'the API key is not valid',
        [{ field: 'x-api-key', message: 'send a valid key as x-api-key or Authorization: Bearer' }],
        { headers: { 'www-authenticate': 'Bearer realm="kspace-planner"' } },
      );
    }
  });
}
