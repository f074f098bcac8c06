import { describe, expect, it } from 'vitest';
import { expectDocumented, loadSpec, postJson, postProblem, sharedTestApp } from './helpers.ts';

// `protocol.averages` is DICOM Number of Averages (0018,0083); its former alias `nex` was removed
// (docs/design.md §4.3). Expected times from the TA formula of docs/references.md §8:
// TR 1000 ms × 64 lines × averages.
describe('POST /v1/scan-time: averages', () => {
  const t = sharedTestApp();

  const matrix = { nx: 64, ny: 64 };

  it('averages 2 → 128 s', async () => {
    const res = await postJson(t, '/v1/scan-time', { matrix, protocol: { trMs: 1000, averages: 2 } });
    expect(res.status).toBe(200);
    expect(res.body.seconds).toBe(128);
    await expectDocumented('POST', '/v1/scan-time', res);
  });

  it('the removed alias nex is refused as an unknown field naming protocol.nex', async () => {
    const problem = await postProblem(t, '/v1/scan-time', { matrix, protocol: { trMs: 1000, nex: 2 } }, 400);
    expect(problem.errors).toEqual([
      { field: 'protocol.nex', message: 'unknown field', allowed: 'the documented fields only' },
    ]);
  });

  it('plans refuse it the same way', async () => {
    const problem = await postProblem(
      t,
      '/v1/plans',
      {
        source: { phantom: 'shepp-logan-modified' },
        matrix: { nx: 32, ny: 32 },
        protocol: { trMs: 500, averages: 1, nex: 2 },
        patterns: [{ pattern: 'cartesian-uniform' }],
        accelerations: [1],
        methods: [{ name: 'zero-filled' }],
        seeds: 1,
      },
      400,
    );
    expect(problem.errors.map((e) => e.field)).toEqual(['protocol.nex']);
  });

  it('openapi.yaml documents averages (default 1) and no alias', async () => {
    const spec = (await loadSpec()) as unknown as {
      paths: Record<string, { post: { requestBody: { content: Record<string, { schema: unknown }> } } }>;
    };
    const body = spec.paths['/v1/scan-time'].post.requestBody.content['application/json'].schema as {
      properties: { protocol: { properties: Record<string, { default?: unknown; deprecated?: boolean }> } };
    };
    const fields = body.properties.protocol.properties;
    expect(fields.averages.default).toBe(1);
    expect(fields.averages.deprecated).toBeUndefined();
    expect(Object.keys(fields)).not.toContain('nex');
  });
});
