import { describe, expect, it } from 'vitest';
import { expectDocumented, expectProblem, postJson, postProblem, sharedTestApp, testApp } from './helpers.ts';

const scanTime = { matrix: { nx: 64, ny: 64 }, protocol: { trMs: 500 } };

describe('RFC 9457 problem details for every class of bad input (docs/references.md §10.4)', () => {
  const t = sharedTestApp({ maxJsonBytes: 4096, limits: { maxMatrixSide: 128 } });

  it('400 malformed JSON', async () => {
    const res = await t
      .http()
      .post('/v1/scan-time')
      .set('content-type', 'application/json')
      .send('{"matrix": {');
    expectProblem(res, 400, 'body');
    await expectDocumented('POST', '/v1/scan-time', res);
  });

  it('400 wrong types and missing fields, each bad field listed', async () => {
    const problem = await postProblem(
      t,
      '/v1/scan-time',
      { matrix: { nx: 'sixty-four', ny: 64 }, protocol: {} },
      400,
    );
    const fields = problem.errors.map((e) => e.field);
    expect(fields).toContain('matrix.nx');
    expect(fields).toContain('protocol.trMs');
  });

  it('422 values out of range, with the allowed range', async () => {
    const res = await postJson(t, '/v1/scan-time', {
      matrix: { nx: 64, ny: 64 },
      protocol: { trMs: -1, averages: 0 },
    });
    const problem = expectProblem(res, 422);
    expect(problem.errors).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ field: 'protocol.trMs', allowed: '> 0' }),
        expect.objectContaining({ field: 'protocol.averages', allowed: '≥ 1' }),
      ]),
    );
    await expectDocumented('POST', '/v1/scan-time', res);
  });

  it.each([
    [
      '422 from an engine ValidationError (R too high for the matrix) names the field',
      { sampling: { pattern: 'cartesian-uniform', acceleration: 100 } },
      'sampling.acceleration',
    ],
    [
      '422 for an unknown discriminator value (sampling.pattern)',
      { sampling: { pattern: 'zigzag', acceleration: 2 } },
      'sampling.pattern',
    ],
  ])('%s', async (_title, change, field) => {
    await postProblem(t, '/v1/scan-time', { ...scanTime, ...change }, 422, field);
  });

  it('422 limit problem beyond the configured matrix limit (128 here)', async () => {
    const problem = await postProblem(
      t,
      '/v1/scan-time',
      { ...scanTime, matrix: { nx: 256, ny: 64 } },
      422,
      'matrix.nx',
    );
    expect(problem.type).toBe('/problems/limit-exceeded');
    expect(problem.errors[0].allowed).toBe('≤ 128');
  });

  it('404 unknown route and unknown id', async () => {
    expectProblem(await t.http().get('/v1/nothing-here'), 404, 'url');
    expectProblem(await t.http().get('/v1/images/00000000-0000-0000-0000-000000000000'), 404, 'id');
  });

  it('413 JSON body above the configured size', async () => {
    const res = await postJson(t, '/v1/scan-time', { ...scanTime, padding: 'x'.repeat(10_000) });
    expectProblem(res, 413);
    await expectDocumented('POST', '/v1/scan-time', res);
  });

  it('415 unsupported content type on a JSON route', async () => {
    const res = await t.http().post('/v1/scan-time').set('content-type', 'text/plain').send('hello');
    expectProblem(res, 415);
  });

  it('never a 500: a batch of hostile bodies all answer 4xx problem+json', async () => {
    const bodies: unknown[] = [
      null,
      [],
      42,
      'text',
      { matrix: null },
      { matrix: { nx: 1e308, ny: -0 }, protocol: { trMs: 1 } },
      {
        matrix: { nx: 64, ny: 64 },
        protocol: { trMs: 500 },
        sampling: { pattern: 'custom', maskPng: '!!!' },
      },
      {
        matrix: { nx: 64, ny: 64 },
        protocol: { trMs: 500 },
        sampling: { pattern: 'custom', maskPng: 'AAAA' },
      },
      {
        matrix: { nx: 64, ny: 64 },
        protocol: { trMs: 500 },
        sampling: { pattern: 'radial', acceleration: 1e9 },
      },
    ];
    const texts = [
      ...bodies.map((b) => JSON.stringify(b)),
      // Prototype pollution attempt: refused by fastify's secure JSON parser.
      '{"__proto__": {"polluted": true}, "matrix": {"nx": 64, "ny": 64}, "protocol": {"trMs": 500}}',
      '',
      '\u0000',
    ];
    for (const body of texts) {
      const res = await t.http().post('/v1/scan-time').set('content-type', 'application/json').send(body);
      expect(res.status, body).toBeGreaterThanOrEqual(400);
      expect(res.status, body).toBeLessThan(500);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    }
  });

  it('every problem type URI resolves to its description (RFC 9457 §3.1.1)', async () => {
    for (const type of [
      '/problems/malformed-request',
      '/problems/out-of-range',
      '/problems/limit-exceeded',
      '/problems/queue-full',
    ]) {
      const res = await t.http().get(type);
      expect(res.status).toBe(200);
      await expectDocumented('GET', type, res);
      expect(res.body.type).toBe(type);
    }
    const problem = expectProblem(await t.http().get('/v1/nothing'), 404);
    expect((await t.http().get(problem.type)).body.title).toBe(problem.title);
    expectProblem(await t.http().get('/problems/nope'), 404, 'name');
  });

  it('responses carry a request id (x-request-id), also on problems', async () => {
    const res = await t.http().get('/v1/nothing');
    expect(res.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
  });
});

