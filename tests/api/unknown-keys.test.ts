import { describe, expect, it } from 'vitest';
import { expectProblem, postJson, postProblem, sharedTestApp } from './helpers.ts';

// Unknown keys are refused everywhere the same way the rest of the API refuses them: 400
// (a body of the wrong shape, RFC 9110 §15.5.1) as RFC 9457 problem+json naming the key's own path.

const reconstruction = {
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 32, ny: 32 },
  sampling: { pattern: 'radial', acceleration: 2 },
  method: { name: 'zero-filled' },
};

const plan = {
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 32, ny: 32 },
  protocol: { trMs: 500 },
  patterns: [{ pattern: 'cartesian-random', density: { power: 2 } }],
  accelerations: [2],
  methods: [{ name: 'zero-filled' }],
  seeds: 1,
};

describe('unknown keys are refused with their path', () => {
  const t = sharedTestApp();

  it('top level (already refused before): 400 naming the key', async () => {
    await postProblem(t, '/v1/reconstructions', { ...reconstruction, extra: 1 }, 400, 'extra');
  });

  it('sampling: a misspelt "angle" is 400 naming sampling.angle, not uniform angles with 200', async () => {
    const problem = await postProblem(
      t,
      '/v1/reconstructions',
      { ...reconstruction, sampling: { ...reconstruction.sampling, angle: 'golden' } },
      400,
      'sampling.angle',
    );
    expect(problem.errors).toHaveLength(1);
    await postProblem(
      t,
      '/v1/masks',
      { matrix: reconstruction.matrix, sampling: { ...reconstruction.sampling, angle: 'golden' } },
      400,
      'sampling.angle',
    );
  });

  it('sampling.density: 400 naming sampling.density.powr', async () => {
    await postProblem(
      t,
      '/v1/masks',
      {
        matrix: { nx: 32, ny: 32 },
        sampling: { pattern: 'poisson-disc', acceleration: 2, seed: 1, density: { powr: 3 } },
      },
      400,
      'sampling.density.powr',
    );
  });

  it('plans: patterns[0].density.powr and patterns[0].angle named the same way', async () => {
    await postProblem(
      t,
      '/v1/plans',
      { ...plan, patterns: [{ pattern: 'cartesian-random', density: { powr: 2 } }] },
      400,
      'patterns[0].density.powr',
    );
    await postProblem(
      t,
      '/v1/plans',
      { ...plan, patterns: [{ pattern: 'radial', angle: 'golden' }] },
      400,
      'patterns[0].angle',
    );
  });

  it('query strings too: a misspelt supersample on a phantom raster is 400 naming it', async () => {
    const res = await t.http().get('/v1/phantoms/shepp-logan?nx=16&ny=16&supersampl=4');
    expectProblem(res, 400, 'supersampl');
    expect((await t.http().get('/v1/phantoms/shepp-logan?nx=16&ny=16&supersample=4')).status).toBe(200);
  });

  it('the known spelling still works (control)', async () => {
    const res = await postJson(t, '/v1/masks', {
      matrix: reconstruction.matrix,
      sampling: { ...reconstruction.sampling, angles: 'golden' },
    });
    expect(res.status).toBe(200);
  });
});
