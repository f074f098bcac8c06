import { describe, expect, it } from 'vitest';
import { expectDocumented, postJson, postProblem, sharedTestApp } from './helpers.ts';

// POST /v1/reconstructions with partial Fourier in the sampling and a fill method (docs/design.md §2.1).
describe('POST /v1/reconstructions: partial Fourier and its fill', () => {
  const t = sharedTestApp();
  const body = (method: Record<string, unknown>) => ({
    source: { phantom: 'shepp-logan-modified' },
    matrix: { nx: 33, ny: 33 },
    sampling: { pattern: 'cartesian-uniform', acceleration: 1, partialFourier: 0.625 },
    method,
  });

  it('homodyne on an odd matrix recovers the real phantom; zero-fill does not (⌈0.625·33⌉ = 21 rows)', async () => {
    const homodyne = await postJson(
      t,
      '/v1/reconstructions',
      body({ name: 'zero-filled', partialFourier: 'homodyne' }),
    );
    expect(homodyne.status).toBe(201);
    expect(homodyne.body.acquired).toEqual({ count: 21, unit: 'lines' });
    await expectDocumented('POST', '/v1/reconstructions', homodyne);
    const zeroFill = await postJson(t, '/v1/reconstructions', body({ name: 'zero-filled' }));
    // Hermitian analytic k-space, odd side: homodyne exact to rounding; zero-fill leaves ky < −h empty.
    expect(homodyne.body.metrics.nrmse).toBeLessThan(1e-10);
    expect(zeroFill.body.metrics.nrmse).toBeGreaterThan(0.1);
  });

  it('an unknown fill is a 422 naming method.partialFourier', async () => {
    const problem = await postProblem(
      t,
      '/v1/reconstructions',
      body({ name: 'zero-filled', partialFourier: 'mirror' }),
      422,
    );
    expect(problem.errors[0].field).toBe('method.partialFourier');
  });
});
