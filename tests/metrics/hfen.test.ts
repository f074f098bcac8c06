import { describe, expect, it } from 'vitest';
import type { RealImage } from '../../src/core/real-image.ts';
import { hfen, highFrequencyErrorNorm, laplacianOfGaussian } from '../../src/metrics/index.ts';
import { maxAbsDifference } from '../error-measures.ts';
import {
  caseImages,
  FIXTURE_TOLERANCE,
  fixtureImage,
  fixtures,
  itMatchesFixtures,
  itMatchesMaskedFixtures,
  randomUniformImage,
} from './metric-fixtures.ts';

describe('hfen against scipy.ndimage (fixture by tests/reference/generate_fixtures.py)', () => {
  // Fixture HFEN: L = gaussian_laplace(sigma=1.5, truncate=4.8 → 15 taps, mode='reflect')
  // − kernelSum · uniform_filter(size=15, mode='reflect'), i.e. the zero-sum 15×15 LoG.
  itMatchesFixtures('hfen', hfen, (c) => `${c.name}: zero-sum LoG HFEN matches to 1e-12`);
  for (const c of fixtures.cases) {
    it(`${c.name}: with gaussian_laplace's own kernel matches to 1e-12`, () => {
      const { estimate, reference } = caseImages(c);
      const value = highFrequencyErrorNorm(estimate, reference, undefined, false);
      expect(Math.abs(value - c.hfenGaussianLaplace)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    });
  }
  itMatchesMaskedFixtures(
    'hfen',
    (estimate, reference, mask) => hfen(estimate, reference, mask),
    1e-4,
    (c) => `${c.name}: norms over the mask match to 1e-12`,
  );

  it('filter output on a 6×5 image (shorter than the kernel: repeated reflection) equals scipy to 1e-12', () => {
    const f = fixtures.logFilter;
    const image = fixtureImage(f.image, f.nx, f.ny);
    const raw = laplacianOfGaussian(new Float64Array(f.nx * f.ny), image.data, f.nx, f.ny, false);
    expect(maxAbsDifference(raw, f.gaussianLaplace)).toBeLessThanOrEqual(1e-12);
    const zeroSum = laplacianOfGaussian(new Float64Array(f.nx * f.ny), image.data, f.nx, f.ny, true);
    expect(maxAbsDifference(zeroSum, f.zeroSum)).toBeLessThanOrEqual(1e-12);
  });
});

describe('hfen kernel and worked values (docs/references.md §6, Ravishankar & Bresler 2011)', () => {
  it('the filter is the 15×15 zero-sum LoG of the published reference code, σ = 1.5', () => {
    // Published definition, built directly in 2D: h = exp(−(u² + v²)/(2σ²)) normalised to sum 1 over
    // 15×15, k = h·(u² + v² − 2σ²)/σ⁴, kernel = k − mean(k). The filter's response to a centred
    // delta on a 31×31 image is that kernel (it is symmetric, so correlation = convolution).
    const n = 31;
    const delta = new Float64Array(n * n);
    delta[15 * n + 15] = 1;
    const response = laplacianOfGaussian(new Float64Array(n * n), delta, n, n, true);
    const s2 = 1.5 * 1.5;
    let hSum = 0;
    for (let u = -7; u <= 7; u++) for (let v = -7; v <= 7; v++) hSum += Math.exp(-(u * u + v * v) / (2 * s2));
    const k: number[] = [];
    for (let u = -7; u <= 7; u++)
      for (let v = -7; v <= 7; v++)
        k.push(((Math.exp(-(u * u + v * v) / (2 * s2)) / hSum) * (u * u + v * v - 2 * s2)) / (s2 * s2));
    const kMean = k.reduce((s, v) => s + v, 0) / k.length;
    let worst = 0;
    let outside = 0;
    let i = 0;
    for (let row = 0; row < n; row++)
      for (let col = 0; col < n; col++) {
        const value = response[row * n + col];
        if (Math.abs(row - 15) <= 7 && Math.abs(col - 15) <= 7) {
          const u = row - 15;
          const v = col - 15;
          worst = Math.max(worst, Math.abs(value - (k[(u + 7) * 15 + (v + 7)] - kMean)));
          i++;
        } else outside = Math.max(outside, Math.abs(value));
      }
    expect(i).toBe(225);
    expect(worst).toBeLessThan(1e-15);
    expect(outside).toBe(0);
    expect(Math.abs(response.reduce((s, v) => s + v, 0))).toBeLessThan(1e-15);
    expect(response[15 * n + 15]).toBeCloseTo(k[7 * 15 + 7] - kMean, 15);
    expect(response[15 * n + 15]).toBeLessThan(0);
  });

  it('HFEN(x, x) = 0', () => {
    const x = randomUniformImage(20, 18, 3);
    expect(hfen(x, x)).toBe(0);
  });

  it('HFEN(x, x + c) ≈ 0 — with the reflect boundary everywhere, borders included', () => {
    const x = randomUniformImage(33, 27, 4);
    const shifted: RealImage = { nx: 33, ny: 27, data: x.data.map((v) => v + 0.3) };
    expect(hfen(shifted, x)).toBeLessThan(1e-12);
    // The un-corrected sampled LoG (sum ≈ −9e-6) does see the offset, so the check above tests the
    // zero-sum construction and not a trivially zero quantity.
    expect(highFrequencyErrorNorm(shifted, x, undefined, false)).toBeGreaterThan(1e-6);
  });

  it('is a norm of the error: HFEN(x + 2e) = 2·HFEN(x + e) (the filter is linear)', () => {
    const x = randomUniformImage(25, 21, 5);
    const e = randomUniformImage(25, 21, 6);
    const once: RealImage = { nx: 25, ny: 21, data: x.data.map((v, i) => v + 0.1 * e.data[i]) };
    const twice: RealImage = { nx: 25, ny: 21, data: x.data.map((v, i) => v + 0.2 * e.data[i]) };
    expect(hfen(twice, x)).toBeCloseTo(2 * hfen(once, x), 12);
  });
});
