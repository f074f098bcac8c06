import { describe, expect, it } from 'vitest';
import { oneCellPlan, oneReconstruction, postJson, postProblem, sharedTestApp } from './helpers.ts';

// A plan's source is checked when it is submitted, as POST /v1/reconstructions checks it: an unknown
// phantom is 422 (RFC 9110 §15.5.21) naming source.phantom; an unknown image id is 404 naming
// source.imageId on both routes. Problems per RFC 9457.

const plan = oneCellPlan;
const reconstruction = oneReconstruction;
const missingImage = '00000000-0000-0000-0000-000000000000';

describe('plan sources are validated at submit', () => {
  const t = sharedTestApp();

  /** The same source change posted as a plan and as a reconstruction: the problem each route answers. */
  async function onBothRoutes(body: object, status: number, field: string) {
    const fromPlan = await postProblem(t, '/v1/plans', { ...plan, ...body }, status, field);
    const fromRecon = await postProblem(
      t,
      '/v1/reconstructions',
      { ...reconstruction, ...body },
      status,
      field,
    );
    return { fromPlan, fromRecon };
  }

  it('unknown phantom: 422 naming source.phantom, listing the known ones, as the reconstruction route', async () => {
    const body = { source: { phantom: 'no-such-phantom' } };
    const { fromPlan, fromRecon } = await onBothRoutes(body, 422, 'source.phantom');
    expect(fromPlan.errors[0]).toEqual(fromRecon.errors[0]);
    expect(fromPlan.errors[0].allowed).toContain('shepp-logan');
    // Nothing was queued.
    expect(t.app.services.plans.length).toBe(0);
  });

  it('unknown image id: 404 naming source.imageId on both routes', async () => {
    const body = { source: { imageId: missingImage } };
    const { fromPlan, fromRecon } = await onBothRoutes(body, 404, 'source.imageId');
    expect(fromPlan.errors).toEqual(fromRecon.errors);
  });

  it('a known phantom is still accepted (control)', async () => {
    const res = await postJson(t, '/v1/plans', plan);
    expect(res.status).toBe(202);
  });
});