describe('API keys (HOST not loopback ⇒ every /v1 request needs a valid key)', () => {
  const t = sharedTestApp({ apiKeys: ['k-one', 'k-two'] });

  it('401 problem without a key or with a wrong one; WWW-Authenticate set (RFC 9110 11.6.1)', async () => {
    const none = await postJson(t, '/v1/scan-time', scanTime);
    expectProblem(none, 401, 'x-api-key');
    expect(none.headers['www-authenticate']).toMatch(/^Bearer/);
    expectProblem(await t.http().post('/v1/scan-time').set('x-api-key', 'k-three').send(scanTime), 401);
    expectProblem(await t.http().get('/v1/images/x').set('authorization', 'Bearer nope'), 401);
  });

  it('a valid key as x-api-key or Authorization: Bearer passes', async () => {
    expect((await t.http().post('/v1/scan-time').set('x-api-key', 'k-one').send(scanTime)).status).toBe(200);
    expect(
      (await t.http().post('/v1/scan-time').set('authorization', 'Bearer k-two').send(scanTime)).status,
    ).toBe(200);
  });

  it('/health and the contract stay open (no patient data, needed by load balancers)', async () => {
    expect((await t.http().get('/health')).status).toBe(200);
    expect((await t.http().get('/openapi.yaml')).status).toBe(200);
  });

  it('the key never appears in the logs', async () => {
    await t.http().get('/v1/images/x').set('x-api-key', 'k-one');
    expect(t.logs.join('\n')).not.toContain('k-one');
  });
});

describe('bounded worker queue for request-driven work', () => {
  it('a burst beyond maxRequestTasks answers 429 with Retry-After instead of queueing without bound', async () => {
    const t = await testApp({ workers: 1, maxRequestTasks: 1 });
    try {
      const slow = {
        source: { phantom: 'shepp-logan-modified' },
        matrix: { nx: 96, ny: 96 },
        sampling: { pattern: 'cartesian-random', acceleration: 3, acs: 8, seed: 1 },
        method: { name: 'cs-tv', iterations: 400 },
      };
      const [a, b] = await Promise.all([
        postJson(t, '/v1/reconstructions', slow),
        postJson(t, '/v1/reconstructions', slow),
      ]);
      const statuses = [a.status, b.status].sort();
      expect(statuses).toEqual([201, 429]);
      const refused = a.status === 429 ? a : b;
      expectProblem(refused, 429);
      expect(refused.headers['retry-after']).toMatch(/^[1-9]\d*$/);
    } finally {
      await t.close();
    }
  });
});

describe('never a 500 on any JSON route', () => {
  it('hostile bodies on every POST route answer 4xx problem+json and leave the service healthy (docs/design.md §4.1: never a 500)', async () => {
    const t = await testApp({ workers: 1 });
    try {
      const routes = [
        '/v1/masks',
        '/v1/reconstructions',
        '/v1/plans',
        '/v1/scan-time',
        '/v1/phantoms/shepp-logan/kspace',
      ];
      const matrix = { nx: 32, ny: 32 };
      const bodies: string[] = [
        'null',
        '[]',
        '42',
        '"text"',
        '{}',
        '{"matrix":{"nx":1e9,"ny":1e9}}',
        JSON.stringify({ matrix, sampling: { pattern: 'poisson-disc', acceleration: 1e300, seed: 1 } }),
        JSON.stringify({
          matrix,
          sampling: { pattern: 'cartesian-random', acceleration: 2, acs: 1e6, seed: 1 },
        }),
        JSON.stringify({
          matrix,
          sampling: { pattern: 'radial', acceleration: -1 },
          method: { name: 'cs-tv', lambda: -1 },
        }),
        JSON.stringify({
          source: { phantom: 'nope' },
          matrix,
          sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
          method: { name: 'zero-filled' },
        }),
        JSON.stringify({
          source: { phantom: 'shepp-logan' },
          matrix,
          sampling: { pattern: 'custom', maskPng: 'iVBORw0KGgo=' },
          method: { name: 'zero-filled' },
        }),
        JSON.stringify({
          points: [[Number.MAX_VALUE, -Number.MAX_VALUE]],
          matrix,
          protocol: { trMs: 1e-300 },
        }),
        `${'['.repeat(2000)}${']'.repeat(2000)}`,
        `${'{"a":'.repeat(500)}1${'}'.repeat(500)}`,
      ];
      for (const url of routes) {
        for (const body of bodies) {
          const res = await t.http().post(url).set('content-type', 'application/json').send(body);
          expect(res.status, `${url} ${body.slice(0, 80)}`).toBeGreaterThanOrEqual(400);
          expect(res.status, `${url} ${body.slice(0, 80)}`).toBeLessThan(500);
          expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
        }
      }
      expect((await t.http().get('/health')).status).toBe(200);
    } finally {
      await t.close();
    }
  });
});
