import { describe, expect, it } from 'vitest';
import { scoreAll } from '../../src/metrics/index.ts';
import { caseImages, FIXTURE_TOLERANCE, fixtures, maskedCases } from './metric-fixtures.ts';

describe('scoreAll (fixtures by tests/reference/generate_fixtures.py: skimage and scipy.ndimage)', () => {
  const c = fixtures.cases[0];
  it(`${c.name}: all four metrics agree with the fixture`, () => {
    const { estimate, reference } = caseImages(c);
    const m = scoreAll(estimate, reference);
    expect(Math.abs(m.nrmse - c.nrmse)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    expect(Math.abs(m.psnr - c.psnr)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    expect(Math.abs(m.ssim - c.ssim)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    expect(Math.abs(m.hfen - c.hfen)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
  });

  const masked = maskedCases[0];
  it(`${masked.name}: the region mask reaches every metric`, () => {
    const { estimate, reference, mask } = caseImages(masked);
    const m = scoreAll(estimate, reference, mask);
    expect(Math.abs(m.nrmse - masked.masked!.nrmse)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    expect(Math.abs(m.psnr - masked.masked!.psnr)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    expect(Math.abs(m.ssim - masked.masked!.ssim)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
    expect(Math.abs(m.hfen - masked.masked!.hfen)).toBeLessThanOrEqual(FIXTURE_TOLERANCE);
  });
});
