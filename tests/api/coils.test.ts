import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import {
  binary,
  expectDocumented,
  oneCellPlan,
  postJson,
  postProblem,
  sharedTestApp,
  type TestApp,
} from './helpers.ts';

// Receive arrays end to end (docs/design.md §3.8, §4.3, §4.4): request pieces, response echoes,
// images and plan rows. Every response is validated against openapi.yaml by expectDocumented; problems
// follow RFC 9457 (docs/references.md §10.4).

const loops = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25, correlation: 0.1 };

const request = {
  source: { phantom: 'shepp-logan-modified' },
  matrix: { nx: 32, ny: 32 },
  sampling: { pattern: 'cartesian-uniform', acceleration: 2, acs: 4 },
  noise: { snr: 40 },
  method: { name: 'zero-filled' },
  seed: 1,
};

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function finishedPlan(t: TestApp, id: string) {
  for (let i = 0; i < 2400; i++) {
    const res = await t.http().get(`/v1/plans/${id}`);
    if (['done', 'failed', 'cancelled'].includes(res.body.status)) return res;
    await sleep(25);
  }
  throw new Error(`plan ${id} did not finish in time`);
}

describe('receive arrays through the HTTP API', () => {
  const t = sharedTestApp({ limits: { maxMatrixSide: 128 } });

  it('8 loops, zero-filled: 201 with the array echoed, its fit error, and a coil-maps montage', async () => {
    const res = await postJson(t, '/v1/reconstructions', { ...request, coils: loops });
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.coils).toMatchObject({ array: 'loops', count: 8, label: '8 loops' });
    expect(res.body.coils.fitError).toBeGreaterThan(0);
    expect(res.body.coils.fitError).toBeLessThan(0.02); // measured 0.0066 for this array at 32²
    // Zero-filled R = 2 plus 4 ACS lines folds the object: a clear error, but a finite one (measured
    // NRMSE 0.277 with a sensitivity-weighted combination; the single coil gives 0.387).
    expect(res.body.metrics.nrmse).toBeGreaterThan(0.05);
    expect(res.body.metrics.nrmse).toBeLessThan(1);
    expect(res.body.gFactor).toBeUndefined(); // no g-factor for zero-filled until pseudo-replicas exist
    const png = await t.http().get(res.body.images.coilMaps).buffer(true).parse(binary);
    expect(png.status).toBe(200);
    const meta = await sharp(png.body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['png', 96, 96]); // 3 × 3 tiles of 32²
  });

  it('coils: { array: "uniform" } answers the same metrics as no coils piece (today’s single coil)', async () => {
    const today = await postJson(t, '/v1/reconstructions', request);
    const uniform = await postJson(t, '/v1/reconstructions', { ...request, coils: { array: 'uniform' } });
    expect(today.status).toBe(201);
    expect(uniform.status).toBe(201);
    expect(uniform.body.metrics).toEqual(today.body.metrics);
    expect(uniform.body.coils).toBeUndefined();
    expect(Object.keys(uniform.body.images).sort()).toEqual(Object.keys(today.body.images).sort());
  });

  it('phase alone: one coil, a complex object; fully sampled zero-filled still equals the reference', async () => {
    const res = await postJson(t, '/v1/reconstructions', {
      ...request,
      sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
      noise: { snr: 'none' },
      phase: { order: 2, seed: 3 },
    });
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.metrics.nrmse).toBeLessThan(1e-12); // |F⁻¹F x| = |x| (docs/design.md §3.6)
    expect(res.body.coils).toBeUndefined();
    const plain = await postJson(t, '/v1/reconstructions', request);
    const phased = await postJson(t, '/v1/reconstructions', { ...request, phase: { order: 2, seed: 3 } });
    // The phase moves aliasing and ringing about, so undersampled scores differ from the real object's.
    expect(phased.body.metrics.nrmse).not.toBe(plain.body.metrics.nrmse);
  });

  it('GRAPPA with gFactor.replicas: a pseudo-replica g map over HTTP, with g-factor.png', async () => {
    const res = await postJson(t, '/v1/reconstructions', {
      ...request,
      sampling: { pattern: 'cartesian-uniform', acceleration: 2, acs: 16 },
      noise: { snr: 40 },
      method: { name: 'grappa' },
      coils: loops,
      gFactor: { replicas: 6 },
    });
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.gFactor).toMatchObject({ method: 'pseudo-replica', replicas: 6 });
    // Robson et al. 2008: g = σ_R / (σ_full·√R) ≈ 1 for GRAPPA at R = 2 with 8 coils (measured
    // mean 1.17 with 10 replicas at 64²; 6 replicas are noisier, hence the wide band).
    expect(res.body.gFactor.mean).toBeGreaterThan(0.8);
    expect(res.body.gFactor.mean).toBeLessThan(1.6);
    expect(res.body.images.gFactor).toBeDefined();
    const png = await t.http().get(res.body.images.gFactor).expect(200);
    expect(png.headers['content-type']).toBe('image/png');
    const bad = await postProblem(
      t,
      '/v1/reconstructions',
      { ...request, coils: loops, gFactor: { replicas: 1 } },
      422,
      'gFactor.replicas',
    );
    expect(bad.errors[0].field).toBe('gFactor.replicas');
  });

  it('bad pieces are 422 naming the field: coils.count 33, coils.correlation, phase.order; unknown uploaded maps a 404', async () => {
    const tooMany = await postProblem(
      t,
      '/v1/reconstructions',
      { ...request, coils: { ...loops, count: 33 } },
      422,
      'coils.count',
    );
    expect(tooMany.errors[0].allowed).toBe('≤ 32');
    await postProblem(
      t,
      '/v1/reconstructions',
      { ...request, coils: { ...loops, correlation: 0.7 } },
      422,
      'coils.correlation',
    );
    await postProblem(
      t,
      '/v1/reconstructions',
      { ...request, phase: { order: 9, seed: 1 } },
      422,
      'phase.order',
    );
    await postProblem(
      t,
      '/v1/reconstructions',
      { ...request, coils: { mapsId: 'nothing' } },
      404,
      'coils.mapsId',
    );
  });

  it('a plan over two arrays has rows per array with the coils and g-factor columns, in JSON and CSV', async () => {
    const res = await postJson(t, '/v1/plans', {
      ...oneCellPlan,
      coilArrays: [{ array: 'uniform' }, loops],
      target: { metric: 'ssim', atLeast: 0.5 },
      targets: [{ metric: 'nrmse', atMost: 1 }],
    });
    expect(res.status).toBe(202);
    const done = await finishedPlan(t, res.body.id);
    expect(done.body.status).toBe('done');
    await expectDocumented('GET', `/v1/plans/${res.body.id}`, done);
    expect(done.body.progress).toMatchObject({ done: 3, total: 3 });
    const rows = done.body.table.rows;
    expect(
      rows.map((r: { key: string; coils: string; coilCount: number }) => [r.key, r.coils, r.coilCount]),
    ).toEqual([
      ['reference', 'uniform', 1],
      ['p0-r0-m0', 'uniform', 1],
      ['p0-r0-m0-c1', '8 loops', 8],
    ]);
    for (const row of rows)
      expect([row.gFactorMean, row.gFactorMax, row.gFactorMethod]).toEqual([null, null, null]);
    expect(done.body.recommendation.targets).toHaveLength(2);
    const csv = await t.http().get(`/v1/plans/${res.body.id}/table.csv`);
    const header = csv.text.split('\r\n')[0].split(',');
    expect(header).toEqual(
      expect.arrayContaining(['coils', 'coil_count', 'g_factor_mean', 'g_factor_max', 'g_factor_method']),
    );
    expect(csv.text.split('\r\n')[3].split(',')[header.indexOf('coils')]).toBe('8 loops');
  });

  it('receive arrays on a radial trajectory over HTTP: sense 201, grappa a 422 naming method.name, a plan with coilArrays × radial', async () => {
    const radial = {
      ...request,
      sampling: { pattern: 'radial', acceleration: 2 },
      method: { name: 'sense', iterations: 10 },
      coils: loops,
    };
    const res = await t.http().post('/v1/reconstructions').send(radial);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.coils).toMatchObject({ array: 'loops', count: 8 });
    expect(res.body.info).toMatchObject({ maps: 'true', coils: 8, dataWeighting: 'radial-ramp' });
    // SENSE with the true maps against the multi-coil gridding of the same samples (its zero-filled image).
    const zf = await t
      .http()
      .post('/v1/reconstructions')
      .send({ ...radial, method: { name: 'zero-filled' } });
    expect(zf.status).toBe(201);
    expect(res.body.metrics.nrmse).toBeLessThan(zf.body.metrics.nrmse);
    const problem = await postProblem(
      t,
      '/v1/reconstructions',
      { ...radial, method: { name: 'grappa' } },
      422,
      'method.name',
    );
    expect(problem.errors[0].message).toContain('grappa');
    const plan = await t
      .http()
      .post('/v1/plans')
      .send({
        ...oneCellPlan,
        patterns: [{ pattern: 'radial' }],
        coilArrays: [{ array: 'uniform' }, loops],
        methods: [{ name: 'zero-filled' }],
      });
    expect(plan.status).toBe(202);
    const done = await finishedPlan(t, plan.body.id);
    expect(done.body.status).toBe('done');
    await expectDocumented('GET', `/v1/plans/${plan.body.id}`, done);
    const rows = done.body.table.rows as { key: string; coils: string; nrmse: number }[];
    expect(rows.map((r) => [r.key, r.coils])).toEqual([
      ['reference', 'uniform'],
      ['p0-r0-m0', 'uniform'],
      ['p0-r0-m0-c1', '8 loops'],
    ]);
  });

  it('plan targets: a lesion task score in a plan without lesions is a 422 naming targets[0].metric', async () => {
    const problem = await postProblem(
      t,
      '/v1/plans',
      {
        ...oneCellPlan,
        targets: [{ metric: 'falseLesions', atMost: 0 }],
      },
      422,
      'targets[0].metric',
    );
    expect(problem.errors[0].message).toMatch(/task score/);
  });
});
