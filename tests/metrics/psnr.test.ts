import { describe, expect, it } from 'vitest';
import { psnr } from '../../src/metrics/index.ts';
import { itMatchesFixtures, itMatchesMaskedFixtures } from './metric-fixtures.ts';

describe('psnr against scikit-image (fixture by tests/reference/generate_fixtures.py)', () => {
  // skimage.metrics.peak_signal_noise_ratio(reference, estimate, data_range=max|reference|): skimage's
  // data_range plays the peak's part, so passing max |x| gives the definition of docs/design.md §3.6.
  itMatchesFixtures('psnr', psnr, (c) => `${c.name}: matches skimage to 1e-12 dB`);
  itMatchesMaskedFixtures(
    'psnr',
    (estimate, reference, mask) => psnr(estimate, reference, mask),
    1e-2,
    (c) => `${c.name}: MSE over the mask, peak of the whole reference, matches skimage to 1e-12 dB`,
  );
});

describe('psnr worked values (docs/references.md §6)', () => {
  it('MAX = 1, MSE = 1e-3 → 30 dB', () => {
    // reference peak 1; errors ±√(2e-3) on half the pixels → mean squared error 1e-3.
    const e = Math.sqrt(2e-3);
    const reference = { nx: 2, ny: 2, data: Float64Array.of(1, 0.5, 0.25, 0) };
    const estimate = { nx: 2, ny: 2, data: Float64Array.of(1 + e, 0.5, 0.25 - e, 0) };
    expect(psnr(estimate, reference)).toBeCloseTo(30, 10);
  });

  it('MAX = 255, MSE = 65.025 → 30 dB', () => {
    const e = Math.sqrt(65.025);
    const reference = { nx: 1, ny: 2, data: Float64Array.of(255, 100) };
    const estimate = { nx: 1, ny: 2, data: Float64Array.of(255 - e, 100 + e) };
    expect(psnr(estimate, reference)).toBeCloseTo(30, 10);
  });

  it('the peak is max |x|, so a negative extreme counts (magnitude convention, docs/design.md §3.6)', () => {
    const reference = { nx: 2, ny: 1, data: Float64Array.of(-2, 1) };
    const estimate = { nx: 2, ny: 1, data: Float64Array.of(-2, 1.2) };
    // MSE = 0.04 / 2 = 0.02; peak 2 → 10·log10(4 / 0.02)
    expect(psnr(estimate, reference)).toBeCloseTo(10 * Math.log10(200), 12);
  });

  it('identical images give +Infinity (MSE 0)', () => {
    const x = { nx: 2, ny: 1, data: Float64Array.of(1, 2) };
    expect(psnr(x, x)).toBe(Number.POSITIVE_INFINITY);
  });
});
