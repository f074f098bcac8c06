import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MAX_DETAIL_CHARS, MAX_ECHO_CHARS } from '../../src/core/echo-bound.ts';
import {
  expectProblem,
  oneCellPlan,
  oneReconstruction,
  postJson,
  postProblem,
  sharedTestApp,
} from './helpers.ts';

// Problem details (RFC 9457) echo request parts; they are bounded, and request strings have
// maximum lengths. Before: a 7 MiB phantom name came back twice (14.7 MB) and, in a plan, grew the
// data folder by 52 MB.

const huge = 'x'.repeat(1024 * 1024);
const plan = oneCellPlan;

function folderBytes(dir: string): number {
  return readdirSync(dir).reduce((sum, name) => sum + statSync(join(dir, name)).size, 0);
}

/** Every text of a problem within its bound. */
function expectBounded(problem: ReturnType<typeof expectProblem>): void {
  expect(problem.detail.length).toBeLessThanOrEqual(MAX_DETAIL_CHARS);
  for (const entry of problem.errors) {
    for (const text of [entry.field, entry.message, entry.allowed ?? ''])
      expect(text.length).toBeLessThanOrEqual(MAX_ECHO_CHARS);
  }
}

describe('bounded echoes and bounded request strings', () => {
  const t = sharedTestApp({ maxJsonBytes: 4 * 1024 * 1024 });

  it('a 1 MiB phantom name in a reconstruction: 422 naming source.phantom, a small answer', async () => {
    const res = await postJson(t, '/v1/reconstructions', { ...oneReconstruction, source: { phantom: huge } });
    const problem = expectProblem(res, 422, 'source.phantom');
    expectBounded(problem);
    expect(res.text.length).toBeLessThan(4096);
  });

  it('a 1 MiB phantom name in a plan: refused, nothing stored (data folder grows < 64 KiB)', async () => {
    const before = folderBytes(t.dataDir);
    const res = await postJson(t, '/v1/plans', { ...plan, source: { phantom: huge } });
    expectBounded(expectProblem(res, 422, 'source.phantom'));
    expect(res.text.length).toBeLessThan(4096);
    expect(folderBytes(t.dataDir) - before).toBeLessThan(64 * 1024);
  });

  it('a 100 KiB unknown key: 400 whose field is cut with an ellipsis', async () => {
    const key = 'k'.repeat(100 * 1024);
    const res = await postJson(t, '/v1/masks', {
      matrix: { nx: 32, ny: 32 },
      sampling: { pattern: 'radial', acceleration: 2 },
      [key]: 1,
    });
    const problem = expectProblem(res, 400);
    expectBounded(problem);
    expect(problem.errors[0].field.endsWith('…')).toBe(true);
    expect(problem.errors[0].field.startsWith('kkkk')).toBe(true);
  });

  it('thousands of unknown keys: at most 50 entries, the rest counted', async () => {
    const body: Record<string, unknown> = { matrix: { nx: 32, ny: 32 } };
    for (let i = 0; i < 3000; i++) body[`extra${i}`] = i;
    const problem = await postProblem(t, '/v1/masks', body, 400);
    expect(problem.errors.length).toBe(50);
    expect(problem.errors[49].message).toMatch(/more problems not listed/);
  });

  it('a long unknown phantom name in the URL of a raster: 414 or 422, never echoed whole', async () => {
    const res = await t.http().get(`/v1/phantoms/${'p'.repeat(150)}`);
    // 150 characters pass the router (≤ 200) and meet the name's 100-character maximum.
    expectBounded(expectProblem(res, 422, 'name'));
  });
});
