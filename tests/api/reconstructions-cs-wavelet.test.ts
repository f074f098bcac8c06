import { describe, expect, it } from 'vitest';
import { runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { expectDocumented, postProblem, sharedTestApp } from './helpers.ts';

// Source: the v1 HTTP contract of docs/design.md §4 (201 with the engine's numbers; problem+json per
// RFC 9457, docs/references.md §10.4, naming the field); responses validated against openapi.yaml.

const request = {
  source: { phantom: 'shepp-logan-modified' },
  matrix: { nx: 32, ny: 32 },
  sampling: { pattern: 'poisson-disc', acceleration: 3, acs: 6, seed: 3 },
  method: { name: 'cs-wavelet', lambda: 0.001, tvLambda: 0, wavelet: 'db4', levels: 3, iterations: 40 },
};

describe('POST /v1/reconstructions with cs-wavelet', () => {
  const t = sharedTestApp({ limits: { maxIterations: 100, maxMatrixSide: 128 } });

  it('201 with the engine’s metrics, the solver’s settings and its stop in info, below the zero-filled error', async () => {
    const res = await t.http().post('/v1/reconstructions').send(request);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    const direct = await runReconstruction(request as never, undefined);
    expect(res.body.metrics).toEqual(direct.metrics);
    expect(res.body.info).toMatchObject({
      wavelet: 'db4',
      levels: 3,
      lambda: 0.001,
      tvLambda: 0,
      shiftInvariance: 'cycle-spinning',
      iterationLimit: 40,
    });
    expect(typeof res.body.info.converged).toBe('boolean');
    expect(res.body.info.iterations).toBeLessThanOrEqual(40);
    expect(res.body.metrics.nrmse).toBeLessThan(res.body.zeroFilledMetrics.nrmse);
  });

  it('with a TV term the primal–dual solver runs, without shifts', async () => {
    const res = await t
      .http()
      .post('/v1/reconstructions')
      .send({ ...request, method: { name: 'cs-wavelet', lambda: 0.001, tvLambda: 0.002, iterations: 20 } });
    expect(res.status).toBe(201);
    expect(res.body.info).toMatchObject({ shiftInvariance: 'none', tvLambda: 0.002 });
    expect(res.body.info.solver).toMatch(/Chambolle–Pock/);
  });

  it('refuses what cannot run, naming the field: levels for the matrix, shifts with TV, an unknown wavelet (422; a wrong type would be 400), iterations above the limit', async () => {
    const refused = (method: object, status: number, field: string) =>
      postProblem(t, '/v1/reconstructions', { ...request, method }, status, field);
    await refused({ name: 'cs-wavelet', levels: 6 }, 422, 'method.levels');
    await refused(
      { name: 'cs-wavelet', tvLambda: 0.01, shiftInvariance: 'cycle-spinning' },
      422,
      'method.shiftInvariance',
    );
    const unknown = await refused({ name: 'cs-wavelet', wavelet: 'haar' }, 422, 'method.wavelet');
    expect(JSON.stringify(unknown.errors)).toContain('db8');
    const limit = await refused({ name: 'cs-wavelet', iterations: 500 }, 422, 'method.iterations');
    expect(limit.type).toBe('/problems/limit-exceeded');
  });
});
