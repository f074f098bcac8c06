import { request as httpRequest } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { postJson, type TestApp, testApp } from './helpers.ts';

// A client that goes away stops its computation: the request's AbortSignal reaches the pool task
// (piscina ends the worker thread running it). Checked by the pool's in-flight count, and by a
// small request finishing on the pool's only thread, which a still-running task would hold for a minute.

/** A 512² cs-tv of 2000 iterations: about a minute of one core (measured on the machine). */
const longReconstruction = {
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 512, ny: 512 },
  sampling: { pattern: 'cartesian-uniform', acceleration: 4, acs: 16 },
  method: { name: 'cs-tv', iterations: 2000, tolerance: 0 },
};

async function until(check: () => boolean, what: string, limitMs: number): Promise<void> {
  const deadline = Date.now() + limitMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`gave up waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

describe('abandoned requests stop their work', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ workers: 1 });
    await t.app.listen({ port: 0, host: '127.0.0.1' });
  });
  afterAll(async () => t.close());

  it('destroying the socket of a long reconstruction frees the worker; /health answers', async () => {
    const { pool } = t.app.services;
    const address = t.app.server.address() as { port: number };
    const body = JSON.stringify(longReconstruction);
    const req = httpRequest({
      host: '127.0.0.1',
      port: address.port,
      method: 'POST',
      path: '/v1/reconstructions',
      headers: { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) },
    });
    req.on('error', () => {}); // the socket is destroyed on purpose
    req.end(body);
    await until(() => pool.inFlight === 1, 'the reconstruction to reach the pool', 30_000);
    req.destroy();
    // Generous bound: the abort itself is immediate; the reconstruction alone would take a minute.
    await until(() => pool.inFlight === 0, 'the task to leave the pool', 20_000);

    const health = await t.http().get('/health');
    expect(health.status).toBe(200);
    // The only worker thread takes new work: a small reconstruction completes.
    const small = await postJson(t, '/v1/reconstructions', {
      ...longReconstruction,
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
      method: { name: 'zero-filled' },
    });
    expect(small.status).toBe(201);
    // The task left the pool because it was stopped, not because the request was refused.
    const lines = t.logs.map((line) => JSON.parse(line) as { msg: string; res?: { statusCode: number } });
    expect(lines.some((line) => line.msg.includes('its computation is stopped'))).toBe(true);
    expect(lines.filter((line) => (line.res?.statusCode ?? 0) >= 400)).toEqual([]);
    expect(pool.inFlight).toBe(0);
  }, 90_000);
});
