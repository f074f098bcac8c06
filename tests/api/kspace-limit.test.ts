import { describe, expect, it } from 'vitest';
import { defaultLimits } from '../../src/core/limits.ts';
import { expectDocumented, expectProblem, loadSpec, postJson, sharedTestApp } from './helpers.ts';

// A bounded point count for POST /v1/phantoms/{name}/kspace (configurable as MAX_KSPACE_POINTS);
// beyond it a 422 problem (RFC 9457; RFC 9110 §15.5.21) of type /problems/limit-exceeded naming `points`.

const points = (n: number) => Array.from({ length: n }, (_, i) => [i / n, -i / n]);

describe('k-space points limit', () => {
  const t = sharedTestApp({ limits: { maxKspacePoints: 1000 } });

  it('one point over the configured limit: 422 limit-exceeded naming points, with the limit', async () => {
    const res = await postJson(t, '/v1/phantoms/shepp-logan/kspace', { points: points(1001) });
    const problem = expectProblem(res, 422, 'points');
    expect(problem.type).toBe('/problems/limit-exceeded');
    expect(problem.errors[0].allowed).toBe('at most 1000 points');
    await expectDocumented('POST', '/v1/phantoms/shepp-logan/kspace', res);
  });

  it('exactly the limit is computed (on the worker pool) and answered in full', async () => {
    const res = await postJson(t, '/v1/phantoms/shepp-logan/kspace', { points: points(1000) });
    expect(res.status).toBe(200);
    expect(res.body.values).toHaveLength(1000);
    // K(0) of Shepp & Logan 1974 = Σ ρ·π·a·b over the ten ellipses, a real number.
    expect(res.body.values[0][1]).toBeCloseTo(0, 12);
    expect(await t.app.services.pool.inFlight).toBe(0);
  });

  it('the contract states the default limit as maxItems', async () => {
    const spec = (await loadSpec()) as unknown as {
      paths: Record<string, { post: { requestBody: { content: Record<string, { schema: unknown }> } } }>;
    };
    const schema = spec.paths['/v1/phantoms/{name}/kspace'].post.requestBody.content['application/json']
      .schema as { properties: { points: { maxItems: number } } };
    expect(schema.properties.points.maxItems).toBe(defaultLimits.maxKspacePoints);
    expect(defaultLimits.maxKspacePoints).toBe(65_536);
  });
});
