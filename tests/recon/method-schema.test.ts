import { describe, expect, it } from 'vitest';
import { methodSchema, reconMethods } from '../../src/recon/index.ts';

describe('methodSchema (the request piece, docs/design.md §4.3 "method")', () => {
  it('accepts the documented forms', () => {
    for (const spec of [
      { name: 'zero-filled' },
      { name: 'zero-filled', densityCompensation: true },
      { name: 'cs-tv', lambda: 0.005, iterations: 100 },
      { name: 'lowrank-hankel', kernel: 7, rank: 20, iterations: 50 },
      { name: 'lowrank-hankel', kernel: [9, 5], energy: 0.98, weighting: 'none' },
      { name: 'sense', maps: 'acs', iterations: 30, tikhonov: 0.01, tolerance: 1e-6 },
      { name: 'sense', maps: 'true' },
      { name: 'grappa', kernel: [4, 5], tikhonov: 0.001 },
    ]) {
      expect(methodSchema.safeParse(spec).success).toBe(true);
    }
  });

  it('rejects unknown names, unknown keys and out-of-range values', () => {
    for (const spec of [
      { name: 'magic' },
      { name: 'cs-tv', lamda: 0.1 },
      { name: 'cs-tv', lambda: -1 },
      { name: 'cs-tv', iterations: 0 },
      { name: 'lowrank-hankel', kernel: 0 },
      { name: 'lowrank-hankel', weighting: 'laplacian' },
      { name: 'lowrank-hankel', energy: 1 },
      { name: 'sense', maps: 'espirit' },
      { name: 'sense', tikhonov: -0.1 },
      { name: 'grappa', kernel: [4] },
      { name: 'grappa', kernel: [0, 5] },
      { name: 'grappa', lambda: 0.1 },
    ]) {
      expect(methodSchema.safeParse(spec).success).toBe(false);
    }
  });

  it('every registered method has a schema member and vice versa', () => {
    expect([...reconMethods.keys()].sort()).toEqual([
      'cs-tv',
      'cs-wavelet',
      'grappa',
      'lowrank-hankel',
      'sense',
      'zero-filled',
    ]);
    for (const name of reconMethods.keys()) expect(methodSchema.safeParse({ name }).success).toBe(true);
  });
});
