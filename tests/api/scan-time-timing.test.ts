import { describe, expect, it } from 'vitest';
import { expectDocumented, postJson, postProblem, sharedTestApp } from './helpers.ts';

// Echo-train timing over HTTP (docs/design.md §2.2); the arithmetic is written out in
// tests/protocol/echo-train-timing.test.ts.
describe('POST /v1/scan-time: echo spacing, slices per TR, effective TE, partial Fourier and lattices', () => {
  const t = sharedTestApp();
  const matrix = { nx: 256, ny: 256 };
  const protocol = { trMs: 3000, echoTrainLength: 16, echoSpacingMs: 10, slices: 20, teMs: 90 };

  it('TR 3000, ETL 16, ES 10, 20 slices: 18 slices per TR, 2 passes, 96 s, TE_eff 90 ms', async () => {
    const res = await postJson(t, '/v1/scan-time', { matrix, protocol });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ seconds: 96, slicesPerTr: 18, passes: 2, effectiveTeMs: 90 });
    await expectDocumented('POST', '/v1/scan-time', res);
  });

  it('sampling.partialFourier 0.625 counts the 160 kept rows: 60 s', async () => {
    const res = await postJson(t, '/v1/scan-time', {
      matrix,
      protocol,
      sampling: { pattern: 'cartesian-uniform', acceleration: 1, partialFourier: 0.625 },
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ acquired: 160, seconds: 60 });
  });

  it('a 3D lattice (R = 4 on 64×32 ky–kz, rows 2, shift 1, ACS 0): 512 points at TR 10 ms → 5.12 s', async () => {
    const res = await postJson(t, '/v1/scan-time', {
      matrix: { nx: 32, ny: 64 },
      protocol: { dimensions: '3d', trMs: 10 },
      sampling: { pattern: 'lattice', acceleration: 4, rows: 2, shift: 1 },
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ acquired: 512, unit: 'points', seconds: 5.12 });
  });

  it('impossible protocols are 422 problems naming the fields', async () => {
    const long = await postProblem(
      t,
      '/v1/scan-time',
      { matrix, protocol: { ...protocol, trMs: 150, teMs: 90 } },
      422,
    );
    expect(long.errors.map((e) => e.field)).toEqual([
      'protocol.echoTrainLength',
      'protocol.echoSpacingMs',
      'protocol.trMs',
    ]);
    const te = await postProblem(t, '/v1/scan-time', { matrix, protocol: { ...protocol, teMs: 200 } }, 422);
    expect(te.errors[0].field).toBe('protocol.teMs');
    const perPass = await postProblem(
      t,
      '/v1/scan-time',
      { matrix, protocol: { ...protocol, slicesPerPass: 19 } },
      422,
    );
    expect(perPass.errors[0].field).toBe('protocol.slicesPerPass');
    const radial = await postProblem(
      t,
      '/v1/scan-time',
      { matrix, protocol, sampling: { pattern: 'radial', acceleration: 2, partialFourier: 0.75 } },
      422,
    );
    expect(radial.errors[0].field).toBe('sampling.partialFourier');
    const lattice = await postProblem(
      t,
      '/v1/scan-time',
      { matrix, protocol, sampling: { pattern: 'lattice', acceleration: 3, rows: 2 } },
      422,
    );
    expect(lattice.errors.map((e) => e.field)).toEqual(['sampling.acceleration', 'sampling.rows']);
  });
});
