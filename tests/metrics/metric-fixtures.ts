import { readFileSync } from 'node:fs';
import { expect, it } from 'vitest';
import { SeededRandom } from '../../src/core/random.ts';
import type { RealImage } from '../../src/core/real-image.ts';

/**
 * Loader for tests/reference/fixtures/metrics.json, written by tests/reference/generate_fixtures.py
 * with Debian's python3-numpy / python3-scipy / python3-skimage. Images are stored as integers
 * times `imageScale` (a power of two), so the float64 values here equal the ones Python scored.
 */
export interface MetricCase {
  name: string;
  ny: number;
  nx: number;
  reference: number[];
  estimate: number[];
  ssimDataRange: number;
  ssim: number;
  psnrPeak: number;
  psnr: number;
  nrmse: number;
  hfen: number;
  hfenGaussianLaplace: number;
  ssimExplicit?: { dataRange: number; ssim: number };
  mask?: number[];
  masked?: { ssim: number; psnr: number; nrmse: number; hfen: number };
}

export interface MetricFixtures {
  versions: Record<string, string>;
  imageScale: number;
  logKernelSum: number;
  cases: MetricCase[];
  logFilter: { ny: number; nx: number; image: number[]; gaussianLaplace: number[]; zeroSum: number[] };
}

export const fixtures: MetricFixtures = JSON.parse(
  readFileSync(new URL('../reference/fixtures/metrics.json', import.meta.url), 'utf8'),
);

export function fixtureImage(values: number[], nx: number, ny: number): RealImage {
  return { nx, ny, data: Float64Array.from(values, (v) => v * fixtures.imageScale) };
}

export function caseImages(c: MetricCase): { estimate: RealImage; reference: RealImage; mask?: Uint8Array } {
  return {
    estimate: fixtureImage(c.estimate, c.nx, c.ny),
    reference: fixtureImage(c.reference, c.nx, c.ny),
    mask: c.mask ? Uint8Array.from(c.mask) : undefined,
  };
}

export const maskedCases = fixtures.cases.filter((c) => c.mask && c.masked);

/**
 * Agreement demanded with every fixture value. Measured: ≤ 6e-15 for all four metrics on every case
 * (the same float64 formulas, summed in another order), so 1e-12 keeps ~100× slack while a change
 * of window, boundary rule or normalisation moves the values by 1e-4 or more.
 */
export const FIXTURE_TOLERANCE = 1e-12;

/** The metrics every fixture case carries a value of, over the whole image and over its mask. */
export type FixtureMetric = keyof NonNullable<MetricCase['masked']>;

/** One `it` per fixture case: `metric` over the whole images equals the fixture value to FIXTURE_TOLERANCE. */
export function itMatchesFixtures(
  key: FixtureMetric,
  metric: (estimate: RealImage, reference: RealImage) => number,
  title: (c: MetricCase) => string,
): void {
  for (const c of fixtures.cases) {
    it(title(c), () => {
      const { estimate, reference } = caseImages(c);
      expect(Math.abs(metric(estimate, reference) - c[key])).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    });
  }
}

/**
 * One `it` per masked fixture case: `metric` over the mask equals the fixture's masked value to
 * FIXTURE_TOLERANCE, and differs from the whole-image value by more than `apart`, so the mask mattered.
 */
export function itMatchesMaskedFixtures(
  key: FixtureMetric,
  metric: (estimate: RealImage, reference: RealImage, mask: Uint8Array) => number,
  apart: number,
  title: (c: MetricCase) => string,
): void {
  for (const c of maskedCases) {
    it(title(c), () => {
      const { estimate, reference, mask } = caseImages(c);
      const value = metric(estimate, reference, mask!);
      expect(Math.abs(value - c.masked![key])).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
      expect(Math.abs(value - c[key])).toBeGreaterThan(apart);
    });
  }
}

/** A random ny×nx image with values uniform in [0, 1). */
export function randomUniformImage(nx: number, ny: number, seed: number): RealImage {
  const rng = new SeededRandom(seed);
  return { nx, ny, data: Float64Array.from({ length: nx * ny }, () => rng.uniform()) };
}
