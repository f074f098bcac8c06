import { describe, expect, it } from 'vitest';
import type { RealImage } from '../../src/core/real-image.ts';
import { ssim, ssimWindow } from '../../src/metrics/index.ts';
import {
  caseImages,
  FIXTURE_TOLERANCE,
  fixtures,
  itMatchesFixtures,
  itMatchesMaskedFixtures,
  maskedCases,
  randomUniformImage,
} from './metric-fixtures.ts';

function constant(nx: number, ny: number, value: number): RealImage {
  return { nx, ny, data: new Float64Array(nx * ny).fill(value) };
}

describe('ssim against scikit-image (fixture by tests/reference/generate_fixtures.py)', () => {
  // skimage.metrics.structural_similarity(gaussian_weights=True, sigma=1.5,
  // use_sample_covariance=False, data_range=max−min of the reference), Debian python3-skimage.
  itMatchesFixtures('ssim', ssim, (c) => `${c.name}: matches skimage to 1e-12`);

  const explicit = fixtures.cases.filter((c) => c.ssimExplicit);
  it('the fixture holds one explicit-data-range case and one masked case', () => {
    expect(explicit.map((c) => c.name)).toEqual(['smooth-noise-48x64']);
    expect(maskedCases.map((c) => c.name)).toEqual(['masked-41x37']);
  });
  for (const c of explicit) {
    it(`${c.name}: dataRange ${c.ssimExplicit!.dataRange} matches skimage data_range to 1e-12`, () => {
      const { estimate, reference } = caseImages(c);
      const value = ssim(estimate, reference, { dataRange: c.ssimExplicit!.dataRange });
      expect(Math.abs(value - c.ssimExplicit!.ssim)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
      expect(Math.abs(value - c.ssim)).toBeGreaterThan(1e-3); // the option really changes L
    });
  }

  itMatchesMaskedFixtures(
    'ssim',
    (estimate, reference, mask) => ssim(estimate, reference, { mask }),
    1e-5,
    (c) =>
      `${c.name}: SSIM map averaged over the mask matches skimage's full map, cropped and masked, to 1e-12`,
  );
});

describe('ssim worked values (docs/references.md §6, Wang et al. 2004)', () => {
  it('SSIM(x, x) = 1 for any image and any L', () => {
    const x = randomUniformImage(23, 17, 5);
    expect(ssim(x, x)).toBeCloseTo(1, 14);
    expect(ssim(x, x, { dataRange: 1e-3 })).toBeCloseTo(1, 14);
  });

  it('Gaussian window 11×11, σ 1.5, sum 1: centre 0.0707622378, corner 1.0575656e-6 (docs/references.md §6 [C])', () => {
    const w = ssimWindow();
    expect(w.length).toBe(11);
    expect(w.reduce((s, v) => s + v, 0)).toBeCloseTo(1, 15);
    expect(w[5] * w[5]).toBeCloseTo(0.0707622378, 10);
    expect(w[0] * w[0]).toBeCloseTo(1.0575656e-6, 12);
    expect(w[0] * w[10]).toBeCloseTo(1.0575656e-6, 12);
  });

  // For constant images σ = 0 in every window, so each window's value is the luminance term
  // (2μxμy + C1)/(μx² + μy² + C1). Checking one window (11×11) and many windows (29×17) shows the
  // mean over windows reproduces the per-window expression.
  it('constant 0.5 vs 0.6, L = 1 → 0.98360924 per window, for one window and for many', () => {
    expect(ssim(constant(11, 11, 0.5), constant(11, 11, 0.6), { dataRange: 1 })).toBeCloseTo(0.98360924, 8);
    expect(ssim(constant(29, 17, 0.5), constant(29, 17, 0.6), { dataRange: 1 })).toBeCloseTo(0.98360924, 8);
  });

  it('constant 100 vs 110, L = 255 → 0.99547644', () => {
    expect(ssim(constant(13, 12, 100), constant(13, 12, 110), { dataRange: 255 })).toBeCloseTo(0.99547644, 8);
  });

  it('offset image y = x + c: the mean over windows of the luminance term with each local mean', () => {
    // docs/references.md §6: an offset keeps σ and σxy, so every window gives (2μ(μ+c) + C1)/(μ² + (μ+c)² + C1)
    // with its own local mean μ. The window here is built directly in 2D from the formula
    // exp(−(u² + v²)/(2·1.5²)) normalised to sum 1 (Wang et al. 2004), not from the separable code.
    const nx = 24;
    const ny = 19;
    const x = randomUniformImage(nx, ny, 9);
    const c = 0.2;
    const y: RealImage = { nx, ny, data: x.data.map((v) => v + c) };
    const window: number[] = [];
    let total = 0;
    for (let u = -5; u <= 5; u++)
      for (let v = -5; v <= 5; v++) {
        const wt = Math.exp(-(u * u + v * v) / (2 * 1.5 * 1.5));
        window.push(wt);
        total += wt;
      }
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of x.data) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    const c1 = (0.01 * (hi - lo)) ** 2;
    let sum = 0;
    let windows = 0;
    for (let i = 5; i < ny - 5; i++)
      for (let j = 5; j < nx - 5; j++) {
        let mu = 0;
        let k = 0;
        for (let u = -5; u <= 5; u++)
          for (let v = -5; v <= 5; v++) mu += (window[k++] / total) * x.data[(i + u) * nx + j + v];
        sum += (2 * mu * (mu + c) + c1) / (mu * mu + (mu + c) ** 2 + c1);
        windows++;
      }
    const expected = sum / windows;
    expect(ssim(y, x)).toBeCloseTo(expected, 12);
    // The expression at the global mean differs, so the check above can tell the two apart.
    const mean = x.data.reduce((s, v) => s + v, 0) / x.data.length;
    const atGlobalMean = (2 * mean * (mean + c) + c1) / (mean * mean + (mean + c) ** 2 + c1);
    expect(Math.abs(atGlobalMean - expected)).toBeGreaterThan(1e-4);
  });

  it('is symmetric in its two images at a fixed L (the formula is)', () => {
    const a = randomUniformImage(16, 14, 1);
    const b = randomUniformImage(16, 14, 2);
    expect(ssim(a, b, { dataRange: 1 })).toBeCloseTo(ssim(b, a, { dataRange: 1 }), 14);
  });
});
