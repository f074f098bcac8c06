import { describe, expect, it } from 'vitest';
import { nrmse } from '../../src/metrics/index.ts';
import { itMatchesFixtures, itMatchesMaskedFixtures } from './metric-fixtures.ts';

describe('nrmse against scikit-image (fixture by tests/reference/generate_fixtures.py)', () => {
  // skimage.metrics.normalized_root_mse(reference, estimate, normalization='euclidean').
  itMatchesFixtures('nrmse', nrmse, (c) => `${c.name}: matches skimage to 1e-12`);
  itMatchesMaskedFixtures(
    'nrmse',
    (estimate, reference, mask) => nrmse(estimate, reference, mask),
    1e-4,
    (c) => `${c.name}: over the mask matches skimage on the masked pixels to 1e-12`,
  );
});

describe('nrmse worked values (docs/references.md §6)', () => {
  it('x = [3, 4], x̂ = [3, 5] → 0.2, NMSE 0.04', () => {
    const reference = { nx: 2, ny: 1, data: Float64Array.of(3, 4) };
    const estimate = { nx: 2, ny: 1, data: Float64Array.of(3, 5) };
    expect(nrmse(estimate, reference)).toBeCloseTo(0.2, 15);
    expect(nrmse(estimate, reference) ** 2).toBeCloseTo(0.04, 15);
  });

  it('a mask restricts both norms: pixels [3, 4, 10] vs [3, 5, 0] with the last one masked out → 0.2', () => {
    const reference = { nx: 3, ny: 1, data: Float64Array.of(3, 4, 10) };
    const estimate = { nx: 3, ny: 1, data: Float64Array.of(3, 5, 0) };
    expect(nrmse(estimate, reference, Uint8Array.of(1, 1, 0))).toBeCloseTo(0.2, 15);
  });

  it('nrmse(x, x) = 0', () => {
    const x = { nx: 2, ny: 2, data: Float64Array.of(1, 2, 3, 4) };
    expect(nrmse(x, x)).toBe(0);
  });
});
