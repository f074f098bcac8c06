import { describe, expect, it } from 'vitest';
import { oneCellPlan, oneReconstruction, postJson, postProblem, sharedTestApp } from './helpers.ts';

// noise.snr has a documented range, 0.1 ≤ snr ≤ 1e6 (reasons in the schema description); outside it
// a 422 (RFC 9110 §15.5.21) RFC 9457 problem names noise.snr. Before, 1e-300 gave 201 with every
// metric null and 1e-320 a 422 naming an internal field.

const reconstruction = { ...oneReconstruction, seed: 1 };

describe('noise.snr range', () => {
  const t = sharedTestApp();

  it.each([1e-300, 1e-320, 0.09, 0, 2e6])('snr %s: 422 naming noise.snr with the range', async (snr) => {
    const problem = await postProblem(
      t,
      '/v1/reconstructions',
      { ...reconstruction, noise: { snr } },
      422,
      'noise.snr',
    );
    expect(problem.errors).toHaveLength(1);
    expect(problem.errors[0].allowed).toMatch(/^[≥≤] (0\.1|1000000)$/);
  });

  it('the same range for plans', async () => {
    await postProblem(t, '/v1/plans', { ...oneCellPlan, noise: { snr: 1e-300 } }, 422, 'noise.snr');
  });

  it('the lower end, snr 0.1, is accepted and scored with finite metrics', async () => {
    const res = await postJson(t, '/v1/reconstructions', { ...reconstruction, noise: { snr: 0.1 } });
    expect(res.status).toBe(201);
    for (const name of ['nrmse', 'psnr', 'ssim', 'hfen'])
      expect(Number.isFinite(res.body.metrics[name])).toBe(true);
    // At SNR 0.1 noise dominates: NRMSE well above 1 (σ is ten times the mean object signal).
    expect(res.body.metrics.nrmse).toBeGreaterThan(1);
  });
});
